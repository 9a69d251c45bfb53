package clock

import (
	"crypto/sha256"
	"encoding/hex"
	"math"
	"path"
	"sort"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"
)

// OrderBreak is a pair of photos whose claimed order contradicts their file
// numbers: Later was taken after Earlier by the claimed times but carries the
// smaller number.
type OrderBreak struct {
	Earlier, Later             string
	EarlierNumber, LaterNumber int
}

// CameraID groups photos by camera: make, model and serial number, each
// trimmed of spaces and NUL padding, inner runs of white space collapsed and
// case folded, joined as "make|model|serial"; without a serial,
// "make|model". It returns "" when make and model are both empty: such
// photos cannot be grouped by camera.
//
// An id longer than MaxCameraIDBytes (no real camera writes one; a crafted
// or corrupt tag does) is cut and ends with "…#" and the first 16 hex
// digits of the SHA-256 of the whole id, so different long ids stay apart
// while each photo's id, held for the whole batch, stays small. The full
// tag values remain in the file and in `gnomon meta`.
func CameraID(maker, model, serial string) string {
	id := cameraID(maker, model, serial)
	if len(id) <= MaxCameraIDBytes {
		return id
	}
	sum := sha256.Sum256([]byte(id))
	cut := MaxCameraIDBytes - len("…#") - 16
	for cut > 0 && !utf8.RuneStart(id[cut]) {
		cut-- // do not split a character
	}
	return id[:cut] + "…#" + hex.EncodeToString(sum[:8])
}

// MaxCameraIDBytes bounds the length of a CameraID.
const MaxCameraIDBytes = 160

func cameraID(maker, model, serial string) string {
	norm := func(s string) string {
		s = strings.Map(func(r rune) rune {
			if r == 0 || unicode.IsSpace(r) {
				return ' '
			}
			return unicode.ToLower(r)
		}, s)
		return strings.Join(strings.Fields(s), " ")
	}
	mk, md, sn := norm(maker), norm(model), norm(serial)
	if mk == "" && md == "" {
		return ""
	}
	if sn == "" {
		return mk + "|" + md
	}
	return mk + "|" + md + "|" + sn
}

// FileNumber parses the trailing digits of a file's base name without its
// extension: "DSC_0012.JPG" gives 12 with 4 digits. ok is false when the
// name does not end in digits or they are more than 9.
func FileNumber(name string) (n, digits int, ok bool) {
	base := path.Base(strings.ReplaceAll(name, `\`, "/"))
	if i := strings.LastIndexByte(base, '.'); i > 0 {
		base = base[:i]
	}
	j := len(base)
	for j > 0 && base[j-1] >= '0' && base[j-1] <= '9' {
		j--
	}
	digits = len(base) - j
	if digits == 0 || digits > 9 || timestampName(base, j) {
		return 0, 0, false
	}
	for _, c := range base[j:] {
		n = n*10 + int(c-'0')
	}
	return n, digits, true
}

// timestampName reports whether the trailing digits of base, starting at j,
// are the time part of a date-and-time name such as IMG_20271010_150211
// (phones name files by their capture time, common practice): a time of
// day, not a counter, so it says nothing about capture order.
func timestampName(base string, j int) bool {
	if j < 9 || (base[j-1] != '_' && base[j-1] != '-') {
		return false
	}
	for _, c := range base[j-9 : j-1] {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// orderBreaks sorts the numbered photos by the clock's readings and
// reports each adjacent pair (same digit count, distinct readings) whose
// number steps backward by less than half the counter's range; a larger
// backward step is read as the counter wrapping or being restarted.
//
// A pair is not reported when its instants (Point.Instants: the capture
// time read in the place's zone, every reading of a repeated hour) allow
// the numbering's order: a phone that follows the place's clock shows a
// repeated hour at the autumn change, and two photos 30 minutes apart
// across it are in order although their readings step back. A break is
// said only when neither scale puts the pair in numbering order.
func orderBreaks(points []Point) []OrderBreak {
	type np struct {
		i, n, d int
	}
	var ps []np
	for i, p := range points {
		if n, d, ok := FileNumber(p.FileName); ok {
			ps = append(ps, np{i, n, d})
		}
	}
	sort.SliceStable(ps, func(a, b int) bool { return points[ps[a].i].Reading.Before(points[ps[b].i].Reading) })
	var out []OrderBreak
	for k := 1; k < len(ps); k++ {
		a, b := ps[k-1], ps[k]
		if a.d != b.d || !points[a.i].Reading.Before(points[b.i].Reading) {
			continue
		}
		mod := int(math.Pow10(a.d))
		forward := ((b.n-a.n)%mod + mod) % mod
		if forward > mod/2 && !instantsAllow(points[b.i].Instants, points[a.i].Instants) {
			out = append(out, OrderBreak{Earlier: points[a.i].Key, Later: points[b.i].Key, EarlierNumber: a.n, LaterNumber: b.n})
		}
	}
	return out
}

// instantsAllow reports whether some instant of the first photo is not
// after some instant of the second: then the first may have been taken
// first, as its smaller file number says.
func instantsAllow(first, second []time.Time) bool {
	for _, s := range first {
		for _, t := range second {
			if !s.After(t) {
				return true
			}
		}
	}
	return false
}
