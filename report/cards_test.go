package report

import (
	"fmt"
	"strings"
	"testing"
)

// TestCardPolicy checks the rule that bounds report.html on a large batch
// (our own policy, stated in Carded's doc and the README): at most MaxCards
// cards; every photo whose verdict calls for attention comes first, the
// verdicts taking turns; then the calm verdicts in turn; path order within a
// verdict; the page says how many files have no card and where they are.
func TestCardPolicy(t *testing.T) {
	mix := []struct {
		verdict string
		n       int
	}{{"consistent", 2000}, {"unverified", 300}, {"clock_offset", 150}, {"zone_slip", 49}, {"dst_slip", 1}}
	a := &Audit{Schema: SchemaID}
	for _, m := range mix {
		for i := 0; i < m.n; i++ {
			a.Photos = append(a.Photos, Photo{Path: fmt.Sprintf("%s/%05d.jpg", m.verdict, i), Verdict: m.verdict})
		}
	}
	a = sorted(a)
	carded := Carded(verdictsOf(a.Photos))
	got := map[string]int{}
	firstUncarded := map[string]int{}
	for i, p := range a.Photos {
		if carded[i] {
			got[p.Verdict]++
			if _, gap := firstUncarded[p.Verdict]; gap {
				t.Errorf("%s carded after an earlier %s photo was left out: not path order", p.Path, p.Verdict)
			}
		} else if _, ok := firstUncarded[p.Verdict]; !ok {
			firstUncarded[p.Verdict] = i
		}
	}
	// 200 flagged photos all fit; the 800 left are shared in turn between
	// consistent and unverified: unverified runs out at 300, so consistent
	// gets 500 (worked by hand from the rule).
	want := map[string]int{"clock_offset": 150, "zone_slip": 49, "dst_slip": 1, "unverified": 300, "consistent": 500}
	for v, n := range want {
		if got[v] != n {
			t.Errorf("%s: %d cards, want %d", v, got[v], n)
		}
	}
	page := renderHTML(t, a)
	if n := strings.Count(page, `<article class="card`); n != MaxCards {
		t.Errorf("page has %d cards, want %d", n, MaxCards)
	}
	for _, s := range []string{
		"<b>1500 files have no card here</b>",
		"1500 Sun agrees)",
		"report.json and report.csv hold every file",
		"(1000 with a card below;",
		`<span class="idx">No. 2500</span>`, // numbers are places in the full list
	} {
		if !strings.Contains(page, s) {
			t.Errorf("page lacks %q", s)
		}
	}

	// Rare findings are never crowded out: with more flagged photos than
	// cards, each flagged verdict still gets its share.
	b := &Audit{Schema: SchemaID}
	for i := 0; i < 3000; i++ {
		b.Photos = append(b.Photos, Photo{Path: fmt.Sprintf("a/%05d.jpg", i), Verdict: "clock_offset"})
	}
	b.Photos = append(b.Photos, Photo{Path: "z/edit.jpg", Verdict: "ampm_slip"}, Photo{Path: "z/ok.jpg", Verdict: "consistent"})
	c := Carded(verdictsOf(b.Photos))
	if !c[3000] || c[3001] {
		t.Errorf("with 3,000 clock_offset photos: ampm_slip carded %v (want true), consistent carded %v (want false)", c[3000], c[3001])
	}

	// A batch within the limit: every photo has a card and no note.
	small := fixtureAudit()
	for i, ok := range Carded(verdictsOf(small.Photos)) {
		if !ok {
			t.Errorf("photo %d of a small batch has no card", i)
		}
	}
	if strings.Contains(renderHTML(t, small), `id="left-out"`) {
		t.Error("small batch: the page claims files were left out")
	}
}

// verdictsOf lists the photos' verdicts in their order, as Carded takes them.
func verdictsOf(photos []Photo) []string {
	out := make([]string, len(photos))
	for i, p := range photos {
		out[i] = p.Verdict
	}
	return out
}

// ExampleCarded: a batch of 1,500 photos, three of them flagged, gets
// MaxCards cards; every flagged photo is among them.
func ExampleCarded() {
	var verdicts []string // in report order
	for i := 0; i < 1500; i++ {
		v := "consistent"
		if i%500 == 499 {
			v = "clock_offset"
		}
		verdicts = append(verdicts, v)
	}
	cards, flagged := 0, 0
	for i, ok := range Carded(verdicts) {
		if ok {
			cards++
			if verdicts[i] != "consistent" {
				flagged++
			}
		}
	}
	fmt.Println(cards, "cards,", flagged, "of them flagged")
	// Output: 1000 cards, 3 of them flagged
}
