package democase

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"errors"
	"image"
	"image/jpeg"
	"io/fs"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/rwcarlsen/goexif/exif"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// One build shared by the read-only tests (a build takes about a second of
// CPU on a loaded machine).
var (
	sharedOnce sync.Once
	sharedCase Case
	sharedErr  error
	sharedDir  string
)

func built(t *testing.T) Case {
	t.Helper()
	sharedOnce.Do(func() {
		d, err := os.MkdirTemp("", "democase-*")
		if err != nil {
			sharedErr = err
			return
		}
		sharedDir = d
		sharedCase, sharedErr = Build(filepath.Join(d, "case"), Options{})
	})
	if sharedErr != nil {
		t.Fatalf("Build: %v", sharedErr)
	}
	return sharedCase
}

func TestMain(m *testing.M) {
	code := m.Run()
	if sharedDir != "" {
		os.RemoveAll(sharedDir)
	}
	os.Exit(code)
}

// treeHashes maps every file under dir (slash path) to its SHA-256.
func treeHashes(t *testing.T, dir string) map[string]string {
	t.Helper()
	out := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		sum := sha256.Sum256(b)
		out[filepath.ToSlash(rel)] = hex.EncodeToString(sum[:])
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func TestBuildIsDeterministic(t *testing.T) {
	c1 := built(t)
	c2, err := Build(filepath.Join(t.TempDir(), "again"), Options{Seed: DefaultSeed})
	if err != nil {
		t.Fatal(err)
	}
	h1, h2 := treeHashes(t, c1.Dir), treeHashes(t, c2.Dir)
	if len(h1) != len(h2) || len(h1) < len(c1.Photos)+2 {
		t.Fatalf("file counts differ or too few: %d vs %d", len(h1), len(h2))
	}
	for name, sum := range h1 {
		if h2[name] != sum {
			t.Errorf("%s differs between two builds with the same seed", name)
		}
	}
	// The seed is really used: another seed draws other measurement errors
	// (checked on one photo's measurements, to avoid a third build).
	p := c1.Photos[0]
	spec := cameraSpecs()[0]
	for _, s := range cameraSpecs() {
		if s.Key == p.Camera {
			spec = s
		}
	}
	sun := sunState{sunny: true, azimuthDeg: p.SunAzimuthDeg, altitudeDeg: p.SunAltitudeDeg}
	m1 := measure(p.view, sun, spec, 0, rand.New(rand.NewPCG(DefaultSeed, 1)))
	m2 := measure(p.view, sun, spec, 0, rand.New(rand.NewPCG(7, 1)))
	if len(m1) == 0 || m1[0].SheetBearing == m2[0].SheetBearing && m1[0].SheetLengthM == m2[0].SheetLengthM {
		t.Error("a different seed gave the same measurements")
	}
}

func TestBuildRefusesNonEmptyFolder(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "keep.txt"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Build(dir, Options{})
	if !errors.Is(err, ErrNotEmpty) {
		t.Fatalf("Build into a non-empty folder: got %v, want ErrNotEmpty", err)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "keep.txt")); string(b) != "x" {
		t.Error("existing file was touched")
	}
}

