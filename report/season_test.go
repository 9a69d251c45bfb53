package report

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

// TestSeasonBandsCarried: a season_mismatch photo's date bands and the
// shadow check's misfit reach every format: JSON fields, the CSV
// season_bands cell and the packed checks cell (format in README), and the
// card of the HTML page.
func TestSeasonBandsCarried(t *testing.T) {
	a := fixtureAudit()
	chi, dof, p := 41.3, 1, 0.0001
	p0 := &a.Photos[0]
	p0.SeasonBands = []SeasonBand{
		{First: "2026-04-16", Last: "2026-04-24", DaysFromClaim: -91, Best: "2026-04-20T12:10:02Z"},
		{First: "2025-08-18", Last: "2025-08-26", DaysFromClaim: 142, Best: "2025-08-22T12:06:40Z"},
	}
	p0.Checks = append(p0.Checks, Check{Kind: "shadow_time", Status: "conflicts", MisfitChi2: &chi, MisfitDof: &dof, MisfitP: &p, Sentence: "No time fits."})

	var js bytes.Buffer
	if err := WriteJSON(&js, a); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Photos []struct {
			Path        string       `json:"path"`
			SeasonBands []SeasonBand `json:"season_bands"`
			Checks      []Check      `json:"checks"`
		} `json:"photos"`
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, ph := range doc.Photos {
		if len(ph.SeasonBands) == 2 && ph.SeasonBands[1].First == "2025-08-18" {
			found = true
			c := ph.Checks[len(ph.Checks)-1]
			if c.MisfitChi2 == nil || *c.MisfitChi2 != chi || c.MisfitDof == nil || *c.MisfitDof != 1 || c.MisfitP == nil {
				t.Errorf("misfit not carried in JSON: %+v", c)
			}
		}
	}
	if !found {
		t.Errorf("season bands not carried in JSON:\n%s", js.String())
	}

	var cs bytes.Buffer
	if err := WriteCSV(&cs, a); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"2026-04-16..2026-04-24; 2025-08-18..2025-08-26", "shadow_time=conflicts(misfit 41.3/1 p=0.0001)"} {
		if !strings.Contains(cs.String(), want) {
			t.Errorf("CSV lacks %q", want)
		}
	}
	page := renderHTML(t, a)
	if !strings.Contains(page, "Dates the shadows fit, nearest the claim first:</b> 2026-04-16 to 2026-04-24; 2025-08-18 to 2025-08-26.") {
		t.Error("HTML card lacks the season bands")
	}
}
