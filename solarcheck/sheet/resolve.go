package sheet

import (
	"fmt"
	"path"
	"sort"
	"strings"
)

// Name is how the audit knows one photo: ID is unique across the audit
// (the input's label, then the path inside it, slash form: "card1/DCIM/
// IMG_0001.JPG"), Rel is the path inside its input ("DCIM/IMG_0001.JPG"),
// which two inputs may share.
type Name struct {
	ID, Rel string
}

// maxCandidates is how many matching photos an ambiguity message lists.
const maxCandidates = 5

// Resolve matches every row to one of photos. A row's photo cell, after
// turning '\' into '/' and cleaning it (path.Clean, so "./a/b.jpg" is
// "a/b.jpg"), matches
//
//  1. every photo whose ID or Rel equals it; or, when none does,
//  2. when the cell is a bare file name (no '/'), every photo whose Rel has
//     that base name.
//
// A row is applied only when exactly one photo matches: a row that could
// belong to two photos (the same relative path under two inputs, a bare
// name found in two folders) is ErrAmbiguousPhoto, naming the candidates by
// ID, and is applied to none, so that one photo's measurements never reach
// another. Matching is case-sensitive, as file names are on most systems
// that hold evidence. A name that matches nothing gives ErrUnknownPhoto.
// Both are *ParseError values at the row's photo cell. The map holds the
// rows that matched, keyed by ID, in sheet order; the error joins every
// problem (nil when none).
//
// Overrides must agree across a photo's rows: a row whose lat/lon or time
// differs from an earlier row of the same photo is reported
// (ErrConflictingOverride, located at the record's first line) and dropped.
func (s *Sheet) Resolve(photos []Name) (map[string][]Row, error) {
	byName := map[string][]string{} // ID or Rel → IDs
	byBase := map[string][]string{}
	for _, p := range photos {
		byName[p.ID] = append(byName[p.ID], p.ID)
		if p.Rel != p.ID {
			byName[p.Rel] = append(byName[p.Rel], p.ID)
		}
		b := path.Base(p.Rel)
		byBase[b] = append(byBase[b], p.ID)
	}
	out := map[string][]Row{}
	var probs []*ParseError
	for _, r := range s.Rows {
		clean := path.Clean(strings.ReplaceAll(r.Photo, `\`, "/"))
		m := byName[clean]
		if len(m) == 0 && !strings.Contains(clean, "/") {
			m = byBase[clean]
		}
		var err error
		switch len(m) {
		case 1:
			out[m[0]] = append(out[m[0]], r)
			continue
		case 0:
			err = fmt.Errorf("%w: %s", ErrUnknownPhoto, Quote(r.Photo))
		default:
			m = append([]string(nil), m...)
			sort.Strings(m)
			list := m[:min(len(m), maxCandidates)]
			more := ""
			if len(m) > len(list) {
				more = fmt.Sprintf(" and %d more", len(m)-len(list))
			}
			err = fmt.Errorf("%w: %s matches %s%s; the row is applied to none", ErrAmbiguousPhoto, Quote(r.Photo), strings.Join(list, ", "), more)
		}
		probs = append(probs, &ParseError{File: r.File, StartLine: r.Line, Line: r.Line, Column: r.PhotoColumn, Name: ColPhoto, Err: err})
	}
	for _, p := range sortedKeys(out) {
		out[p], probs = checkOverrides(p, out[p], probs)
	}
	return out, joinProblems(probs)
}

func sortedKeys(m map[string][]Row) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// checkOverrides keeps a photo's place and time overrides consistent: the
// first row that gives lat/lon (or time) sets it; a later row giving a
// different value is reported (ErrConflictingOverride) and dropped whole,
// since it is unclear which of the two the examiner meant.
func checkOverrides(photo string, rows []Row, probs []*ParseError) ([]Row, []*ParseError) {
	var place, when *Row
	kept := rows[:0:0]
	for i := range rows {
		r := rows[i]
		var err error
		col := ""
		if r.Lat != nil {
			if place == nil {
				place = &rows[i]
			} else if *place.Lat != *r.Lat || *place.Lon != *r.Lon {
				err = fmt.Errorf("%w: lat/lon for %s differ from line %d", ErrConflictingOverride, photo, place.Line)
				col = ColLat
			}
		}
		if err == nil && r.Time != nil {
			if when == nil {
				when = &rows[i]
			} else if !sameTime(when.Time, r.Time) {
				err = fmt.Errorf("%w: time for %s differs from line %d", ErrConflictingOverride, photo, when.Line)
				col = ColTime
			}
		}
		if err != nil {
			probs = append(probs, &ParseError{File: r.File, StartLine: r.Line, Line: r.Line, Column: r.cols[col], Name: col, Err: err})
			continue
		}
		kept = append(kept, r)
	}
	return kept, probs
}

func sameTime(a, b *Time) bool {
	return a.HasOffset == b.HasOffset && a.Instant.Equal(b.Instant)
}