// TestPlantedFaults checks that each fault the brief lists is in the case,
// exactly as listed, and that the truth returned is self-consistent.
func TestPlantedFaults(t *testing.T) {
	c := built(t)
	if len(c.Photos) < 20 {
		t.Errorf("%d photos, want at least 20 (brief)", len(c.Photos))
	}
	perCam := map[string][]Photo{}
	for _, p := range c.Photos {
		perCam[p.Camera] = append(perCam[p.Camera], p)
	}
	if len(perCam) < 3 {
		t.Errorf("%d cameras, want at least 3 (brief)", len(perCam))
	}
	ny, err := time.LoadLocation(PlaceZone)
	if err != nil {
		t.Skipf("no tz database on this host: %v", err)
	}
	dstEnd := time.Date(2027, 11, 7, 6, 0, 0, 0, time.UTC) // 02:00 EDT, first Sunday of November

	table := []struct {
		source  string
		camera  string
		fault   Fault
		count   int // exact, or minimum when atLeast
		atLeast bool
		verdict string
		check   func(p Photo) string // "" when fine
	}{
		{"brief: camera A clock right", "A", FaultNone, 2, true, VerdictConsistent,
			func(p Photo) string { return within(p.Offset, 0, time.Second) }},
		{"brief: one edited timestamp against its camera's model", "A", FaultEdited, 1, false, VerdictClockOffset,
			func(p Photo) string {
				if p.Offset < time.Hour || !p.Outlier {
					return "edit too small or not marked as an outlier"
				}
				if r := p.Offset % (15 * time.Minute); r < 2*time.Minute || r > 13*time.Minute {
					return "edit is close to a whole zone step (15 min multiple)"
				}
				return ""
			}},
		{"brief: camera B drifting, 8+ photos", "B", FaultDrift, 8, true, VerdictClockOffset,
			func(p Photo) string {
				if p.Offset < time.Minute || p.Offset > 14*time.Minute {
					return "offset outside 1..14 min: could pass for correct or for a zone step"
				}
				return ""
			}},
		{"brief: camera C left on its home zone (tz database: Phoenix UTC-7 vs EDT UTC-4)", "C", FaultHomeZone, 2, true, VerdictZoneSlip,
			func(p Photo) string { return within(p.Offset, -3*time.Hour, time.Second) }},
		{"brief: a phone with GPS and a correct clock", "P", FaultNone, 2, true, VerdictConsistent,
			func(p Photo) string {
				if !p.HasGPS || p.ClaimedOffset == "" {
					return "phone without GPS or offset tag"
				}
				return within(p.Offset, 0, time.Millisecond)
			}},
		{"brief: one DST slip (US DST ends first Sunday of November, common knowledge)", "D", FaultDST, 1, false, VerdictDSTSlip,
			func(p Photo) string {
				_, jan := time.Date(2027, 1, 15, 12, 0, 0, 0, ny).Zone()
				_, jul := time.Date(2027, 7, 15, 12, 0, 0, 0, ny).Zone()
				if jul-jan != 3600 || p.TrueUTC.Before(dstEnd) {
					return "place keeps no DST or photo before the change"
				}
				return within(p.Offset, time.Hour, time.Second)
			}},
		{"brief: one AM/PM slip", "E", FaultAMPM, 1, false, VerdictAMPMSlip,
			func(p Photo) string { return within(p.Offset, 12*time.Hour, time.Second) }},
		{"brief: night-time claim on a daylight exposure (sunny-16: EV100 about 15 in sun, common knowledge)", "F", FaultNightClaim, 1, false, VerdictLightMismatch,
			func(p Photo) string {
				claimed := spa.At(p.ClaimedUTC, spa.NewObserver(PlaceLatDeg, PlaceLonDeg, PlaceElevationM), spa.DeltaT(p.ClaimedUTC))
				if claimed.AltitudeDeg > -12 || p.SunAltitudeDeg < 15 || p.EV100 < 13 {
					return "not a night claim on a sunlit exposure"
				}
				if len(p.Shadows) != 0 {
					return "its shadows are measured: the exposure should be the only witness"
				}
				if p.FNumber != 8 || p.ExposureTimeSec != 1.0/500 || p.ISO != 100 {
					return "exposure is not f/8 1/500 s ISO 100"
				}
				return ""
			}},
		{"issue 19: a GPS camera kept on Maine time (UTC-4) in Halifax (UTC-3 in daylight time, tz database)", "T", FaultHomeTime, 3, false, VerdictZoneSlip,
			func(p Photo) string {
				if !p.HasGPS || p.ClaimedOffset != "" {
					return "traveller without GPS or with an offset tag"
				}
				return within(p.Offset, -time.Hour, time.Millisecond)
			}},
		{"issue 19: the same camera at the boatyard before and after the trip, clock right", "T", FaultNone, 4, false, VerdictConsistent,
			func(p Photo) string { return within(p.Offset, 0, time.Millisecond) }},
		{"brief: optional photo with no shadows and no GPS", "G", FaultNoEvidence, 1, false, VerdictUnverified,
			func(p Photo) string {
				if p.HasGPS || p.HasExposure || len(p.Shadows) > 0 || p.Sunny {
					return "the photo carries evidence"
				}
				return ""
			}},
	}
	seen := map[string]bool{}
	for _, tc := range table {
		n := 0
		for _, p := range perCam[tc.camera] {
			if p.Fault != tc.fault {
				continue
			}
			n++
			seen[p.Path] = true
			if p.Expected != tc.verdict {
				t.Errorf("%s (%s): expected verdict %q, want %q", p.Path, tc.source, p.Expected, tc.verdict)
			}
			if msg := tc.check(p); msg != "" {
				t.Errorf("%s (%s): %s (offset %v)", p.Path, tc.source, msg, p.Offset)
			}
		}
		if n != tc.count && !(tc.atLeast && n >= tc.count) {
			t.Errorf("%s: camera %s has %d photos with fault %s, want %d", tc.source, tc.camera, n, tc.fault, tc.count)
		}
	}
	for _, p := range c.Photos {
		if !seen[p.Path] && p.Fault != FaultNone {
			t.Errorf("%s: fault %s not in the brief's list", p.Path, p.Fault)
		}
	}
	for _, p := range perCam["D"] {
		if p.Fault == FaultNone && (!p.TrueUTC.Before(dstEnd) || p.Offset.Abs() > time.Second) {
			t.Errorf("%s: camera D should be right before the DST change", p.Path)
		}
	}
}

