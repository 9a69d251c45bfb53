package audit

import (
	"context"
	"encoding/binary"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
	"github.com/gnomon-forensics/gnomon/report"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// Places for the travel cases. Offsets in January 2026 from the tz
// database: Europe/Paris UTC+1, Europe/Helsinki UTC+2, Europe/Moscow UTC+3
// (no daylight saving there since 2014); in July Paris keeps UTC+2.
var (
	paris    = [2]float64{48.8566, 2.3522}
	helsinki = [2]float64{60.1699, 24.9384}
	moscow   = [2]float64{55.7558, 37.6173}
)

// tripShot is one photo of a travel fixture: where and when it was truly
// taken, what its clock wrote, and whether its GPS wrote the true UTC time
// or the examiner measured the sun in it.
type tripShot struct {
	name    string
	place   [2]float64
	trueUTC time.Time
	wall    time.Time     // digits the camera wrote
	gps     bool          // GPS position and UTC time stamp
	gpsLag  time.Duration // the fix is this much before the exposure (receivers stamp their last fix)
	sun     bool          // a sighting row in the sheet (sun azimuth and altitude at trueUTC)
}

// writeTrip writes the shots as JPEGs with our EXIF writer into a folder
// named trip, and the sheet of sun sightings when any shot has one.
func writeTrip(t *testing.T, camera string, shots []tripShot) (dir string, sh *sheet.Sheet) {
	t.Helper()
	dir = filepath.Join(t.TempDir(), "trip")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	var rows []string
	for _, s := range shots {
		ph := exifwrite.Photo{Make: "Tripcam", Model: camera, BodySerial: "T-1", DateTimeOriginal: s.wall.Format("2006:01:02 15:04:05")}
		if s.gps {
			u := s.trueUTC.UTC().Add(-s.gpsLag)
			ph.GPS = &exifwrite.GPS{LatDeg: s.place[0], LonDeg: s.place[1], DateStamp: u.Format("2006:01:02"),
				TimeStamp: [3]exifwrite.Rational{{Num: uint32(u.Hour()), Den: 1}, {Num: uint32(u.Minute()), Den: 1}, {Num: uint32(u.Second()), Den: 1}}}
		}
		payload, err := ph.Payload(binary.BigEndian).Bytes()
		if err != nil {
			t.Fatal(err)
		}
		b, err := exifwrite.JPEG(payload, fixtures.BaseJPEG, nil)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, s.name), b, 0o644); err != nil {
			t.Fatal(err)
		}
		if s.sun {
			pos := spa.At(s.trueUTC, spa.NewObserver(s.place[0], s.place[1], 0), spa.DeltaT(s.trueUTC))
			rows = append(rows, fmt.Sprintf("trip/%s,sun,%.3f,%.3f,1,%.4f,%.4f", s.name, pos.AzimuthDeg, pos.AltitudeDeg, s.place[0], s.place[1]))
		}
	}
	if len(rows) == 0 {
		return dir, nil
	}
	text := "photo,object,sun_azimuth,sun_altitude,bearing_sd,lat,lon\n" + strings.Join(rows, "\n") + "\n"
	sh, err := sheet.Parse(strings.NewReader(text), "sheet.csv")
	if err != nil {
		t.Fatal(err)
	}
	return dir, sh
}

