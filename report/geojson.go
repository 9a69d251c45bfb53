package report

import (
	"errors"
	"fmt"
	"io"
	"math"
)

// Feature kinds in report.geojson.
const (
	FeatureGPS       = "gps"        // the position the photo's GPS tags give
	FeatureShadowFix = "shadow_fix" // the position the measured shadows give at the GPS time
)

// geoFeature is an RFC 7946 §3.2 Feature. Geometry is nil (null) when the
// position could not be drawn; SkippedReason then says why.
type geoFeature struct {
	Type       string        `json:"type"`
	Geometry   *geoPoint     `json:"geometry"`
	Properties geoProperties `json:"properties"`
}

// geoPoint is an RFC 7946 §3.1.2 Point: [longitude, latitude].
type geoPoint struct {
	Type        string    `json:"type"`
	Coordinates []float64 `json:"coordinates"`
}

type geoProperties struct {
	Kind                 string   `json:"kind"`
	Path                 string   `json:"path"`
	Root                 string   `json:"root"`
	Camera               string   `json:"camera"`
	Verdict              string   `json:"verdict"`
	ClaimedUTC           string   `json:"claimed_utc"`
	CorrectedUTCEarliest string   `json:"corrected_utc_earliest"`
	CorrectedUTCLatest   string   `json:"corrected_utc_latest"`
	RadiusKm             *float64 `json:"radius_km,omitempty"`
	SkippedReason        string   `json:"skipped_reason,omitempty"`
	ClockReset           string   `json:"clock_reset,omitempty"` // as Photo.ClockReset
}

// WriteGeoJSON writes report.geojson: an RFC 7946 FeatureCollection with, for
// each photo (sorted by path) that has GPS tags, a Point Feature of kind "gps",
// and, where the shadows gave a position, a second Feature of kind
// "shadow_fix" with its radius_km. Coordinates are [longitude, latitude] in
// WGS 84 (RFC 7946 §3.1.1, §4). Photos without any GPS tag have no Feature
// (report.json and report.csv account for them). A position that cannot be
// drawn (non-finite, |lat| > 90, |lon| > 180, or only one of lat/lon present)
// is kept as a Feature with null geometry and a "skipped_reason" property, so
// a GIS tool draws nothing wrong and nothing disappears silently.
// Property strings follow the "_raw_b64" rule of report.json.
// It is [NewGeoJSONSink] fed every photo.
func WriteGeoJSON(w io.Writer, a *Audit) error {
	if a == nil {
		return errors.New("report: WriteGeoJSON: nil audit")
	}
	return feed(NewGeoJSONSink(w), sorted(a).Photos)
}

// geoSink is report.geojson written as photos arrive, each photo's
// features appended to "features" at once.
type geoSink struct {
	sinkState
	doc  *jsonStream
	feat [2]geoFeature // the features of the current photo
}

// NewGeoJSONSink returns a Sink that writes report.geojson to w, byte for
// byte as [WriteGeoJSON] does for the same photos, streaming the features
// out in pieces of about jsonFlushBytes. Nothing is written until the first
// Photo or Close.
func NewGeoJSONSink(w io.Writer) Sink {
	// The members of an RFC 7946 §3.3 FeatureCollection.
	doc := &jsonStream{w: w, head: []jsonMember{{"type", "FeatureCollection"}}, stream: "features"}
	return &geoSink{sinkState: sinkState{format: "GeoJSON"}, doc: doc}
}

func (s *geoSink) Photo(p *Photo) error {
	if err := s.admit(p); err != nil {
		return err
	}
	fs := features(p, s.feat[:0])
	for i := range fs {
		if err := s.doc.elem(&fs[i]); err != nil {
			return s.fail(err)
		}
	}
	return nil
}

func (s *geoSink) Close() error {
	if ok, err := s.closing(); !ok {
		return err
	}
	return s.fail(s.doc.end())
}

// features appends to out the features of one photo: its GPS position (or
// why it is not drawn) and its shadow fix, each when present.
func features(p *Photo, out []geoFeature) []geoFeature {
	props := geoProperties{
		Path: p.Path, Root: p.Root, Camera: p.Camera, Verdict: p.Verdict,
		ClaimedUTC: p.ClaimedUTC, CorrectedUTCEarliest: p.CorrectedUTCEarliest,
		CorrectedUTCLatest: p.CorrectedUTCLatest, ClockReset: p.ClockReset,
	}
	switch {
	case p.Lat != nil || p.Lon != nil:
		f := geoFeature{Type: "Feature", Properties: props}
		f.Properties.Kind = FeatureGPS
		f.Geometry, f.Properties.SkippedReason = point(p.Lat, p.Lon)
		out = append(out, f)
	case p.GPSRejected != "":
		f := geoFeature{Type: "Feature", Properties: props}
		f.Properties.Kind = FeatureGPS
		f.Properties.SkippedReason = "GPS position not used: " + p.GPSRejected
		out = append(out, f)
	}
	if p.ShadowFix != nil {
		f := geoFeature{Type: "Feature", Properties: props}
		f.Properties.Kind = FeatureShadowFix
		r := p.ShadowFix.RadiusKm
		f.Properties.RadiusKm = &r
		f.Geometry, f.Properties.SkippedReason = point(&p.ShadowFix.Lat, &p.ShadowFix.Lon)
		out = append(out, f)
	}
	return out
}

// point returns a Point for lat/lon, or nil and the reason it cannot be drawn.
func point(lat, lon *float64) (*geoPoint, string) {
	switch {
	case lat == nil:
		return nil, "latitude missing"
	case lon == nil:
		return nil, "longitude missing"
	case math.IsNaN(*lat) || math.IsInf(*lat, 0):
		return nil, "latitude is not a finite number"
	case math.IsNaN(*lon) || math.IsInf(*lon, 0):
		return nil, "longitude is not a finite number"
	case math.Abs(*lat) > 90:
		return nil, fmt.Sprintf("latitude %g is beyond ±90°", *lat)
	case math.Abs(*lon) > 180:
		return nil, fmt.Sprintf("longitude %g is beyond ±180°", *lon)
	}
	return &geoPoint{Type: "Point", Coordinates: []float64{*lon, *lat}}, ""
}
