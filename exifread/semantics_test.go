package exifread

import (
	"errors"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

func TestParseExifDate(t *testing.T) {
	for _, tc := range []struct {
		src, raw string
		valid    bool
		reason   string // substring of Invalid
		y, mo, d int
		h, mi, s int
	}{
		{"EXIF 3.0 §4.6.5 DateTime layout", "2024:06:21 14:03:27", true, "", 2024, 6, 21, 14, 3, 27},
		{"EXIF 3.0 §4.6.5: unknown date written as blanks", "    :  :     :  :  ", false, "blank", 0, 0, 0, 0, 0, 0},
		{"issue 3: zeros", "0000:00:00 00:00:00", false, "zeros", 0, 0, 0, 0, 0, 0},
		{"EXIF 3.0 §4.6.5: unknown parts as blanks", "2024:06:21   :  :  ", false, "blanks", 0, 0, 0, 0, 0, 0},
		{"common knowledge: no 30 February", "2023:02:30 10:00:00", false, "day 30", 2023, 2, 30, 10, 0, 0},
		{"common knowledge: 2024 is a leap year", "2024:02:29 23:59:59", true, "", 2024, 2, 29, 23, 59, 59},
		{"common knowledge: hour 24 is not a clock reading", "2024:06:21 24:00:00", false, "hour", 2024, 6, 21, 24, 0, 0},
		{"common knowledge", "2024:13:01 00:00:00", false, "month", 2024, 13, 1, 0, 0, 0},
		{"writers that use ISO dashes (from memory)", "2024-06-21 14:03:27", true, "", 2024, 6, 21, 14, 3, 27},
		{"NUL padding (from memory)", "2024:06:21 14:03:27\x00", true, "", 2024, 6, 21, 14, 3, 27},
		{"EXIF 3.0 §4.6.5: 20 bytes including NUL", "2024:06:21 14:03", false, "shorter", 0, 0, 0, 0, 0, 0},
	} {
		w := parseExifDate(tc.raw, SourceEXIF)
		if w.Valid != tc.valid || !strings.Contains(w.Invalid, tc.reason) {
			t.Errorf("%q: valid=%v invalid=%q, want %v %q [%s]", tc.raw, w.Valid, w.Invalid, tc.valid, tc.reason, tc.src)
		}
		if tc.y != 0 && (w.Year != tc.y || w.Month != tc.mo || w.Day != tc.d || w.Hour != tc.h || w.Minute != tc.mi || w.Second != tc.s) {
			t.Errorf("%q: parsed %+v [%s]", tc.raw, w, tc.src)
		}
		if w.Raw != tc.raw {
			t.Errorf("raw not kept: %q", w.Raw)
		}
	}
}

func TestSubSecAndOffset(t *testing.T) {
	for _, tc := range []struct {
		src, raw string
		ns       int
		ok       bool
	}{
		{"EXIF 3.0 SubSecTime: digits are a decimal fraction", "250", 250_000_000, true},
		{"EXIF 3.0 SubSecTime", "07", 70_000_000, true},
		{"EXIF 3.0 SubSecTime", "5", 500_000_000, true},
		{"EXIF 3.0 SubSecTime: trailing blanks allowed", "12  ", 120_000_000, true},
		{"beyond nanoseconds: truncated (from memory)", "1234567891", 123_456_789, true},
		{"not digits", "1a", 0, false},
		{"blank", "   ", 0, false},
	} {
		ns, ok := subSecNanos(tc.raw)
		if ns != tc.ns || ok != tc.ok {
			t.Errorf("subSecNanos(%q) = %d %v, want %d %v [%s]", tc.raw, ns, ok, tc.ns, tc.ok, tc.src)
		}
	}
	for _, tc := range []struct {
		src, raw string
		sec      int
		ok       bool
	}{
		{"EXIF 2.31 OffsetTime layout ±HH:MM", "+02:00", 7200, true},
		{"EXIF 2.31; India is UTC+05:30 (common knowledge)", "+05:30", 19800, true},
		{"EXIF 2.31; Baker Island UTC-12 (common knowledge)", "-12:00", -43200, true},
		{"Kiribati Line Islands UTC+14 (common knowledge)", "+14:00", 50400, true},
		{"no zone on Earth is +15:00 (common knowledge)", "+15:00", 0, false},
		{"EXIF 2.31: blanks mean unknown", "   :  ", 0, false},
		{"missing sign", "02:00", 0, false},
	} {
		sec, ok := parseOffset(tc.raw)
		if sec != tc.sec || ok != tc.ok {
			t.Errorf("parseOffset(%q) = %d %v, want %d %v [%s]", tc.raw, sec, ok, tc.sec, tc.ok, tc.src)
		}
	}
}

func TestXMPDates(t *testing.T) {
	for _, tc := range []struct {
		src, raw string
		valid    bool
		utc      string // "" when no offset
		ns       int
	}{
		{"XMP Part 1 §8.2.1.1 (ISO 8601 subset)", "2022-03-20T15:33:00.5Z", true, "2022-03-20T15:33:00.5Z", 500_000_000},
		{"XMP Part 1 §8.2.1.1", "2023-12-31T20:59:59-03:00", true, "2023-12-31T23:59:59Z", 0},
		{"XMP Part 1 §8.2.1.1: seconds optional", "2023-12-31T20:59+01:00", true, "2023-12-31T19:59:00Z", 0},
		{"XMP Part 1 §8.2.1.1: no zone = unknown zone", "2023-12-31T20:59:59", true, "", 0},
		{"XMP Part 1 §8.2.1.1: date alone names no moment", "2023-12-31", false, "", 0},
		{"exiftool-style colons (seen in sidecars, from memory)", "2023:12:31 20:59:59+02:00", true, "2023-12-31T18:59:59Z", 0},
		{"garbage", "yesterday", false, "", 0},
	} {
		w := parseXMPDate(tc.raw, SourceXMP)
		if w.Valid != tc.valid {
			t.Errorf("%q: valid=%v (%s) [%s]", tc.raw, w.Valid, w.Invalid, tc.src)
			continue
		}
		u, ok := w.UTC()
		if tc.utc == "" {
			if ok {
				t.Errorf("%q: UTC() = %v, want none without an offset [%s]", tc.raw, u, tc.src)
			}
			continue
		}
		if !ok || u.Format(time.RFC3339Nano) != tc.utc || w.Nanosecond != tc.ns {
			t.Errorf("%q: UTC() = %v %v ns %d, want %s [%s]", tc.raw, u, ok, w.Nanosecond, tc.utc, tc.src)
		}
	}
}

// TestNeverLocalZone: a wall time without an offset has no instant, and In
// interprets it only in the zone the caller gives.
func TestNeverLocalZone(t *testing.T) {
	w := parseExifDate("2024:06:21 14:03:27", SourceEXIF)
	if _, ok := w.UTC(); ok {
		t.Errorf("UTC() answered without an offset")
	}
	tokyo := time.FixedZone("JST", 9*3600)
	got, err := w.In(tokyo)
	if err != nil || got.UTC().Format(time.RFC3339) != "2024-06-21T05:03:27Z" {
		t.Errorf("In(+09:00) = %v %v, want 05:03:27Z (common knowledge: JST = UTC+9)", got, err)
	}
}

// gpsPayload builds a JPEG whose GPS IFD holds entries, with one EXIF date.
func gpsRecord(t *testing.T, dto string, gps ...exifwrite.Entry) Record {
	t.Helper()
	p := exifwrite.Payload{Raw: true, IFD0: camera(), GPS: gps}
	if dto != "" {
		p.Exif = []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagDateTimeOriginal, dto)}
	}
	pl, err := p.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	return readBytes(jpegWith(t, pl))
}

