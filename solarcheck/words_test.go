package solarcheck

import (
	"fmt"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// TestClockOffsetWords: an offset of seconds to minutes is worded as a
// clock running fast or slow, never as a changed time (issue 18: a routine
// drift of 96 s was explained as "the camera clock was wrong, or the time
// was changed"). Positive offsets are claimed minus evidence: a clock
// ahead of true time runs fast (common practice).
func TestClockOffsetWords(t *testing.T) {
	tests := []struct {
		sec          float64
		want, reject string
	}{
		{96, "runs fast", "changed"},
		{-96, "runs slow", "changed"},
		{-14 * 60, "runs slow", "changed"},
		{2 * 3600, "or the time was changed", "runs"},
		{-40 * 60, "or the time was changed", "runs"},
	}
	for _, tc := range tests {
		got := clockOffsetCause(tc.sec)
		if !strings.Contains(got, tc.want) || strings.Contains(got, tc.reject) {
			t.Errorf("%v s: %q, want %q and not %q", tc.sec, got, tc.want, tc.reject)
		}
	}
}

// TestClaimProblemWords: the reason a claimed time has no UTC instant is
// plain English, without the zone package's codes ("zone: claim",
// "no override").
func TestClaimProblemWords(t *testing.T) {
	for _, kind := range []error{zone.ErrNoBasis, zone.ErrUnknownZone, zone.ErrBadOverride, zone.ErrInvalidWall, zone.ErrInvalidCoordinates, zone.ErrZoneMap} {
		err := fmt.Errorf("zone: claim: %w", &zone.Error{Op: "claim", Input: "2025:01:10 11:00:00", Err: fmt.Errorf("%w: no offset tag, no override, no place", kind)})
		got := claimProblem(err)
		for _, code := range []string{"zone:", "override", "claim"} {
			if strings.Contains(got, code) {
				t.Errorf("%v: %q holds the code %q", kind, got, code)
			}
		}
	}
}

// TestCameraName: the camera is shown as it wrote its make, model and
// serial (issue 18: ids were shown lower-cased and joined by pipes); the
// tags are EXIF Make, Model and BodySerialNumber (CIPA DC-008).
func TestCameraName(t *testing.T) {
	tests := []struct{ mk, md, sn, want string }{
		{"Brisa", "BR-10", "BR10-2290", "Brisa BR-10, serial BR10-2290"},
		{"Canon", "Canon EOS R5", "", "Canon EOS R5"},
		{"NIKON CORPORATION\x00\x00", "NIKON Z 6\t", "", "NIKON CORPORATION NIKON Z 6"},
		{"", "", "123", ""},
		{"  Sorami ", "Q5", " Q5-77310 ", "Sorami Q5, serial Q5-77310"},
	}
	for _, tc := range tests {
		if got := cameraName(tc.mk, tc.md, tc.sn); got != tc.want {
			t.Errorf("cameraName(%q, %q, %q) = %q, want %q", tc.mk, tc.md, tc.sn, got, tc.want)
		}
	}
}
