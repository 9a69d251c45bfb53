//go:build race

package marks

// underRace: the race detector slows the single-goroutine Monte Carlo
// tests tenfold and has nothing to find in them, so they skip under it.
const underRace = true
