package spa

import "testing"

// TestTermCounts checks the generated tables against the row counts the
// report prints (Tables A4.2 and A4.3).
func TestTermCounts(t *testing.T) {
	want := []int{64, 34, 20, 7, 3, 1, 5, 2, 40, 10, 6, 2, 1} // L0..L5, B0..B1, R0..R4
	for i, n := range want {
		if got := len(earthTerms[i]); got != n {
			t.Errorf("SPA report Table A4.2: series %d has %d terms, want %d", i, got, n)
		}
	}
	if got := len(nutationTerms); got != 63 {
		t.Errorf("SPA report Table A4.3: %d nutation terms, want 63", got)
	}
	// First terms as printed (L0 A = 175347046, Δψ a = −171996).
	if earthTerms[0][0].A != 175347046 || nutationTerms[0].A != -171996 {
		t.Errorf("SPA report Tables A4.2/A4.3: first terms %v, %v", earthTerms[0][0], nutationTerms[0])
	}
}