func r(n, d uint32) exifwrite.Rational { return exifwrite.Rational{Num: n, Den: d} }

func TestGPSValidity(t *testing.T) {
	lat := func(deg uint32, ref string) []exifwrite.Entry {
		return []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagGPSLatitudeRef, ref), exifwrite.Rat(exifwrite.TagGPSLatitude, r(deg, 1), r(0, 1), r(0, 1)),
			exifwrite.ASCII(exifwrite.TagGPSLongitudeRef, "E"), exifwrite.Rat(exifwrite.TagGPSLongitude, r(10, 1), r(30, 1), r(0, 1))}
	}
	stamp := func(date string, h, m, s exifwrite.Rational) []exifwrite.Entry {
		return []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagGPSDateStamp, date), exifwrite.Rat(exifwrite.TagGPSTimeStamp, h, m, s)}
	}
	cat := func(a ...[]exifwrite.Entry) []exifwrite.Entry {
		var out []exifwrite.Entry
		for _, x := range a {
			out = append(out, x...)
		}
		return out
	}
	for _, tc := range []struct {
		name, src string
		dto       string
		gps       []exifwrite.Entry
		field     string // "position", "time", "direction", "altitude"
		valid     bool
		reason    string
	}{
		{"south latitude", "EXIF 3.0 GPSLatitudeRef S = south", "", lat(33, "S"), "position", true, ""},
		{"latitude 95", "common knowledge: |latitude| <= 90", "", lat(95, "N"), "position", false, "beyond ±90"},
		{"zero denominators", "issue 3: goexif LatLong gives NaN", "", []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagGPSLatitudeRef, "N"),
			exifwrite.Rat(exifwrite.TagGPSLatitude, r(0, 0), r(0, 0), r(0, 0)), exifwrite.ASCII(exifwrite.TagGPSLongitudeRef, "E"),
			exifwrite.Rat(exifwrite.TagGPSLongitude, r(1, 1), r(0, 1), r(0, 1))}, "position", false, "zero denominator"},
		{"exactly (0,0)", "issue 3: receiver without a fix", "", []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagGPSLatitudeRef, "N"),
			exifwrite.Rat(exifwrite.TagGPSLatitude, r(0, 1), r(0, 1), r(0, 1)), exifwrite.ASCII(exifwrite.TagGPSLongitudeRef, "E"),
			exifwrite.Rat(exifwrite.TagGPSLongitude, r(0, 1), r(0, 1), r(0, 1))}, "position", false, "(0, 0)"},
		{"bad ref", "EXIF 3.0: ref is N or S", "", lat(10, "X"), "position", false, "neither"},
		{"time ok", "EXIF 3.0 GPSTimeStamp", "2024:06:21 14:03:27", stamp("2024:06:21", r(12, 1), r(3, 1), r(2650, 100)), "time", true, ""},
		{"hour 25", "issue 3: GPS time fields out of range", "", stamp("2024:06:21", r(25, 1), r(0, 1), r(0, 1)), "time", false, "outside"},
		{"minute 60", "issue 3", "", stamp("2024:06:21", r(1, 1), r(60, 1), r(0, 1)), "time", false, "outside"},
		{"1980 date", "issue 3: GPS dates before 1990", "", stamp("1980:01:06", r(0, 1), r(0, 1), r(0, 1)), "time", false, "before 1990"},
		{"after the other dates", "issue 3: GPS date in the future of the file's dates", "2020:01:01 12:00:00", stamp("2024:06:21", r(0, 1), r(0, 1), r(0, 1)), "time", false, "after every other date"},
		{"13 h after a wall time (zones up to +14)", "common knowledge: offsets reach -12 h", "2024:06:21 10:00:00", stamp("2024:06:21", r(23, 1), r(0, 1), r(0, 1)), "time", true, ""},
		{"time without date", "EXIF 3.0: both tags needed", "", []exifwrite.Entry{exifwrite.Rat(exifwrite.TagGPSTimeStamp, r(1, 1), r(2, 1), r(3, 1))}, "time", false, "without GPSDateStamp"},
		{"direction 400", "issue 3: direction outside 0–360", "", []exifwrite.Entry{exifwrite.Rat(exifwrite.TagGPSImgDirection, r(400, 1))}, "direction", false, "outside"},
		{"direction 359.99", "EXIF 3.0: 0.00 to 359.99", "", []exifwrite.Entry{exifwrite.Rat(exifwrite.TagGPSImgDirection, r(35999, 100))}, "direction", true, ""},
		{"below sea level", "EXIF 3.0: GPSAltitudeRef 1 = below sea level", "", []exifwrite.Entry{exifwrite.Bytes(exifwrite.TagGPSAltitudeRef, 1), exifwrite.Rat(exifwrite.TagGPSAltitude, r(1225, 100))}, "altitude", true, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := gpsRecord(t, tc.dto, cat(tc.gps)...)
			var valid bool
			var reason string
			switch tc.field {
			case "position":
				p := rec.GPS.Position
				if p == nil {
					t.Fatalf("no position")
				}
				valid, reason = p.Valid, p.Invalid
				if tc.name == "south latitude" && (p.LatDeg == nil || *p.LatDeg != -33 || *p.LonDeg != 10.5) {
					t.Errorf("position %v %v, want -33, 10.5 [%s]", deref(p.LatDeg), deref(p.LonDeg), tc.src)
				}
			case "time":
				g := rec.GPS.Time
				if g == nil {
					t.Fatalf("no GPS time")
				}
				valid, reason = g.Valid, g.Invalid
				if tc.name == "time ok" && g.UTC.Format(time.RFC3339Nano) != "2024-06-21T12:03:26.5Z" {
					t.Errorf("GPS UTC %v", g.UTC)
				}
			case "direction":
				valid, reason = rec.GPS.ImgDirectionDeg.Valid, rec.GPS.ImgDirectionDeg.Invalid
			case "altitude":
				valid = rec.GPS.AltitudeM.Valid
				if rec.GPS.AltitudeM.Value != -12.25 {
					t.Errorf("altitude %v, want -12.25 [%s]", rec.GPS.AltitudeM.Value, tc.src)
				}
			}
			if valid != tc.valid || !strings.Contains(reason, tc.reason) {
				t.Errorf("valid=%v reason=%q, want %v %q [%s]", valid, reason, tc.valid, tc.reason, tc.src)
			}
		})
	}
}

