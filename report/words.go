package report

// The plain words the HTML page shows for the codes report.json keeps. A
// person reads the phrase; a script reads the code; the page's glossary
// (and report/README.md) gives both, and TestWordsCoverCodes ties these
// tables to the constants of package solarcheck and its zone package.

// codeWord is one code of report.json and the words the page shows for it.
type codeWord struct {
	Code  string
	Words string
}

// claimSourceWords says how the claimed instant was decided
// (Photo.ClaimSource, from zone.Rule).
var claimSourceWords = []codeWord{
	{"offset_tag", "read with the camera's own time-zone offset tag"},
	{"override_time", "time given in the measurement sheet"},
	{"override_offset", "UTC offset given in the measurement sheet"},
	{"override_zone", "time zone given in the measurement sheet"},
	{"place_zone", "time zone looked up from the GPS position"},
}

// checkKindWords names each independent check (Check.Kind, from
// solarcheck.Kind).
var checkKindWords = []codeWord{
	{"shadow_time", "Shadows against the claimed time"},
	{"sun_up", "Sun above the horizon"},
	{"gps_clock", "GPS clock"},
	{"offset_tag", "Camera's time-zone offset tag"},
	{"light", "Exposure against daylight"},
	{"shadow_place", "Shadows against the GPS position"},
	{"camera_clock", "Other photos of the same camera"},
	{"shot_order", "Order of the file numbers"},
	{"measurements", "Agreement of the measured objects"},
}

// checkStatusWords says what a check found (Check.Status, from
// solarcheck.Status).
var checkStatusWords = []codeWord{
	{"agrees", "agrees"},
	{"conflicts", "conflicts"},
	{"open", "cannot decide"},
	{"skipped", "not made"},
}

// wordsFor returns the words for code in table, or the code itself when the
// table does not know it (a report written by a newer version).
func wordsFor(table []codeWord, code string) string {
	for _, w := range table {
		if w.Code == code {
			return w.Words
		}
	}
	return code
}

func claimSourceText(code string) string { return wordsFor(claimSourceWords, code) }
func checkKindText(code string) string   { return wordsFor(checkKindWords, code) }
func checkStatusText(code string) string { return wordsFor(checkStatusWords, code) }

// glossaryGroup is one table of the page's glossary of report.json codes.
type glossaryGroup struct {
	Field string // the JSON member, e.g. "photos[].checks[].kind"
	Words []codeWord
}

// glossary lists every code the page turns into words, by JSON member.
func glossary() []glossaryGroup {
	verdicts := make([]codeWord, len(verdictStyles))
	for i, s := range verdictStyles {
		verdicts[i] = codeWord{s.Code, s.Label}
	}
	return []glossaryGroup{
		{"photos[].verdict", verdicts},
		{"photos[].claim_source", claimSourceWords},
		{"photos[].checks[].kind", checkKindWords},
		{"photos[].checks[].status", checkStatusWords},
	}
}