func within(got, want, tol time.Duration) string {
	if (got - want).Abs() > tol {
		return "offset " + got.String() + ", want " + want.String()
	}
	return ""
}

// TestDriftIsFittable checks camera B's clock: offsets grow steadily by a
// few minutes a month over about two months (brief).
func TestDriftIsFittable(t *testing.T) {
	c := built(t)
	var ps []Photo
	for _, p := range c.Photos {
		if p.Camera == "B" {
			ps = append(ps, p)
		}
	}
	if len(ps) < 8 {
		t.Fatalf("%d photos of camera B, want 8+", len(ps))
	}
	first, last := ps[0], ps[len(ps)-1]
	for _, p := range ps {
		if p.TrueUTC.Before(first.TrueUTC) {
			first = p
		}
		if p.TrueUTC.After(last.TrueUTC) {
			last = p
		}
	}
	days := last.TrueUTC.Sub(first.TrueUTC).Hours() / 24
	perMonth := (last.Offset - first.Offset).Minutes() / days * 30
	if days < 45 || perMonth < 2 || perMonth > 10 {
		t.Errorf("camera B spans %.0f days and drifts %.1f min/month; want ~2 months and several min/month", days, perMonth)
	}
	for _, p := range ps {
		// Linear in time: each offset lies on the line through first and last.
		want := first.Offset.Seconds() + (last.Offset-first.Offset).Seconds()*p.TrueUTC.Sub(first.TrueUTC).Seconds()/last.TrueUTC.Sub(first.TrueUTC).Seconds()
		if math.Abs(p.Offset.Seconds()-want) > 1.5 {
			t.Errorf("%s: offset %v off the drift line (%.1f s)", p.Path, p.Offset, want)
		}
	}
}

// readSheet returns the measurement rows by header name.
func readSheet(t *testing.T, name string) []map[string]string {
	t.Helper()
	b, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(b, []byte("\r\n")) {
		t.Error("sheet lines do not end in CRLF (RFC 4180)")
	}
	recs, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	want := "photo,object,object_height,shadow_length,shadow_bearing,bearing_ref,bearing_sd,length_sd_pct,slope,slope_toward,sun_azimuth,sun_altitude,declination,lat,lon,time,note"
	if got := strings.Join(recs[0], ","); got != want {
		t.Fatalf("header %q, want %q (brief)", got, want)
	}
	var out []map[string]string
	for _, r := range recs[1:] {
		m := map[string]string{}
		for i, h := range recs[0] {
			m[h] = r[i]
		}
		out = append(out, m)
	}
	return out
}

func num(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("sheet cell %q: %v", s, err)
	}
	return v
}

func angleDiff(a, b float64) float64 { return math.Abs(math.Mod(a-b+540, 360) - 180) }