// TestDamagedContainers: each walker reports damage with the right kind.
func TestDamagedContainers(t *testing.T) {
	pl, err := fullPayload()
	if err != nil {
		t.Fatal(err)
	}
	jpg := jpegWith(t, pl)
	exifEnd := 2 + 2 + 2 + len("Exif\x00\x00") + len(pl) // SOI + APP1 marker+length + id + payload
	heic, _ := exifwrite.HEIF(pl)
	webp, _ := exifwrite.WebP(pl, 16, 16)
	for _, tc := range []struct {
		name     string
		data     []byte
		kind     string // "format", "unsupported", "limit", "" for none
		wantMake bool
	}{
		{"jpeg cut after the Exif segment", jpg[:exifEnd], "", true},
		{"jpeg cut inside the Exif segment", jpg[:exifEnd-40], "format", true},
		{"jpeg cut after SOI", jpg[:2], "", false},
		{"empty file", nil, "format", false},
		{"text file", []byte("hello, world, this is not a photo"), "unsupported", false},
		{"heif cut inside mdat", heic[:len(heic)-50], "format", false},
		{"heif without meta", append([]byte{0, 0, 0, 16, 'f', 't', 'y', 'p', 'h', 'e', 'i', 'c', 0, 0, 0, 0}, []byte{0, 0, 0, 8, 'f', 'r', 'e', 'e'}...), "format", false},
		{"webp cut inside EXIF", webp[:len(webp)-10], "format", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := readBytes(tc.data)
			var fe *FormatError
			var ue *UnsupportedError
			var le *LimitError
			switch tc.kind {
			case "":
				if rec.Err != nil {
					t.Errorf("Err = %v, want none", rec.Err)
				}
			case "format":
				if !errors.As(rec.Err, &fe) {
					t.Errorf("Err = %v, want FormatError", rec.Err)
				}
			case "unsupported":
				if !errors.As(rec.Err, &ue) {
					t.Errorf("Err = %v, want UnsupportedError", rec.Err)
				}
			case "limit":
				if !errors.As(rec.Err, &le) {
					t.Errorf("Err = %v, want LimitError", rec.Err)
				}
			}
			if tc.wantMake && rec.Make != "Gnomon Test Optics" {
				t.Errorf("Make = %q, want it read from what remains", rec.Make)
			}
			if tc.kind != "" && rec.Error == "" {
				t.Errorf("Error text empty")
			}
		})
	}
}

