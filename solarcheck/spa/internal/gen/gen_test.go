package main

import (
	"bytes"
	"os"
	"testing"
)

// TestGeneratedFileIsCurrent regenerates terms_gen.go from the published
// tables (when ../shared/reference is present) and requires the committed
// file to be identical, so the Go terms cannot drift from the source.
func TestGeneratedFileIsCurrent(t *testing.T) {
	const earth = "../../../../../shared/reference/spa_earth_terms.csv"
	const nut = "../../../../../shared/reference/spa_nutation_terms.csv"
	if _, err := os.Stat(earth); err != nil {
		t.Skip("reference tables not present:", err)
	}
	want, err := generate(earth, nut)
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile("../../terms_gen.go")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Error("terms_gen.go differs from the generator's output; run go generate ./solarcheck/spa")
	}
}
