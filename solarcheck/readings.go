package solarcheck

import (
	"fmt"
	"strings"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// examineReadings judges a photo whose wall time denotes several instants
// (a wall time the place's zone repeated or skipped at a daylight-saving
// change, or zones that overlap at the place). Every check runs under each
// candidate instant. The reading the evidence supports is kept and the
// others are named with their outcome; when nothing separates them, the
// verdict is Ambiguous, with every reading's outcome and no figure: picking
// one would accuse a correct camera half the time.
//
// A reading is supported when it alone is consistent with the witnesses.
// When every reading leads to the same verdict (other than unverified) that
// verdict stands and the figures follow the earliest reading, since the
// corrected time is the evidence's and does not depend on the reading.
func (x *Examiner) examineReadings(f *Finding, p Photo) {
	base := *f
	cands := f.Claim.Candidates
	outs := make([]Finding, len(cands))
	readings := make([]Reading, len(cands))
	for i, c := range cands {
		g := base
		g.Claimed, g.HasClaimed = c.UTC, true
		x.runChecks(&g, p)
		diagnose(&g, x)
		outs[i] = g
		readings[i] = Reading{Candidate: c, Verdict: g.Verdict, Offset: g.Offset,
			Explanation: strings.TrimSpace(strings.TrimSuffix(g.Explanation, g.Basis.PlaceNote))}
	}
	intro := readingsIntro(f)

	supported := -1
	for i, o := range outs {
		if o.Verdict == Consistent {
			supported = i
		}
	}
	if countVerdict(outs, Consistent) == 1 {
		*f = outs[supported]
		f.Readings, f.ReadingUsed = readings, supported
		f.Explanation = fmt.Sprintf("%s The evidence fits only the reading %s%s, which is used. %s",
			intro, cands[supported], skippedReading(f.Claim, supported), f.Explanation)
		for i, r := range readings {
			if i != supported {
				f.Rejected = append(f.Rejected, Alternative{Verdict: r.Verdict,
					Reason: fmt.Sprintf("the reading %s%s: %s", cands[i], skippedReading(f.Claim, i), r.Explanation)})
			}
		}
		return
	}
	if v := outs[0].Verdict; v != Unverified && countVerdict(outs, v) == len(outs) {
		*f = outs[0]
		f.Readings, f.ReadingUsed = readings, 0
		var others []string
		for i, r := range readings[1:] {
			others = append(others, fmt.Sprintf("Read as %s instead: %s", cands[i+1], r.Explanation))
		}
		f.Explanation = fmt.Sprintf("%s Every reading leads to the same verdict; the figures follow the earliest, %s. %s %s",
			intro, cands[0], strings.TrimSpace(strings.TrimSuffix(f.Explanation, f.Basis.PlaceNote)), strings.Join(others, " ")) + f.Basis.PlaceNote
		return
	}

	// Nothing separates the readings.
	*f = base
	f.Claimed, f.HasClaimed = cands[0].UTC, true
	f.Readings, f.ReadingUsed = readings, -1
	f.Verdict = Ambiguous
	f.Checks = mergeChecks(outs, cands)
	f.Measured, f.ShadowFix = outs[0].Measured, outs[0].ShadowFix // from the sheet and the GPS time: the same under every reading
	var each, labels []string
	same := true
	for i, r := range readings {
		label := cands[i].String() + skippedReading(f.Claim, i)
		labels = append(labels, label)
		each = append(each, fmt.Sprintf("Read as %s: %s", label, r.Explanation))
		same = same && r.Explanation == readings[0].Explanation
	}
	if same { // say it once
		each = []string{fmt.Sprintf("Read as %s, the outcome is the same: %s", strings.Join(labels, " or as "), readings[0].Explanation)}
	}
	f.Explanation = intro + " The evidence does not tell which reading was meant, so no verdict is given on the time. " +
		strings.Join(each, " ") + f.Basis.PlaceNote
}

// countVerdict counts the findings with verdict v.
func countVerdict(fs []Finding, v Verdict) int {
	n := 0
	for _, f := range fs {
		if f.Verdict == v {
			n++
		}
	}
	return n
}

// readingsIntro says in plain words why the wall time has several readings.
func readingsIntro(f *Finding) string {
	w := f.Wall
	w.HasOffset = false
	wall := strings.Replace(w.String(), "T", " ", 1)
	zones := strings.Join(f.Claim.Zones, ", ")
	var s string
	switch f.Claim.Kind {
	case zone.Repeated:
		s = fmt.Sprintf("The wall time %s came twice in %s: the clocks were put back over it.", wall, zones)
	case zone.Skipped:
		s = fmt.Sprintf("The wall time %s never came in %s: the clocks went forward over it, so the camera was not on the legal time there when it wrote it.", wall, zones)
	default:
		s = fmt.Sprintf("The wall time %s means a different instant in each zone kept at the place (%s).", wall, zones)
	}
	if f.Claim.Kind != zone.Normal && len(f.Claim.Zones) > 1 {
		s += fmt.Sprintf(" Several zones are kept at the place (%s).", zones)
	}
	return s
}

// skippedReading says what a reading of a skipped wall time means for the
// camera's clock: with the offset after the change it had been put forward
// already; with the one before, not yet. "" for other kinds of reading.
func skippedReading(c zone.Claimed, i int) string {
	if c.Kind != zone.Skipped || len(c.Zones) != 1 || len(c.Candidates) != 2 {
		return ""
	}
	other := c.Candidates[1-i]
	if c.Candidates[i].OffsetSec > other.OffsetSec {
		return " (a camera put forward before the change)"
	}
	return " (a camera not yet put forward)"
}

// mergeChecks gives the checks of an Ambiguous finding: a check that says
// the same under every reading is kept; one that depends on the reading
// becomes an open check quoting each reading's sentence.
func mergeChecks(outs []Finding, cands []zone.Candidate) []Check {
	var kinds []Kind
	seen := map[Kind]bool{}
	for _, o := range outs {
		for _, c := range o.Checks {
			if !seen[c.Kind] {
				seen[c.Kind] = true
				kinds = append(kinds, c.Kind)
			}
		}
	}
	var out []Check
	for _, k := range kinds {
		per := make([][]Check, len(outs))
		same := true
		for i, o := range outs {
			for _, c := range o.Checks {
				if c.Kind == k {
					per[i] = append(per[i], c)
				}
			}
			if i > 0 && !sameChecks(per[0], per[i]) {
				same = false
			}
		}
		if same {
			out = append(out, per[0]...)
			continue
		}
		var parts []string
		for i, cs := range per {
			var ss []string
			for _, c := range cs {
				ss = append(ss, strings.TrimSuffix(c.Sentence, "."))
			}
			if len(ss) == 0 {
				ss = []string{"no such check"}
			}
			parts = append(parts, fmt.Sprintf("read as %s, %s", cands[i], strings.Join(ss, "; ")))
		}
		out = append(out, Check{Kind: k, Status: Open,
			Sentence: "This check depends on the reading: " + strings.Join(parts, "; ") + "."})
	}
	return out
}

// sameChecks reports whether two lists of checks say the same.
func sameChecks(a, b []Check) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Status != b[i].Status || a[i].Sentence != b[i].Sentence {
			return false
		}
	}
	return true
}

// readingsInWindow says which readings of an ambiguous finding lie inside
// its corrected window (from the camera's clock), ending the sentence that
// gives the window.
func readingsInWindow(f *Finding) string {
	var in []string
	for _, r := range f.Readings {
		if !r.Candidate.UTC.Before(f.Earliest) && !r.Candidate.UTC.After(f.Latest) {
			in = append(in, r.Candidate.String())
		}
	}
	switch len(in) {
	case 0:
		return "which fits none of the readings."
	case len(f.Readings):
		return "which fits every reading."
	case 1:
		return "which fits only the reading " + in[0] + "."
	}
	return "which fits the readings " + strings.Join(in, " and ") + "."
}