// TestSheetSPARoundTrip: every measured shadow agrees, within the stated
// noise, with the sun the SPA gives at the photo's true time ("spa round
// trip"), and the sheet is accepted by the project's own sheet reader.
func TestSheetSPARoundTrip(t *testing.T) {
	c := built(t)
	byPath := map[string]Photo{}
	for _, p := range c.Photos {
		byPath[p.Path] = p
	}
	obs := spa.NewObserver(PlaceLatDeg, PlaceLonDeg, PlaceElevationM)
	bearingTol := TruncateSD*BearingSDDeg + 0.06 // + rounding to 0.1°
	lengthTol := TruncateSD*LengthSDPct/100 + 0.003
	rows := readSheet(t, c.SheetPath)
	magnetic, shadows := 0, 0
	for _, r := range rows {
		p, ok := byPath[r["photo"]]
		if !ok {
			t.Errorf("sheet row names unknown photo %q", r["photo"])
			continue
		}
		if r["shadow_bearing"] == "" {
			if (p.Fault != FaultNoEvidence && p.Fault != FaultNightClaim) || r["lat"] == "" {
				t.Errorf("%s: row without a shadow", p.Path)
			}
			continue
		}
		shadows++
		if (r["lat"] == "") != p.HasGPS {
			t.Errorf("%s: lat/lon must be given exactly for photos without GPS", p.Path)
		}
		sun := spa.At(p.TrueUTC, obs, spa.DeltaT(p.TrueUTC))
		bearing := num(t, r["shadow_bearing"])
		if r["bearing_ref"] == "magnetic" {
			magnetic++
			bearing += num(t, r["declination"]) // true = magnetic + declination (east positive)
		}
		if d := angleDiff(bearing, sun.AzimuthDeg+180); d > bearingTol {
			t.Errorf("spa round trip %s %s: bearing off the sun's azimuth + 180° by %.2f°, tolerance %.2f°", p.Path, r["object"], d, bearingTol)
		}
		h, l := num(t, r["object_height"]), num(t, r["shadow_length"])
		trueL := h / math.Tan(angle.Rad(sun.AltitudeDeg))
		if math.Abs(l/trueL-1) > lengthTol {
			t.Errorf("spa round trip %s %s: length %.2f m vs h/tan(alt) = %.2f m", p.Path, r["object"], l, trueL)
		}
		if r["bearing_sd"] != "2" || r["length_sd_pct"] != "5" {
			t.Errorf("%s: stated sds %s/%s, want 2/5 (brief)", p.Path, r["bearing_sd"], r["length_sd_pct"])
		}
	}
	if magnetic == 0 || shadows < 40 {
		t.Errorf("%d shadow rows, %d magnetic; want many and at least one magnetic", shadows, magnetic)
	}

	// The project's sheet reader accepts every row and finds every photo.
	f, err := os.Open(c.SheetPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sh, err := sheet.Parse(f, SheetName)
	if err != nil {
		t.Fatal(err)
	}
	if len(sh.Problems) > 0 || len(sh.Rows) != len(rows) {
		t.Errorf("sheet reader: %d problems (first %v), %d of %d rows", len(sh.Problems), firstProblem(sh.Problems), len(sh.Rows), len(rows))
	}
	var paths []sheet.Name
	for _, p := range c.Photos {
		paths = append(paths, sheet.Name{ID: path.Join(path.Base(filepath.ToSlash(c.PhotosDir)), p.Path), Rel: p.Path})
	}
	if _, err := sh.Resolve(paths); err != nil {
		t.Errorf("sheet rows do not resolve to the photos: %v", err)
	}
}

func firstProblem(ps []*sheet.ParseError) error {
	if len(ps) == 0 {
		return nil
	}
	return ps[0]
}

// TestShadowGeometryMatchesShadowPackage: the length h / tan e and bearing
// A + 180° used to draw the shadows give back the SPA sun through
// solarcheck/shadow's inversion on level ground.
func TestShadowGeometryMatchesShadowPackage(t *testing.T) {
	c := built(t)
	for _, p := range c.Photos {
		for _, s := range p.Shadows {
			sun, err := shadow.SunFromShadow(shadow.Shadow{Height: s.HeightM, Length: s.TrueLengthM, BearingDeg: s.TrueBearingDeg})
			if err != nil {
				t.Fatalf("%s %s: %v", p.Path, s.Object, err)
			}
			if angleDiff(sun.AzimuthDeg, p.SunAzimuthDeg) > 1e-6 || math.Abs(sun.AltitudeDeg-p.SunAltitudeDeg) > 1e-6 {
				t.Errorf("%s %s: shadow gives sun %.4f/%.4f, SPA %.4f/%.4f", p.Path, s.Object,
					sun.AzimuthDeg, sun.AltitudeDeg, p.SunAzimuthDeg, p.SunAltitudeDeg)
			}
		}
	}
}

// TestPicturesShowTheShadows: in every rendered photo, the middle of each
// measured shadow is darker than the ground beside it.
func TestPicturesShowTheShadows(t *testing.T) {
	c := built(t)
	total := int64(0)
	for _, p := range c.Photos {
		b, err := os.ReadFile(filepath.Join(c.PhotosDir, filepath.FromSlash(p.Path)))
		if err != nil {
			t.Fatal(err)
		}
		total += int64(len(b))
		img, err := jpeg.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("%s: %v", p.Path, err)
		}
		if img.Bounds() != image.Rect(0, 0, ImageWidth, ImageHeight) {
			t.Errorf("%s: size %v", p.Path, img.Bounds())
		}
		cam := newCamera(p.view, ImageWidth, ImageHeight)
		// lum is the luminance at a ground point: the darkest (or brightest)
		// pixel of the 3×3 block around its image, so that a shadow one
		// pixel wide after foreshortening is still found.
		lum := func(x, y float64, darkest bool) float64 {
			u, v, _, ok := cam.project(vec3{x, y, 0})
			if !ok {
				return math.NaN()
			}
			best := math.Inf(1)
			if !darkest {
				best = math.Inf(-1)
			}
			for dy := -1; dy <= 1; dy++ {
				for dx := -1; dx <= 1; dx++ {
					r, g, bl, _ := img.At(int(math.Floor(u))+dx, int(math.Floor(v))+dy).RGBA()
					l := 0.299*float64(r) + 0.587*float64(g) + 0.114*float64(bl)
					if darkest == (l < best) {
						best = l
					}
				}
			}
			return best
		}
		for _, s := range p.Shadows {
			var o object
			for _, so := range sceneObjects {
				if so.Name == s.Object {
					o = so
				}
			}
			br := angle.Rad(s.TrueBearingDeg)
			sx, sy := math.Sin(br), math.Cos(br)
			side := 0.35 + o.RadiusM
			dark := 0
			for _, f := range []float64{0.2, 0.35, 0.5, 0.65, 0.8} {
				mx, my := o.X+f*s.TrueLengthM*sx, o.Y+f*s.TrueLengthM*sy
				in := lum(mx, my, true)
				out := math.Max(lum(mx+side*sy, my-side*sx, false), lum(mx-side*sy, my+side*sx, false))
				if in < 0.85*out {
					dark++
				}
			}
			if dark < 2 {
				t.Errorf("%s %s: shadow not visible where computed (%d of 5 points darker than beside)", p.Path, s.Object, dark)
			}
		}
	}
	if total > 3<<20 {
		t.Errorf("photos total %d bytes, want < 3 MB (brief)", total)
	}
}