func TestLimits(t *testing.T) {
	pl, err := fullPayload()
	if err != nil {
		t.Fatal(err)
	}
	heic, _ := exifwrite.HEIF(pl)
	for _, tc := range []struct {
		name  string
		data  []byte
		opt   Options
		limit string
	}{
		{"exif larger than MaxExifBytes", heic, Options{MaxExifBytes: 100}, "MaxExifBytes"},
		{"meta larger than MaxMetaBoxBytes", heic, Options{MaxMetaBoxBytes: 64}, "MaxMetaBoxBytes"},
		{"more entries than MaxEntriesPerIFD", jpegWith(t, pl), Options{MaxEntriesPerIFD: 3}, "MaxEntriesPerIFD"},
		{"more segments than MaxSegments", jpegWith(t, pl), Options{MaxSegments: 1}, "MaxSegments"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := Read(bytesReader(tc.data), int64(len(tc.data)), tc.opt)
			var le *LimitError
			if !errors.As(rec.Err, &le) || le.Limit != tc.limit {
				t.Errorf("Err = %v, want LimitError on %s", rec.Err, tc.limit)
			}
		})
	}
}

// TestOffsetTags: offsets are attached per time (EXIF 2.31: OffsetTimeOriginal
// belongs to DateTimeOriginal, OffsetTime to DateTime); an unusable offset is
// reported and left out, never guessed.
func TestOffsetTags(t *testing.T) {
	p := exifwrite.Payload{IFD0: append(camera(), exifwrite.ASCII(exifwrite.TagDateTime, "2024:06:22 09:00:00")), Exif: []exifwrite.Entry{
		exifwrite.ASCII(exifwrite.TagDateTimeOriginal, "2024:06:21 14:03:27"),
		exifwrite.ASCII(exifwrite.TagOffsetTimeOriginal, "+15:30"),
		exifwrite.ASCII(exifwrite.TagOffsetTime, "-04:00"),
	}}
	pl, err := p.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	rec := readBytes(jpegWith(t, pl))
	if rec.DateTimeOriginal.OffsetSec != nil || rec.DateTimeOriginal.OffsetRaw != "+15:30" {
		t.Errorf("DTO offset %v %q: want raw kept, none used (no zone is +15:30)", rec.DateTimeOriginal.OffsetSec, rec.DateTimeOriginal.OffsetRaw)
	}
	if !strings.Contains(strings.Join(rec.Warnings, "\n"), "+15:30") {
		t.Errorf("no warning about +15:30: %q", rec.Warnings)
	}
	if o := rec.DateTime.OffsetSec; o == nil || *o != -4*3600 {
		t.Errorf("DateTime offset %v, want -14400 (EXIF 2.31 OffsetTime)", o)
	}
}

// TestQuotedBounded: a value quoted in a warning or error is cut to
// maxQuotedBytes at a character boundary, says how long it was, and stays
// a valid Go string literal up to the cut (issue 6: crafted 200 KB values
// must not fill every report row).
func TestQuotedBounded(t *testing.T) {
	cases := []struct{ source, in, want string }{
		{"short value kept whole (strconv.Quote)", "Acme", `"Acme"`},
		{"exactly the bound kept whole", strings.Repeat("a", maxQuotedBytes), strconv.Quote(strings.Repeat("a", maxQuotedBytes))},
		{"one byte over: cut, length stated", strings.Repeat("a", maxQuotedBytes+1), strconv.Quote(strings.Repeat("a", maxQuotedBytes)) + "… (65 bytes in all)"},
		{"two-byte characters: no split character (UTF-8, RFC 3629)", strings.Repeat("é", 40), strconv.Quote(strings.Repeat("é", 32)) + "… (80 bytes in all)"},
		{"control characters escaped (strconv.Quote)", "a\nb\u202e", `"a\nb\u202e"`},
	}
	for _, c := range cases {
		if got := quoted(c.in); got != c.want {
			t.Errorf("%s: quoted → %s, want %s", c.source, got, c.want)
		}
	}
}
