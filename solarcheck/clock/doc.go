// Package clock models one camera's clock across a batch of photos: its
// offset from true time, its drift, resets, photos that disagree with the
// model, and shot order that contradicts the file numbering.
//
// Input is, per camera (see CameraID), one Point per photo: what its clock
// showed (the capture time's digits, the clock's own time scale), and —
// when the photo has independent evidence such as shadows or a GPS time —
// the reading minus the evidence's instant, in seconds, with its 95 %
// half-width. The model is a model of the clock, not of the places: a
// camera carried to another zone without changing its clock keeps one
// offset and one drift, and whether each photo's time fits its place's
// zone is the photo's own finding. The zone the clock is set to is chosen
// per segment among the offsets the photos suggest (the places' zones, the
// offset tags): the only one the offset's 95 % interval, widened by 15
// minutes (a year of quartz drift), reaches; otherwise it is undecided and
// the offset is stated against UTC.
//
// Methods:
//
//   - Drift and offset: the Theil–Sen estimator (Theil 1950; Sen 1968). The
//     slope is the median of the slopes between all pairs of evidence points
//     with distinct readings; the offset is the median of the points'
//     offsets after removing that slope, referred to the median reading
//     of the segment's evidence (which makes offset and slope nearly
//     uncorrelated). Theil–Sen has a breakdown point of about 29 %: up to
//     that share of arbitrarily wrong points cannot carry the slope away
//     (Sen 1968).
//   - Slope interval: Sen's (1968) distribution-free 95 % interval from the
//     null distribution of Kendall's S, in the normal approximation
//     Var(S) = n(n−1)(2n+5)/18 (no tie correction), ranks
//     M1 = (N − C)/2 and M2 = (N + C)/2 + 1 among the N ordered pairwise
//     slopes with C = 1.96·√Var(S); written out in Gilbert (1987),
//     "Statistical Methods for Environmental Pollution Monitoring", §16.5
//     (from memory). With fewer than 5 points (n = 4: M1 < 1) it is not
//     defined, and an interval wider than ±MaxDriftHalfWidth (photos that
//     span too short a time) says nothing about a clock: in both cases no
//     drift is stated (Segment.DriftReason says why), the offset is the
//     median without a slope, and predictions away from T0 are widened by an
//     assumed ±AssumedDriftBound (a quartz watch crystal's tolerance of
//     order ±20 ppm, about ±2 s/day: common knowledge, not measured for any
//     camera).
//   - Offset uncertainty: the scatter σ = 1.4826·MAD of the residuals (MAD
//     scaled to a normal σ), but never less than the median of the points' own
//     σ; the median's standard error is √(π/2)·σ/√n ≈ 1.2533·σ/√n for normal
//     errors. The prediction half-width at a reading t is
//     √(h_offset² + (h_slope·|t − t0|)²), treating both as independent.
//   - Resets: binary segmentation on Theil–Sen residuals: the split that
//     maximises the difference of the medians on either side (each side at
//     least MinSegment evidence points) is accepted when that step exceeds
//     both MinStep and ResetK robust σ of the successive residual
//     differences; each side is refitted and split again. A jump followed by
//     too few points to form a segment is reported as outliers, not a reset.
//   - Outliers ("possible edits"): a point whose residual exceeds both
//     OutlierK·σ and its own 95 % half-width plus the model's.
//   - Factory resets: a reading within FactoryWindow after 1970-01-01,
//     1980-01-01 or 2000-01-01 is a clock that lost its setting (FactoryEpoch).
//     Such readings are segmented and fitted apart from the set clock's, and
//     the fall-back is a Reset named by the first photo after it (by file
//     number when the photos have numbers).
//   - Order: photos sorted by reading, compared with the trailing digits
//     of the file's base name (DSC_0012 → 12); a backward step of less than
//     half the counter's range is a contradiction, a larger one is read as the
//     counter wrapping (9999 → 0001). A pair whose instants (the capture time
//     read in the place's zone, both readings of a repeated hour) allow the
//     numbering's order is not a contradiction.
//
// Every photo of a modelled segment, with or without evidence, gets a
// corrected UTC instant: corrected = reading − (offset + drift·(t − t0)),
// with the prediction half-width. A photo whose reading falls between
// two segments (or in two at once), or at a factory date with no witnessed
// photo of its own, is not corrected: which clock it was read from is
// unknown.
//
// Departure for large cameras: with more than MaxExactPairs pairwise slopes
// (about 2,000 evidence points) the slope is the median of SampledPairs
// (200,000) slopes of pairs drawn with a fixed seed, not of all of them; its
// rank among all slopes is then within about ±0.2 % of the median's (95 %),
// and Sen's interval bounds are taken at the same fractions of the sample,
// each widened outward by the sample quantile's own 95 % error, so the
// interval is not made narrower by the sampling (see TheilSen). Reruns give
// the same model.
//
// Cost: O(n² log n) time and 8·n²/2 bytes for the n evidence points of one
// camera up to about 2,000 points (n = 300 takes a few tens of
// milliseconds); beyond that O(n log n) plus a fixed 200,000-slope sort per
// fit (n = 10,000: see BenchmarkFit). The reset search uses running
// medians (two heaps), O(n log n) per split.
//
// Limits: the model is linear within a segment (temperature effects and
// manual adjustments by less than MinStep are not resolved); evidence points
// are taken as independent; a clock is assumed to keep one fixed zone
// offset per segment (a camera that follows daylight saving by itself shows
// it as a reset of one hour).
package clock