// TestRendererShadowLength renders a sun at a known altitude and checks the
// mast's shadow ends where h / tan(e) puts it (definition of the tangent,
// common knowledge).
func TestRendererShadowLength(t *testing.T) {
	cases := []struct {
		source       string
		azDeg, altDe float64
	}{
		{"tan 45° = 1: shadow as long as the mast", 180, 45},
		{"tan 30° = 1/√3: shadow √3 times the mast", 135, 30},
		{"tan 60° = √3: shadow 1/√3 of the mast", 225, 60},
	}
	ps := aim(-20, 8, 9, 1, 12, 430)
	cam := newCamera(ps, ImageWidth, ImageHeight)
	m := sceneObjects[0]
	for _, tc := range cases {
		img := render(ps, sunState{sunny: true, azimuthDeg: tc.azDeg, altitudeDeg: tc.altDe}, "test")
		l := m.HeightM / math.Tan(angle.Rad(tc.altDe))
		br := angle.Rad(tc.azDeg + 180)
		at := func(f float64) float64 {
			u, v, _, _ := cam.project(vec3{m.X + f*math.Sin(br), m.Y + f*math.Cos(br), 0})
			c := img.RGBAAt(int(u), int(v))
			return float64(c.R) + float64(c.G) + float64(c.B)
		}
		if !(at(l-0.4) < 0.8*at(l+0.4)) {
			t.Errorf("%s: tip not at %.2f m (%.0f inside vs %.0f beyond)", tc.source, l, at(l-0.4), at(l+0.4))
		}
	}
}

