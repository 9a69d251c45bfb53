package spa

// periodicTerm is one Earth series term A·cos(B + C·JME) (SPA Eq. 9).
type periodicTerm struct {
	A, B, C float64
}

// nutationTerm is one row of SPA Table A4.3: multipliers Y of X0..X4 and
// coefficients a, b (Δψ, Eq. 20) and c, d (Δε, Eq. 21).
type nutationTerm struct {
	Y          [5]float64
	A, B, C, D float64
}
