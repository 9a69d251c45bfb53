package selftest

import "testing"

// TestRun: every built-in reference check passes. The expected values are
// the published ones named in each check's Source.
func TestRun(t *testing.T) {
	r := Run(nil)
	for _, c := range r.Checks {
		t.Logf("%-45s %v  %s", c.Name, c.Passed, c.Detail)
		if !c.Passed {
			t.Errorf("%s failed: %s (source: %s)", c.Name, c.Detail, c.Source)
		}
	}
	if !r.Passed || len(r.Checks) != 4 {
		t.Errorf("result %+v", r)
	}
}
