// Package invert solves the two inverse problems of sun position: when, at
// a known place, the sun stood where a measurement puts it (When), and where
// on Earth an observer stood who saw the sun in a measured direction at a
// known instant (Where). Sun positions come from the NREL SPA (package spa,
// Reda & Andreas 2008).
//
// # Measurement model
//
// A measurement is a sun azimuth and/or an apparent (refracted) altitude of
// the sun's centre, each with an independent 1-sigma error, plus an optional
// correlation between the two (a shadow on a slope, see package shadow).
// The misfit at time t is the chi-square
//
//	χ²(t) = (d_az² − 2ρ·d_az·d_alt + d_alt²) / (1 − ρ²)
//	d_az  = wrap±180(az_sun(t) − az) / σ_az,eff
//	d_alt = (alt_sun(t) − alt) / σ_alt
//
// Estimation and the test of fit are kept apart. A 95 % window is the
// profile interval about a local minimum χ²min of the misfit: the times
// with χ²(t) − χ²min below 3.841, the 95 % point of the chi-square
// distribution for one degree of freedom, because the one parameter of
// interest is the time (ProfileDof), whatever the number of angles. Its
// width says how well the measurement pins down the time; it does not
// shrink when the measurement fits badly. Best is the time of χ²min.
//
// How well the measurement fits is a separate figure: χ²min at Best with
// FitDof = angles measured − 1 (the time is fitted) degrees of freedom,
// at least one, and its p-value (internal/chisq). With one angle the fit
// is exact wherever the sun passes the measured value, and a misfit only
// arises when it never does; testing that against one degree of freedom
// errs toward "fits". A window whose p-value is below 0.05 (FitLevel) does
// not fit: When lists only the windows that fit, and gives the closest
// window (least misfit in the range) beside them, so that a measurement
// that fits no time is reported with its misfit rather than with a window.
// The simulations in sim_test.go check coverage (93–97 % over 1,000 photos
// per kind of measurement) and that the width holds under a growing bias.
//
// Near the zenith the azimuth of the sun is ill-defined and it swings
// through up to 180° in minutes (in the tropics it can also run backwards
// for part of the morning or afternoon). The azimuth error is therefore
// inflated as σ_az,eff² = σ_az² + (σ_sky / cos alt_sun)², where σ_sky =
// 0.01° stands for the uncertainty of the sun's position itself (SPA,
// observer position, refraction): an azimuth only constrains the time
// while the sun is meaningfully off the zenith. ρ is scaled the same way.
//
// Unless Measurement.BelowHorizonOK is set, only times with the sun's
// refracted centre at or above the horizon match (a shadow or a photographed
// sun needs a visible sun): below it χ² gets a steep penalty (0.01° scale),
// which cuts windows off at sunrise and sunset and leaves polar night with no
// match at all.
//
// # Search method (When)
//
//  1. spa.GeocentricAt is evaluated every 12 hours over the range (plus
//     margins); right ascension, declination, the non-linear part of
//     sidereal time, Earth–Sun distance and the equation of time are
//     interpolated between these nodes by 4-point (cubic) Lagrange
//     interpolation. The interpolation error is below 1e-5°, far inside
//     SPA's ±0.0003° (checked against spa.At in the tests).
//  2. Screen: a cheap geocentric model (interpolated RA/Dec and sidereal
//     time, SPA's refraction Eq. 42, no parallax: at most 0.0025°) gives χ²
//     on a 1-minute grid; within each hour the hour angle is stepped by
//     rotation. Each hour gets a lower bound of χ² from its altitude range
//     (the sun's altitude changes by at most 15.05° an hour) and the
//     below-horizon penalty; hours are visited from the lowest bound up,
//     and the rest are skipped once their bound exceeds both the fit
//     threshold and the least misfit found (branch and bound). Every
//     grid-local minimum of χ² that could fit or be the least is a
//     candidate. The search runs on the caller's goroutine: the caller
//     decides concurrency.
//  3. Refine: golden-section search of χ² on ±1 minute about each candidate
//     with the interpolated geocentric quantities fed to spa's topocentric
//     part (Geocentric.Topocentric: parallax and refraction exactly as SPA)
//     to about 1 s. Window edges (χ²min + 3.841) are found by walking the
//     1-minute grid outward and bisecting the last step to about 1 s.
//     Windows that overlap are merged.
//  4. The sun position reported at Best is computed by the full spa.At.
//
// Resolution: features of χ² narrower than the 1-minute grid step can be
// missed or merged (two windows separated by less than a minute of
// mismatch count as one). Window edges and Best are good to about 1 s
// plus the effect of the measurement's uncertainty, which is what the
// window expresses. ΔT comes from spa.DeltaT unless given.
//
// # Where
//
// The analytic circle of position (radius 90° − altitude about the subsolar
// point, crossed with the azimuth by the cosine and sine rules of the
// navigational triangle) gives the starting points, together with the best
// of 72 points around the circle; Levenberg–Marquardt steps on latitude and
// longitude with spa's topocentric model (Newton's method where an exact
// solution exists) then make the result consistent with SPA's parallax and
// refraction. The residuals are the horizontal components of the sun's unit
// vector, (cos alt·sin az, cos alt·cos az), which stay well-conditioned at
// the zenith, where azimuth is undefined. A fix is kept when the
// measurement's χ² there is below 5.991 (two parameters: latitude and
// longitude). When the circle of equal altitude
// encloses a pole (the sun's altitude is below |declination|) a given
// azimuth is met twice or not at all, and both places are returned.
//
// The uncertainty is first-order: the measurement covariance mapped through
// the inverse Jacobian into north/east kilometres on a sphere of radius
// 6371 km (the ellipsoid changes this by under 1 %); RadiusKm is the
// radius of the circle that encloses the 95 % error ellipse (√5.991 × the
// larger 1-sigma semi-axis). It does not include errors of the clock (1 s
// of time moves the answer by up to 0.46 km along the parallel) or of
// refraction near the horizon. Longitude is undefined within metres of a
// pole, and very close to the zenith (within about 0.01°) SPA's refraction
// formula turns slightly negative, which limits the fit there to about a metre.
package invert
