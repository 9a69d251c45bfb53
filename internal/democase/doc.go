// Package democase builds the invented case that `gnomon demo` audits: a
// folder of small JPEG photos rendered by code, their EXIF written by our own
// writer (internal/exifwrite), a filled measurement sheet and a short story.
// Everything in it is fictional demo data: the town, the people, the
// cameras and the claim are made up; only the coordinates (a point on the
// coast of Maine, USA, zone America/New_York) and the sun are real.
//
// The case is built so that the truth is known exactly. Every photo has a
// true UTC instant; the sun's direction then comes from the NREL SPA
// (solarcheck/spa, apparent altitude with SPA's refraction). The claimed
// time written into EXIF is the true time passed through the photo's planted
// fault (a drifting clock, a home zone, a missed daylight-saving change, a
// twelve-hour slip, an edit, a night-time claim). Build returns that truth in
// a Case, so a test can compare an audit's verdicts against it.
//
// # Scene geometry
//
// World frame: metres, x east, y north, z up, origin on the quay; the
// ground is the level plane z = 0 (no slope anywhere in the demo). Objects
// are vertical cylinders (a mast, a lamp post, fence posts, a bollard)
// standing on the ground, plus two horizontal fence rails between the posts.
//
// Shadows: with the sun at azimuth A and apparent altitude e, a vertical
// object of height h casts a shadow on level ground along the horizontal
// bearing A + 180° with length L = h / tan e (the ray from the sun through
// the object's top meets z = 0 at that distance from the base). The
// renderer decides shadow per ground pixel: the ground point g is shaded by
// a cylinder of radius r at base b when its distance to the segment
// [b, b + L·s] is at most r, where s is the unit vector of the shadow
// bearing; a rail at height hr between posts a and b shades g when
// g − (hr / tan e)·s lies within the rail's half-width of the segment [a, b].
// This is the same model as solarcheck/shadow on level ground, so the sheet
// rows written from it are what an examiner would measure from the picture.
//
// Camera: an ideal pinhole (no lens distortion) at position P, heading ψ
// (clockwise from true north), pitched down by θ, focal length f in pixels,
// principal point at the image centre. Forward F = (sin ψ cos θ, cos ψ cos θ,
// −sin θ), right R = (cos ψ, −sin ψ, 0), up U = R × F; a point X projects to
// u = W/2 + f (X−P)·R / (X−P)·F, v = H/2 − f (X−P)·U / (X−P)·F. The
// background is ray-cast per pixel (sky above the horizon, water beyond
// y = WaterLineM, the paved quay with 2 m joints and a painted north arrow
// otherwise) and the objects are drawn on top, farthest first.
//
// # Measurement sheet
//
// measurements.csv (RFC 4180, CRLF line ends) has one row per object whose
// base and shadow tip both lie inside the frame on the quay and whose shadow
// does not run behind the object in the picture (image directions of shadow
// and object more than 30° apart), up to a per-camera number. Its bearing and
// length are the true geometry above perturbed by seeded Gaussian errors at
// the sds the row states (bearing_sd 2°, length_sd_pct 5). Departure from a
// real examiner, stated so nobody relies on it: each error is redrawn until
// it lies within TruncateSD standard deviations, so that a thirty-photo demo
// is not flagged by chance (with untruncated errors about one consistent
// photo in twenty would fall outside a 95 % interval). Rows measured with a
// compass carry bearing_ref "magnetic" and the WMM2025 declination at the
// place (solarcheck/geomag), rounded to 0.1°, in the declination column.
//
// Expected verdicts: Case lists, per photo, the verdict word of the audit's
// vocabulary that the planted fault calls for. Two photos carry more than one
// symptom on purpose: the twelve-hour slip also claims a night-time moment
// (the light and shadows-below-horizon checks fire, but the shadows fit the
// claim shifted by exactly 12 h, so ampm_slip), and the night-time claim
// (23:10 on f/8, 1/500 s, ISO 100, with measured shadows) is 8 h 47 min off,
// no zone or twelve-hour step, so light_mismatch.
//
// Determinism: the same Options give byte-identical files. No clock is read;
// random numbers come from PCG streams seeded by Options.Seed and the photo's
// name (so photos can be made in parallel and gathered in script order);
// floating-point results are rounded before they are written to the sheet.
package democase
