package sheet_test

import (
	"errors"
	"fmt"
	"strings"

	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
)

func ExampleParse() {
	src := "photo;object;object_height;shadow_length;shadow_bearing\n" +
		"IMG_0042.jpg;lamp post;4,2;6,1;312\n" +
		"IMG_0043.jpg;fence;1,1;abc;300\n"
	s, err := sheet.Parse(strings.NewReader(src), "shadows.csv")
	for _, r := range s.Rows {
		fmt.Printf("line %d: %s %s %.1f/%.1f toward %.0f°\n", r.Line, r.Kind, r.Object, *r.ObjectHeight, *r.ShadowLength, *r.ShadowBearingDeg)
	}
	fmt.Println(err)
	fmt.Println(errors.Is(err, sheet.ErrNotNumber))
	// Output:
	// line 2: shadow lamp post 4.2/6.1 toward 312°
	// shadows.csv:3:4 (shadow_length): not a number: "abc"
	// true
}

func ExampleSheet_Resolve() {
	src := "photo,sun_azimuth\nIMG_0001.jpg,181\nday2/IMG_0002.jpg,200\nIMG_0009.jpg,90\n"
	s, _ := sheet.Parse(strings.NewReader(src), "m.csv")
	rows, err := s.Resolve([]sheet.Name{
		{ID: "card/day1/IMG_0001.jpg", Rel: "day1/IMG_0001.jpg"},
		{ID: "card/day2/IMG_0002.jpg", Rel: "day2/IMG_0002.jpg"},
	})
	fmt.Println(len(rows["card/day1/IMG_0001.jpg"]), len(rows["card/day2/IMG_0002.jpg"]))
	fmt.Println(err)
	// Output:
	// 1 1
	// m.csv:4:1 (photo): no photo of that name in the audited folders: "IMG_0009.jpg"
}

func ExampleWriteTemplate() {
	lat, lon := 45.4642, 9.19
	var buf strings.Builder
	_ = sheet.WriteTemplate(&buf, []sheet.TemplateRow{
		{Photo: "trip/IMG_0001.jpg", ClaimedLocal: "2026-05-03 14:22:05", ClaimTag: "DateTimeOriginal", Lat: &lat, Lon: &lon},
		{Photo: "trip/IMG_0002.jpg"},
	})
	// Lines end in CRLF (RFC 4180); shown here as plain line breaks.
	fmt.Print(strings.ReplaceAll(buf.String(), "\r\n", "\n"))
	// Output:
	// photo,object,object_height,shadow_length,shadow_bearing,bearing_ref,bearing_sd,length_sd_pct,slope,slope_toward,sun_azimuth,sun_altitude,declination,lat,lon,time,note
	// trip/IMG_0001.jpg,,,,,,,,,,,,,,,,camera clock says 2026-05-03 14:22:05; GPS says lat 45.4642 lon 9.19
	// trip/IMG_0002.jpg,,,,,,,,,,,,,,,,no capture time in the file; no GPS position: give lat/lon
}
