//go:build !race

package marks

const underRace = false