// TestExifReadsBackWithGoexif parses every file with goexif, a reader this
// project did not write.
func TestExifReadsBackWithGoexif(t *testing.T) {
	c := built(t)
	for _, p := range c.Photos {
		f, err := os.Open(filepath.Join(c.PhotosDir, filepath.FromSlash(p.Path)))
		if err != nil {
			t.Fatal(err)
		}
		x, err := exif.Decode(f)
		f.Close()
		if err != nil {
			t.Errorf("goexif %s: %v", p.Path, err)
			continue
		}
		str := func(name exif.FieldName) string {
			tag, err := x.Get(name)
			if err != nil {
				return ""
			}
			s, _ := tag.StringVal()
			return s
		}
		if got := str(exif.DateTimeOriginal); got != p.ClaimedWall {
			t.Errorf("goexif %s: DateTimeOriginal %q, want %q", p.Path, got, p.ClaimedWall)
		}
		cam := camByKey(c, p.Camera)
		if str(exif.Make) != cam.Make || str(exif.Model) != cam.Model {
			t.Errorf("goexif %s: make/model %q/%q", p.Path, str(exif.Make), str(exif.Model))
		}
		lat, lon, err := x.LatLong()
		if p.HasGPS != (err == nil) {
			t.Errorf("goexif %s: GPS present %v, want %v", p.Path, err == nil, p.HasGPS)
		} else if p.HasGPS && (math.Abs(lat-p.Site.LatDeg) > 5e-4 || math.Abs(lon-p.Site.LonDeg) > 5e-4) {
			t.Errorf("goexif %s: GPS %.6f,%.6f not at the place", p.Path, lat, lon)
		}
		th, err := x.JpegThumbnail()
		if p.HasThumbnail != (err == nil) {
			t.Errorf("goexif %s: thumbnail present %v, want %v", p.Path, err == nil, p.HasThumbnail)
		} else if p.HasThumbnail {
			if cfg, err := jpeg.DecodeConfig(bytes.NewReader(th)); err != nil || cfg.Width != 160 {
				t.Errorf("goexif %s: thumbnail %+v %v", p.Path, cfg, err)
			}
		}
	}
}

// TestExifReadsBackWithExiftool compares every written tag that matters to
// the audit with exiftool's reading (Debian libimage-exiftool-perl).
func TestExifReadsBackWithExiftool(t *testing.T) {
	if _, err := os.Stat("/usr/bin/exiftool"); err != nil {
		t.Skip("exiftool not installed (apt-get install libimage-exiftool-perl); goexif test still runs")
	}
	c := built(t)
	out, err := exec.Command("/usr/bin/exiftool", "-n", "-json", "-r", "-ext", "jpg", c.PhotosDir).Output()
	if err != nil {
		t.Fatalf("exiftool: %v", err)
	}
	var recs []map[string]any
	if err := json.Unmarshal(out, &recs); err != nil {
		t.Fatal(err)
	}
	got := map[string]map[string]any{}
	for _, r := range recs {
		rel, _ := filepath.Rel(c.PhotosDir, r["SourceFile"].(string))
		got[filepath.ToSlash(rel)] = r
	}
	sval := func(v any) string {
		switch x := v.(type) {
		case nil:
			return ""
		case string:
			return x
		case float64:
			return strconv.FormatFloat(x, 'f', -1, 64)
		}
		return ""
	}
	for _, p := range c.Photos {
		r, ok := got[p.Path]
		if !ok {
			t.Errorf("exiftool did not read %s", p.Path)
			continue
		}
		cam := camByKey(c, p.Camera)
		checks := []struct{ tag, want string }{
			{"DateTimeOriginal", p.ClaimedWall},
			{"OffsetTimeOriginal", p.ClaimedOffset},
			{"Make", cam.Make},
			{"Model", cam.Model},
			{"SerialNumber", cam.Serial},
		}
		if p.ClaimedSubSec != "" {
			checks = append(checks, struct{ tag, want string }{"SubSecTimeOriginal", p.ClaimedSubSec})
		}
		if p.HasExposure {
			checks = append(checks,
				struct{ tag, want string }{"FNumber", strconv.FormatFloat(p.FNumber, 'f', -1, 64)},
				struct{ tag, want string }{"ISO", strconv.Itoa(p.ISO)})
			if e, _ := r["ExposureTime"].(float64); math.Abs(e-p.ExposureTimeSec) > 1e-9 {
				t.Errorf("exiftool %s: ExposureTime %v, want %v", p.Path, e, p.ExposureTimeSec)
			}
		}
		if p.HasGPS {
			checks = append(checks, struct{ tag, want string }{"GPSDateTime",
				p.TrueUTC.Format("2006:01:02 15:04:05") + strings.TrimRight(p.TrueUTC.Format(".00"), ".0") + "Z"})
			la, _ := r["GPSLatitude"].(float64)
			lo, _ := r["GPSLongitude"].(float64)
			if math.Abs(la-PlaceLatDeg) > 5e-4 || math.Abs(lo-PlaceLonDeg) > 5e-4 {
				t.Errorf("exiftool %s: GPS %v,%v not at the place", p.Path, la, lo)
			}
		} else if _, has := r["GPSLatitude"]; has {
			t.Errorf("exiftool %s: GPS where none was written", p.Path)
		}
		for _, ck := range checks {
			if g := sval(r[ck.tag]); g != ck.want {
				t.Errorf("exiftool %s: %s = %q, want %q", p.Path, ck.tag, g, ck.want)
			}
		}
		if n, _ := r["ThumbnailLength"].(float64); (n > 0) != p.HasThumbnail {
			t.Errorf("exiftool %s: ThumbnailLength %v, thumbnail wanted %v", p.Path, n, p.HasThumbnail)
		}
	}
}

