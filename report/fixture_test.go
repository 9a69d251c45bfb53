package report

import (
	"bytes"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

func fp(x float64) *float64 { return &x }

// Hostile strings planted in the fixture; none may act in any output.
const (
	hostScript   = "<script>alert('path')</script>.jpg"
	hostImg      = `<img src=x onerror="alert('camera')">`
	hostSVG      = "</svg><script>alert('explanation')</script>"
	hostJSURL    = "javascript:alert('thumb')"
	hostRTL      = "holiday\u202Egpj.exe"
	hostFormula  = "=HYPERLINK(\"http://example.invalid\",\"click\")"
	hostFormula2 = " \t@SUM(1+1)*cmd|' /C calc'!A0"
	hostInvalid  = "bad\xff\xfename.jpg"
	hostTitle    = "</title><script>alert('object')</script>"
	hostStyle    = "</style><iframe src=javascript:alert(1)></iframe>"
)

// approxSun is a rough sun position (Cooper's declination, no equation of
// time) used only to give the fixture's charts a plausible shape; it makes
// no claim of accuracy and nothing is tested against it.
func approxSun(t time.Time, latDeg, lonDeg float64) SunAt {
	decl := angle.Rad(23.44 * math.Sin(2*math.Pi*(284+float64(t.YearDay()))/365))
	hours := float64(t.Hour()) + float64(t.Minute())/60 + lonDeg/15
	h := angle.Rad((hours - 12) * 15)
	lat := angle.Rad(latDeg)
	sinAlt := math.Sin(lat)*math.Sin(decl) + math.Cos(lat)*math.Cos(decl)*math.Cos(h)
	alt := math.Asin(sinAlt)
	az := math.Atan2(-math.Sin(h), math.Tan(decl)*math.Cos(lat)-math.Sin(lat)*math.Cos(h))
	azDeg := math.Mod(angle.Deg(az)+360, 360)
	return SunAt{Time: t.UTC().Format(time.RFC3339), Azimuth: math.Round(azDeg*100) / 100, Altitude: math.Round(angle.Deg(alt)*100) / 100}
}

func sunDay(day time.Time, lat, lon float64) []SunAt {
	var out []SunAt
	for m := 0; m < 24*60; m += 20 {
		out = append(out, approxSun(day.Add(time.Duration(m)*time.Minute), lat, lon))
	}
	return out
}

// fixtureAudit is an invented case: a harbour town at 43.2° N, three
// cameras, every verdict, and hostile strings in every photo-sourced field.
func fixtureAudit() *Audit {
	lat, lon := 43.21, 5.37
	day := time.Date(2025, 6, 14, 0, 0, 0, 0, time.UTC)
	at := func(h, m int) time.Time { return day.Add(time.Duration(h)*time.Hour + time.Duration(m)*time.Minute) }
	path := sunDay(day, lat, lon)
	photo := func(p Photo, claimed time.Time) Photo {
		p.Root = "/cases/harbour"
		p.ID = "harbour/" + p.Path
		p.SHA256 = "9f2c0b5e7a1d4c3b8e6f0a2d4c6e8b0a1c3e5f7092b4d6f8a0c2e4b6d8f0a2c4"
		p.Size = 4_812_337
		p.Container = "jpeg"
		p.Zone = "Europe/Paris"
		p.ClaimedUTC = claimed.Format(time.RFC3339)
		p.ClaimedLocal = claimed.Add(2 * time.Hour).Format("2006:01:02 15:04:05")
		p.ClaimSource = "DateTimeOriginal+OffsetTimeOriginal"
		p.Lat, p.Lon = fp(lat), fp(lon)
		s := approxSun(claimed, lat, lon)
		p.Sun = &s
		p.SunPath = path
		return p
	}
	ok := photo(Photo{Path: "quay/IMG_0101.JPG", Camera: "cam-A", Verdict: "consistent",
		Explanation: "The shadow of the lamp post and the GPS clock both agree with the claimed time within 4 minutes.",
		OffsetS:     fp(-12), OffsetLowS: fp(-140), OffsetHighS: fp(150), Thumbnail: "thumbs/0001.jpg",
		CorrectedUTCEarliest: "2025-06-14T08:57:48Z", CorrectedUTCLatest: "2025-06-14T09:02:32Z",
		Checks: []Check{
			{Kind: "shadow", Status: "agrees", Figure: fp(-12), Unit: "s", Uncertainty: fp(145), Sentence: "Shadow azimuth fits the claimed time."},
			{Kind: "gps_clock", Status: "agrees", Figure: fp(1), Unit: "s", Uncertainty: fp(1), Sentence: "GPS time matches the camera clock."},
		},
		Measured: []Measured{{Object: "lamp post", Azimuth: 101.5, AzimuthSD: 1.5, Altitude: 40.2, AltitudeSD: 2, HasAltitude: true}},
	}, at(9, 0))
	ok.BestFit = &SunAt{Azimuth: 101.6, Altitude: 40.1}
	drift := photo(Photo{Path: "quay/IMG_0144.JPG", Camera: "cam-B", Verdict: "clock_offset",
		Explanation: "The camera clock runs 7 min 30 s ahead of the sun; its drift fits the other photos from this camera.",
		OffsetS:     fp(450), OffsetLowS: fp(330), OffsetHighS: fp(570), Thumbnail: "thumbs/0002.jpg",
		CorrectedUTCEarliest: "2025-06-14T13:20:30Z", CorrectedUTCLatest: "2025-06-14T13:24:30Z",
		Checks:   []Check{{Kind: "shadow", Status: "disagrees", Figure: fp(450), Unit: "s", Uncertainty: fp(120), Sentence: "Shadows point 7 min 30 s earlier."}},
		Measured: []Measured{{Object: "bollard", Azimuth: 226, AzimuthSD: 2, Altitude: 0, HasAltitude: false}},
		Rejected: []Alternative{{Verdict: "zone_slip", Reason: "The offset is not a whole or half hour."}},
	}, at(13, 30))
	drift.BestFit = &SunAt{Azimuth: 225.2, Altitude: 60.8}
	zone := photo(Photo{Path: "market/DSC_2001.NEF", Camera: "cam-C", Verdict: "zone_slip",
		Explanation: "The clock reads UTC, not local time: exactly two hours behind the sun.", OffsetS: fp(-7200), OffsetLowS: fp(-7390), OffsetHighS: fp(-7010),
		CorrectedUTCEarliest: "2025-06-14T15:00:00Z", CorrectedUTCLatest: "2025-06-14T15:06:00Z", ZoneOptions: []string{"Europe/Paris", "Europe/Monaco"}}, at(13, 3))
	night := photo(Photo{Path: "market/DSC_2017.NEF", Camera: "cam-C", Verdict: "ampm_slip",
		Explanation: "A daylight exposure (1/1000 s, f/8, ISO 100) stamped 02:15; at 14:15 the sun fits.", OffsetS: fp(-43200), OffsetLowS: fp(-43500), OffsetHighS: fp(-42900)}, at(0, 15))
	broken := Photo{Path: "misc/truncated.jpg", Root: "/cases/harbour", ID: "harbour/misc/truncated.jpg", Size: 0, Verdict: "unreadable", Error: "exifread: damaged: file is empty"}
	hostile := photo(Photo{Path: hostScript, Camera: hostImg, Verdict: "light_mismatch", Explanation: hostSVG,
		Thumbnail: hostJSURL, ClaimSource: hostFormula, Zone: hostRTL, Container: hostStyle,
		Checks:   []Check{{Kind: "exposure", Status: "disagrees", Figure: fp(-6.5), Unit: "EV", Uncertainty: fp(2), Sentence: hostFormula2}},
		Measured: []Measured{{Object: hostTitle, Azimuth: 300, AzimuthSD: 4, Altitude: 10, AltitudeSD: 3, HasAltitude: true}},
		Error:    hostRTL + " " + hostInvalid}, at(19, 40))
	hostile.ClaimedLocal = hostFormula
	hostile.FileNotes = []string{"extension .jpg suggests jpeg but the bytes are png", hostFormula2, hostInvalid}
	weird := Photo{Path: hostInvalid, Root: "/cases/harbour", ID: "harbour/" + hostInvalid, Camera: "-2+3", Verdict: "unverified",
		Explanation: "@no independent evidence", Lat: fp(math.NaN()), Lon: fp(200)}
	place := photo(Photo{Path: "z/far.jpg", Camera: "cam-A", Verdict: "place_mismatch", ShadowFix: &Fix{Lat: 40.9, Lon: 14.2, RadiusKm: 35},
		Explanation: "The shadows fit the GPS time only about 800 km to the south-east."}, at(10, 10))
	season := photo(Photo{Path: "z/winter.jpg", Camera: "cam-A", Verdict: "season_mismatch", Explanation: "The noon sun is 43° lower than in June."}, at(12, 0))
	dst := photo(Photo{Path: "z/dst.jpg", Camera: "cam-B", Verdict: "dst_slip", Explanation: "One hour off: the clock kept winter time."}, at(16, 0))
	twice := photo(Photo{Path: "z/twice.jpg", Camera: "cam-B", Verdict: "ambiguous",
		Explanation: "The wall time 2025-11-02 01:30:00 came twice in America/New_York: the clocks were put back over it. The evidence does not tell which reading was meant, so no verdict is given on the time.",
		ClaimNotes:  []string{"In America/New_York this wall time came twice: the clocks went back at 2025-11-02 06:00 UTC; both readings are kept"},
		Readings: []Reading{
			{UTC: "2025-11-02T05:30:00Z", UTCOffset: "-04:00", Abbreviation: "EDT", Zone: "America/New_York", WallTimeExisted: true, Verdict: "unverified", Explanation: "No independent witness."},
			{UTC: "2025-11-02T06:30:00Z", UTCOffset: "-05:00", Abbreviation: "EST", Zone: "America/New_York", WallTimeExisted: true, Verdict: "unverified", Explanation: "No independent witness."},
		}}, at(5, 30))
	used := photo(Photo{Path: "z/used.jpg", Camera: "cam-B", Verdict: "consistent",
		Explanation: "The evidence fits only the reading UTC−05:00 (EST), which is used.", OffsetS: fp(-5), OffsetLowS: fp(-15), OffsetHighS: fp(13),
		Readings: []Reading{
			{UTC: "2025-11-02T05:30:00Z", UTCOffset: "-04:00", Abbreviation: "EDT", Zone: "America/New_York", WallTimeExisted: true, Verdict: "dst_slip", OffsetS: fp(-3605), OffsetLowS: fp(-3615), OffsetHighS: fp(-3587), Explanation: "One hour off."},
			{UTC: "2025-11-02T06:30:00Z", UTCOffset: "-05:00", Abbreviation: "EST", Zone: "America/New_York", WallTimeExisted: true, Used: true, Verdict: "consistent", OffsetS: fp(-5), OffsetLowS: fp(-15), OffsetHighS: fp(13), Explanation: "Consistent."},
		}}, at(6, 30))
	// A New York photo at the repeated hour of 2025-11-02 (15 U.S.C. §260a):
	// its own place, zone and wall time, not the harbour's.
	newYork := func(p *Photo, wall string) {
		p.Zone, p.ClaimSource, p.ClaimedLocal = "America/New_York", "place_zone", wall
		p.Lat, p.Lon = fp(40.7128), fp(-74.006)
		p.SunPath = sunDay(time.Date(2025, 11, 1, 18, 0, 0, 0, time.UTC), 40.7128, -74.006)
	}
	newYork(&twice, "2025:11:02 01:30:00")
	twice.ClaimedUTC, twice.Sun = "", nil
	newYork(&used, "2025:11:02 01:30:00")
	used.ClaimedUTC = "2025-11-02T06:30:00Z"
	usedSun := approxSun(time.Date(2025, 11, 2, 6, 30, 0, 0, time.UTC), 40.7128, -74.006)
	used.Sun = &usedSun

	var pts []ClockPoint
	for i := range 9 {
		t := day.Add(time.Duration(i*4) * 24 * time.Hour).Add(10 * time.Hour)
		off := 300 + 20*float64(i)
		if i == 6 {
			off += 400
		}
		pts = append(pts, ClockPoint{Path: "quay/IMG_01" + string(rune('0'+i)) + ".JPG", ClaimedUTC: t.Format(time.RFC3339),
			OffsetS: off, LowS: off - 60, HighS: off + 60, Outlier: i == 6})
	}
	// cam-D: a clock set one zone ahead on arrival: two segments and a reset.
	var reset []ClockPoint
	for i := range 6 {
		t := day.Add(time.Duration(i) * 24 * time.Hour).Add(9 * time.Hour)
		seg, off := 0, 3.0
		if i >= 3 {
			seg, off = 1, -2.0
		}
		reset = append(reset, ClockPoint{Path: fmt.Sprintf("trip/D_%04d.JPG", i+1), ClaimedUTC: t.Format(time.RFC3339),
			OffsetS: off, LowS: off - 6, HighS: off + 6, Segment: seg})
	}
	return &Audit{
		Schema: SchemaID,
		Tool:   Tool{Name: "gnomon", Version: "0.1.0-test", GoVersion: "go1.26.8"},
		Run: Run{
			Started: "2025-07-01T10:00:00Z", Finished: "2025-07-01T10:00:07Z",
			CommandLine: []string{"gnomon", "audit", "/cases/harbour", "--shadows", "sheet.csv", hostRTL},
			Inputs:      []string{"/cases/harbour", hostScript},
			ShadowSheet: "sheet.csv", ShadowSheetSHA: "0d1e2f3a4b5c6d7e8f90a1b2c3d4e5f60718293a4b5c6d7e8f90a1b2c3d4e5f6",
			DeltaTModel: "Espenak & Meeus 2006", TZDataVersion: "2025b", ZoneMapVersion: "tzf-rel-lite 2025b", MagneticModel: "WMM2025",
			SelfTest: SelfTest{Passed: true, Checks: []SelfCheck{
				{Name: "sun position", Source: "NREL SPA report Table A4.1", Passed: true, Detail: "azimuth 194.34028°"},
				{Name: "zone lookup", Source: "IANA tz", Passed: true},
			}},
			Counts:      Counts{Files: 10, ByVerdict: map[string]int{"consistent": 1, "clock_offset": 1}, Cameras: 3},
			SheetErrors: []string{"sheet.csv:4:3: " + hostFormula},
			Notes:       []string{hostSVG},
		},
		Photos: []Photo{hostile, zone, ok, drift, night, broken, weird, place, season, dst, twice, used},
		Cameras: []Camera{
			{ID: "cam-B", Photos: 9, OffsetS: fp(380), OffsetSDs: fp(12), DriftSPerDay: fp(5), DriftPPM: fp(57.9), OffsetAtUTC: pts[4].ClaimedUTC,
				Outliers: []string{pts[6].Path}, Points: pts, Note: "Drifts about 2.5 minutes a month."},
			{ID: "cam-A", Photos: 3},
			{ID: "cam-D", Photos: 6, ClockZone: "UTC+02:00", OffsetS: fp(4), OffsetLowS: fp(-2), OffsetHighS: fp(10), OffsetAtUTC: reset[1].ClaimedUTC,
				Segments: []ClockSegment{
					{ClockZone: "UTC+02:00", Photos: 3, OffsetS: fp(4), OffsetLowS: fp(-2), OffsetHighS: fp(10), OffsetAtUTC: reset[1].ClaimedUTC, DriftNote: "only 3 photos have a time witness: a drift and its 95 % interval need at least 5 at different times"},
					{ClockZone: "UTC+03:00", Photos: 3, OffsetS: fp(-2), OffsetLowS: fp(-8), OffsetHighS: fp(4), OffsetAtUTC: reset[4].ClaimedUTC, DriftNote: "only 3 photos have a time witness: a drift and its 95 % interval need at least 5 at different times"},
				},
				DriftNote: "only 3 photos have a time witness: a drift and its 95 % interval need at least 5 at different times",
				Resets:    []string{reset[3].Path}, ResetNotes: []string{"The clock was reset by +1 h between trip/D_0003.JPG and trip/D_0004.JPG."},
				Points: reset, Note: "The clock was reset 1 time(s); the figures above are for the segment with the most evidence (3 photos with a time witness); every segment is listed."},
			{ID: hostSVG, Photos: 1, OffsetS: fp(-3600), Points: []ClockPoint{{Path: hostScript, ClaimedUTC: "2025-06-14T19:40:00Z", OffsetS: -3600, LowS: -3700, HighS: -3500}},
				Outliers: []string{hostInvalid}},
		},
	}
}

// testImage returns a PNG whose quadrants have distinct colours.
func testImage(w, h int) []byte {
	img := image.NewNRGBA(image.Rect(0, 0, w, h))
	for y := range h {
		for x := range w {
			c := color.NRGBA{uint8(40 + 180*x/w), uint8(60 + 150*y/h), 150, 255}
			if x < w/2 && y < h/2 {
				c = color.NRGBA{220, 60, 40, 255}
			}
			img.Set(x, y, c)
		}
	}
	var b bytes.Buffer
	if err := png.Encode(&b, img); err != nil {
		panic(err)
	}
	return b.Bytes()
}

func opener(b []byte) func() (io.ReadCloser, error) {
	return func() (io.ReadCloser, error) { return io.NopCloser(bytes.NewReader(b)), nil }
}
