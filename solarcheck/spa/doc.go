// Package spa computes positions of the Sun by the NREL SPA (Reda & Andreas
// 2008), accurate to ±0.0003° for years −2000..6000.
//
// It implements the Solar Position Algorithm of I. Reda and A. Andreas,
// "Solar Position Algorithm for Solar Radiation Applications",
// NREL/TP-560-34302, revised January 2008 (also Solar Energy 76(5), 2004):
// the abridged VSOP87 Earth series (report Table A4.2), IAU 1980 nutation
// (Table A4.3), aberration, apparent sidereal time, topocentric parallax,
// SPA's refraction formula, the equation of time (Appendix A.1) and the
// sunrise/transit/sunset method of Appendix A.2. Equation numbers in the
// comments are those of the report (sections 3.1–3.15 and Appendix A).
//
// Time scales: every time.Time input is taken as UT1 (a UTC clock reading is
// used as is; |UT1 − UTC| < 0.9 s moves the sun by at most 0.004°). Terrestrial
// Time is UT1 + ΔT; ΔT defaults to the Espenak & Meeus (2006) polynomials
// (DeltaT) and every entry point takes it explicitly so callers can override it.
//
// Calendars: time.Time is proleptic Gregorian. CalendarDate converts dates
// written in the Julian calendar (before 1582-10-15, or later archival dates)
// to instants, by Meeus, Astronomical Algorithms ch. 7 (= SPA Eq. 4).
//
// Checked in this package's tests against the report's example (Table
// A5.1), Meeus's worked examples, and astropy over 392 cases 1900–2100
// (largest difference 0.00021° in altitude and in azimuth·cos(altitude)).
//
// What it does not do, or where it departs from the report:
//   - The ±0.0003° figure is the algorithm's own uncertainty. It does not
//     include the uncertainty of ΔT (each second of ΔT error moves the sun
//     along the ecliptic by only 0.00001°, 0.04° per hour, but ΔT is
//     uncertain by hours near −2000), of the UT1 − UTC difference, or of refraction, which near
//     the horizon depends on the real atmosphere far more than on the
//     formula (Eq. 42 is a standard-atmosphere fit; errors of 0.1–0.5° occur
//     within a degree of the horizon).
//   - Azimuth is measured clockwise from true (geographic) north, not from
//     magnetic north, and the surface incidence angle (Eq. 47) is not
//     computed.
//   - Day events follow Appendix A.2 (one interpolation pass, no
//     iteration); they are good to about 10 s (0.02° of altitude), use a
//     fixed h0' = −0.8333° for sunrise/sunset regardless of elevation or
//     pressure, and −6°, −12°, −18° (airless, geocentric) for civil,
//     nautical and astronomical twilight. DayAt generalises the report's 0 h UT day to a 24 h window
//     starting at any instant (for example local midnight).
//   - Polar motion and the difference between geodetic and astronomical
//     vertical are ignored, as in the report.
package spa

//go:generate go run ./internal/gen -earth ../../../shared/reference/spa_earth_terms.csv -nutation ../../../shared/reference/spa_nutation_terms.csv -o terms_gen.go