func camByKey(c Case, key string) Camera {
	for _, cam := range c.Cameras {
		if cam.Key == key {
			return cam
		}
	}
	return Camera{}
}

func TestStoryIsMarkedFictional(t *testing.T) {
	c := built(t)
	b, err := os.ReadFile(c.StoryPath)
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	if !strings.HasPrefix(s, "FICTIONAL DEMO DATA") {
		t.Error("CASE.txt does not open with the fictional-data mark")
	}
	for _, p := range c.Photos {
		if !strings.Contains(s, p.Path) {
			t.Errorf("CASE.txt does not list %s", p.Path)
		}
	}
}

func BenchmarkBuild(b *testing.B) {
	for i := 0; b.Loop(); i++ {
		if _, err := Build(filepath.Join(b.TempDir(), strconv.Itoa(i)), Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestSunAgainstPyEphem holds the sun that drew every picture (SPA) and the
// sheet's bearings against PyEphem 4.1.4, generated by
// testdata/gen_sun_ephem.py (a witness outside this project).
func TestSunAgainstPyEphem(t *testing.T) {
	c := built(t)
	f, err := os.Open(filepath.Join("testdata", "sun_ephem.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	type pos struct{ az, alt float64 }
	ref := map[string]pos{}
	for _, rec := range recs[1:] {
		ref[rec[0]+" "+rec[3]] = pos{num(t, rec[1]), num(t, rec[2])}
	}
	for _, p := range c.Photos {
		obs := spa.NewObserver(p.Site.LatDeg, p.Site.LonDeg, p.Site.ElevationM)
		at := p.TrueUTC.Truncate(time.Second)
		e, ok := ref[at.Format("2006-01-02T15:04:05Z")+" "+p.Site.Zone]
		if !ok {
			t.Errorf("%s: %v not in testdata/sun_ephem.csv; regenerate it (see the script)", p.Path, at)
			continue
		}
		s := spa.At(at, obs, spa.DeltaT(at))
		checks := []struct {
			source    string
			got, want float64
			tol       float64
		}{
			{"PyEphem 4.1.4 azimuth", s.AzimuthDeg, e.az, 0.01},
			{"PyEphem 4.1.4 airless altitude", s.AltitudeAirlessDeg, e.alt, 0.01},
		}
		for _, s := range p.Shadows {
			b := s.SheetBearing
			if s.BearingRef == "magnetic" {
				b += s.DeclinationDeg
			}
			checks = append(checks, struct {
				source    string
				got, want float64
				tol       float64
			}{"PyEphem 4.1.4 azimuth + 180°, sheet row " + s.Object, b, e.az + 180, TruncateSD*BearingSDDeg + 0.07})
		}
		for _, ck := range checks {
			if d := angleDiff(ck.got, ck.want); d > ck.tol {
				t.Errorf("%s: %s: %.4f vs %.4f (diff %.4f > %.4f)", p.Path, ck.source, ck.got, ck.want, d, ck.tol)
			}
		}
	}
}
