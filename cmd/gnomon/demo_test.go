package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/democase"
	"github.com/gnomon-forensics/gnomon/internal/figure"
)

// TestDemoFindsEveryPlantedFault builds the invented demo case, audits it
// as `gnomon audit` would, and checks every photo's verdict against the
// case's answer key (which the case builder derives from the faults it
// planted, not from the audit), and that the edited photo is the one its
// camera flags.
func TestDemoFindsEveryPlantedFault(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "demo")
	c, err := democase.Build(dir, democase.Options{})
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "report")
	code, _, stderr := captureRun("audit", c.PhotosDir, "--shadows", c.SheetPath, "--out", out, "--quiet", "--formats", "json")
	if code != exitOK {
		t.Fatalf("audit exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Run struct {
			SheetErrors []string `json:"sheet_errors"`
			SelfTest    struct {
				Passed bool `json:"passed"`
			} `json:"self_test"`
		} `json:"run"`
		Photos []struct {
			Path        string   `json:"path"`
			Verdict     string   `json:"verdict"`
			Explanation string   `json:"explanation"`
			OffsetS     *float64 `json:"offset_s"`
			OffsetLowS  *float64 `json:"offset_low_s"`
			OffsetHighS *float64 `json:"offset_high_s"`
			Checks      []struct {
				Kind   string `json:"kind"`
				Status string `json:"status"`
			} `json:"checks"`
		} `json:"photos"`
		Cameras []struct {
			Outliers []string `json:"outliers"`
		} `json:"cameras"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Run.SheetErrors) > 0 {
		t.Errorf("the demo sheet has problems: %v", doc.Run.SheetErrors)
	}
	if !doc.Run.SelfTest.Passed {
		t.Error("self-test failed")
	}
	got := map[string]string{}
	cameraConflict := map[string]bool{}
	for _, p := range doc.Photos {
		got[p.Path] = p.Verdict + ": " + p.Explanation
		for _, c := range p.Checks {
			if c.Kind == "camera_clock" && c.Status == "conflicts" {
				cameraConflict[p.Path] = true
			}
		}
	}
	if len(doc.Photos) != len(c.Photos) {
		t.Errorf("%d report rows for %d photos", len(doc.Photos), len(c.Photos))
	}
	for _, p := range c.Photos {
		v := got[p.Path]
		// A drifting clock's photo whose own shadows are too wide to
		// exclude zero keeps their verdict, consistent: a photo's own
		// witnesses come first (issue 19). Its camera's clock must then say
		// the claim is off, in the camera_clock check.
		if p.Fault == democase.FaultDrift && strings.HasPrefix(v, democase.VerdictConsistent+":") && cameraConflict[p.Path] {
			continue
		}
		if !strings.HasPrefix(v, p.Expected+":") {
			t.Errorf("%s (planted: %s): got %q, want %s", p.Path, p.Fault, v, p.Expected)
		}
	}
	// The card shows the stored offset and interval rounded by figure.Spans;
	// the explanation must state the same digits (issue 10: a card showed
	// "+37 min 29 s" in its table and "+37 min 28 s" in its sentence).
	for _, p := range doc.Photos {
		if p.OffsetS == nil {
			continue
		}
		sec, low, high := figure.Spans(*p.OffsetS, *p.OffsetLowS, *p.OffsetHighS)
		if want := fmt.Sprintf("%s (95 %% interval %s to %s", sec, low, high); !strings.Contains(p.Explanation, want) {
			t.Errorf("%s: the card shows %q, the explanation says %q", p.Path, want, p.Explanation)
		}
	}
	outliers := map[string]bool{}
	for _, cam := range doc.Cameras {
		for _, o := range cam.Outliers {
			outliers[o] = true
		}
	}
	// Cameras name their photos by ID: the input's label, then the path.
	label := filepath.Base(c.PhotosDir)
	for _, p := range c.Photos {
		if p.Outlier != outliers[label+"/"+p.Path] {
			t.Errorf("%s: flagged as a possible edit: %v, planted: %v", p.Path, outliers[p.Path], p.Outlier)
		}
	}
}