// auditTrip runs the audit on the folder and returns its photos by file
// name and its one camera.
func auditTrip(t *testing.T, dir string, sh *sheet.Sheet) (map[string]report.Photo, report.Camera) {
	t.Helper()
	entries, err := Walk([]string{dir})
	if err != nil {
		t.Fatal(err)
	}
	x := solarcheck.NewExaminer(solarcheck.Options{Zones: zone.NewFinder(nil)})
	res, err := Run(context.Background(), entries, Options{Examiner: x, Sheet: sh, SpoolDir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	defer res.Close()
	photos := map[string]report.Photo{}
	err = res.Photos(context.Background(), false, func(p *report.Photo) error {
		photos[filepath.Base(p.Path)] = *p
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	head := Head(res, Header{})
	if len(head.Cameras) != 1 {
		t.Fatalf("%d cameras, want 1", len(head.Cameras))
	}
	return photos, head.Cameras[0]
}

func checkStatus(p report.Photo, kind string) string {
	for _, c := range p.Checks {
		if c.Kind == kind {
			return c.Status
		}
	}
	return ""
}

// leg builds n GPS-witnessed shots at a place, one a day at 12:00 UTC from
// day0, whose clock shows UTC + clockOffset.
func leg(prefix string, first int, n int, place [2]float64, day0 time.Time, clockOffset time.Duration) []tripShot {
	var out []tripShot
	for i := 0; i < n; i++ {
		u := day0.AddDate(0, 0, i).Add(time.Duration(i*7) * time.Minute)
		out = append(out, tripShot{name: fmt.Sprintf("%s_%04d.JPG", prefix, first+i), place: place, trueUTC: u, wall: u.Add(clockOffset), gps: true,
			gpsLag: time.Duration((first+i)*3%5) * time.Second})
	}
	return out
}

// TestTravelWithoutClockChange: a GPS camera set to Paris time (UTC+1) in
// January, carried one zone east (Helsinki, UTC+2) and, in the second case,
// two (Moscow, UTC+3) without changing its clock. Expected, and why:
//   - the Paris photos are consistent: their own GPS clocks agree with their
//     claims (issue 19: they were called dst_slip with about −3,560 s);
//   - the photos abroad are zone_slip by their own witnesses: the clock shows
//     Paris time there;
//   - the camera has one clock: one segment, no reset, no outlier, set to
//     UTC+01:00 with an error near 0 s.
func TestTravelWithoutClockChange(t *testing.T) {
	jan := time.Date(2026, 1, 10, 11, 0, 0, 0, time.UTC)
	cases := []struct {
		source string
		shots  []tripShot
		abroad map[string]bool
	}{
		{"one zone east: Paris → Helsinki → Paris (tz database offsets)",
			append(append(leg("DSC", 1, 3, paris, jan, time.Hour), leg("DSC", 4, 4, helsinki, jan.AddDate(0, 0, 3), time.Hour)...), leg("DSC", 8, 2, paris, jan.AddDate(0, 0, 7), time.Hour)...),
			map[string]bool{"DSC_0004.JPG": true, "DSC_0005.JPG": true, "DSC_0006.JPG": true, "DSC_0007.JPG": true}},
		{"two zones east: Paris → Helsinki → Moscow (tz database offsets)",
			append(append(leg("DSC", 1, 3, paris, jan, time.Hour), leg("DSC", 4, 2, helsinki, jan.AddDate(0, 0, 3), time.Hour)...), leg("DSC", 6, 3, moscow, jan.AddDate(0, 0, 5), time.Hour)...),
			map[string]bool{"DSC_0004.JPG": true, "DSC_0005.JPG": true, "DSC_0006.JPG": true, "DSC_0007.JPG": true, "DSC_0008.JPG": true}},
	}
	for _, c := range cases {
		dir, sh := writeTrip(t, "Travel", c.shots)
		photos, cam := auditTrip(t, dir, sh)
		for _, s := range c.shots {
			p := photos[s.name]
			want := "consistent"
			if c.abroad[s.name] {
				want = "zone_slip"
			}
			if p.Verdict != want {
				t.Errorf("%s: %s: %s (%s), want %s", c.source, s.name, p.Verdict, p.Explanation, want)
			}
			if st := checkStatus(p, "camera_clock"); st != "agrees" {
				t.Errorf("%s: %s: camera_clock %q, want agrees", c.source, s.name, st)
			}
			// Each photo row carries its camera's drift and interval (8 or
			// more GPS photos over a week: Sen's interval exists).
			if p.CameraDriftSPerDay == nil || p.CameraDriftLowSPerDay == nil || p.CameraDriftHighSPerDay == nil ||
				*p.CameraDriftLowSPerDay > *p.CameraDriftSPerDay || *p.CameraDriftSPerDay > *p.CameraDriftHighSPerDay {
				t.Errorf("%s: %s: camera drift %v (%v to %v)", c.source, s.name, p.CameraDriftSPerDay, p.CameraDriftLowSPerDay, p.CameraDriftHighSPerDay)
			}
		}
		if len(cam.Segments) != 1 || len(cam.Resets) != 0 || len(cam.Outliers) != 0 {
			t.Errorf("%s: segments %d resets %v outliers %v, want one clock", c.source, len(cam.Segments), cam.Resets, cam.Outliers)
		}
		if cam.ClockZone != "UTC+01:00" || cam.OffsetS == nil || *cam.OffsetS < -12 || *cam.OffsetS > 12 {
			t.Errorf("%s: clock zone %q offset %v, want UTC+01:00 and about 0 s (GPS lag up to 10 s)", c.source, cam.ClockZone, cam.OffsetS)
		}
	}
}

// TestTravelResetToNewZone: carried to Helsinki and set to Helsinki time on
// arrival. Expected: every photo consistent (each clock reading fits its
// place), one reset named by the first photo after it, each segment fitted
// alone with its own zone (UTC+01:00, then UTC+02:00), and, with only 4
// witnessed photos each, no drift stated.
func TestTravelResetToNewZone(t *testing.T) {
	jan := time.Date(2026, 1, 10, 11, 0, 0, 0, time.UTC)
	shots := append(leg("DSC", 1, 4, paris, jan, time.Hour), leg("DSC", 5, 4, helsinki, jan.AddDate(0, 0, 4), 2*time.Hour)...)
	dir, sh := writeTrip(t, "Reset", shots)
	photos, cam := auditTrip(t, dir, sh)
	for _, s := range shots {
		if p := photos[s.name]; p.Verdict != "consistent" || p.CameraDriftSPerDay != nil {
			t.Errorf("%s: %s (%s), camera drift %v; want consistent and no drift", s.name, p.Verdict, p.Explanation, p.CameraDriftSPerDay)
		}
	}
	if len(cam.Resets) != 1 || !strings.HasSuffix(cam.Resets[0], "DSC_0005.JPG") {
		t.Errorf("resets %v, want DSC_0005.JPG", cam.Resets)
	}
	if len(cam.Segments) != 2 || cam.Segments[0].ClockZone != "UTC+01:00" || cam.Segments[1].ClockZone != "UTC+02:00" {
		t.Fatalf("segments %+v", cam.Segments)
	}
	for _, sg := range cam.Segments {
		if sg.DriftSPerDay != nil || !strings.Contains(sg.DriftNote, "at least 5") {
			t.Errorf("segment of %d photos: drift %v, note %q", sg.Photos, sg.DriftSPerDay, sg.DriftNote)
		}
	}
	if p := photos["DSC_0005.JPG"]; !strings.Contains(p.Explanation, "reset") || !strings.Contains(p.ClockReset, "DSC_0004.JPG") {
		t.Errorf("the first photo after the reset does not say so: %q, clock_reset %q", p.Explanation, p.ClockReset)
	}
	for _, s := range shots {
		if p := photos[s.name]; (p.ClockReset != "") != (s.name == "DSC_0005.JPG") {
			t.Errorf("%s: clock_reset %q", s.name, p.ClockReset)
		}
	}
}

// TestFactoryResetMidTrip: a camera in Paris in July whose clock fell back
// to 2000-01-01 00:0x after its third photo; the examiner measured the sun
// in the photos after the reset. Expected: one reset, named by the first
// photo after it (DSC_0004, by file number) and said to be a fall-back to
// 2000-01-01; the set clock is modelled from its 3 GPS photos alone, with
// no drift (issue 19: the old model gave 153 s/day from two photos and no
// reset); the photos after the reset are judged by their own shadows (the
// claimed date is wrong: not consistent) and their camera_clock check says
// the clock had lost its setting.
func TestFactoryResetMidTrip(t *testing.T) {
	jul := time.Date(2026, 7, 14, 8, 0, 0, 0, time.UTC)
	shots := leg("DSC", 1, 3, paris, jul, 2*time.Hour)
	for i := 0; i < 3; i++ {
		u := jul.AddDate(0, 0, 3+i).Add(time.Duration(i) * time.Hour)
		shots = append(shots, tripShot{name: fmt.Sprintf("DSC_%04d.JPG", 4+i), place: paris, trueUTC: u,
			wall: time.Date(2000, 1, 1, 0, 3+i*5, 0, 0, time.UTC), sun: true})
	}
	dir, sh := writeTrip(t, "Factory", shots)
	photos, cam := auditTrip(t, dir, sh)
	if len(cam.Resets) != 1 || !strings.HasSuffix(cam.Resets[0], "DSC_0004.JPG") || !strings.Contains(cam.ResetNotes[0], "2000-01-01") {
		t.Errorf("resets %v notes %v, want a fall-back to 2000-01-01 before DSC_0004.JPG", cam.Resets, cam.ResetNotes)
	}
	if cam.DriftSPerDay != nil || cam.DriftNote == "" || len(cam.Segments) != 1 || cam.Segments[0].Photos != 3 {
		t.Errorf("drift %v (%q), segments %+v: want the 3 set photos alone and no drift", cam.DriftSPerDay, cam.DriftNote, cam.Segments)
	}
	for _, s := range shots[:3] {
		if p := photos[s.name]; p.Verdict != "consistent" {
			t.Errorf("%s: %s, want consistent", s.name, p.Verdict)
		}
	}
	for _, s := range shots[3:] {
		p := photos[s.name]
		if p.Verdict == "consistent" || p.Verdict == "unverified" || checkStatus(p, "camera_clock") != "conflicts" {
			t.Errorf("%s: %s, camera_clock %q (%s)", s.name, p.Verdict, checkStatus(p, "camera_clock"), p.Explanation)
		}
		if p.CorrectedUTCEarliest != "" && p.Verdict == "unverified" {
			t.Errorf("%s: dated by the set clock's model across the reset", s.name)
		}
	}
	if p := photos["DSC_0004.JPG"]; !strings.Contains(p.Explanation, "factory date") || !strings.Contains(p.ClockReset, "2000-01-01") {
		t.Errorf("DSC_0004.JPG does not say the clock fell back: %q, clock_reset %q", p.Explanation, p.ClockReset)
	}
}

// TestShotOrderAcrossFallBack: a phone without offset tags that follows New
// York's clock takes IMG_0001 at 01:50 EDT (05:50 UTC) and IMG_0002 thirty
// minutes later at 01:20 EST (06:20 UTC) on 2025-11-02, the end of daylight
// saving (tz database). Their wall times step back, their instants do not:
// no shot_order conflict on either photo.
func TestShotOrderAcrossFallBack(t *testing.T) {
	ny := [2]float64{40.7128, -74.0060}
	shots := []tripShot{
		{name: "IMG_0001.JPG", place: ny, trueUTC: time.Date(2025, 11, 2, 5, 50, 0, 0, time.UTC), wall: time.Date(2025, 11, 2, 1, 50, 0, 0, time.UTC), gps: true},
		{name: "IMG_0002.JPG", place: ny, trueUTC: time.Date(2025, 11, 2, 6, 20, 0, 0, time.UTC), wall: time.Date(2025, 11, 2, 1, 20, 0, 0, time.UTC), gps: true},
	}
	dir, sh := writeTrip(t, "Phone", shots)
	photos, cam := auditTrip(t, dir, sh)
	for _, s := range shots {
		if st := checkStatus(photos[s.name], "shot_order"); st == "conflicts" {
			t.Errorf("%s: shot_order conflicts across the repeated hour", s.name)
		}
	}
	if len(cam.OrderBreaks) != 0 {
		t.Errorf("order breaks %v", cam.OrderBreaks)
	}
}
