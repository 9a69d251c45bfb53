//go:build race

package zone

// raceEnabled: the race detector slows the point-by-point reference check about
// tenfold; under it the check takes a subsample (the full table runs without it).
const raceEnabled = true
