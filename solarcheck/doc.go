// Package solarcheck judges one photo's claimed capture time against the
// independent witnesses it carries or that the examiner measured, and fits
// each camera's clock across a batch.
//
// The witnesses are: the sun's direction measured from shadows or sighted
// directly (against the NREL SPA position at the claimed moment and place),
// the GPS receiver's UTC clock, the camera's own offset tag, the exposure the
// camera chose (against the daylight expected for the sun's altitude), and,
// across a batch, the other photos of the same camera. Each check returns a
// status, a figure with its 95 % interval and one plain sentence.
//
// The diagnosis then tests the usual explanations of a wrong time against
// the evidence together: a clock that is simply off, a whole time-zone step
// (a camera left on home time), a missed daylight-saving change, a 12-hour
// AM/PM slip, the wrong season, the wrong place, light that does not fit.
// Each is accepted or rejected by whether the evidence interval reaches it;
// the result says "consistent" or "inconsistent at the stated uncertainty",
// never that a photo is authentic.
//
// What it cannot establish: that a photo was not staged, that the examiner's
// measurements are right, or anything about a photo with no witness at all
// (verdict "unverified"). Shadow evidence fixes time of day only modulo the
// sun's daily repetition; offsets are reported within ±14 h of the claim.
//
// The computations live in sub-packages: spa (sun position), shadow,
// invert (when/where), zone, geomag, sheet, light and clock.
package solarcheck
