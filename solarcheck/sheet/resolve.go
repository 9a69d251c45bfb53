package sheet

import (
	"fmt"
	"path"
	"sort"
	"strings"
)

// Resolve matches every row to one of paths, the photos of the audit given
// relative to their audited folder in slash form. A row's photo cell matches
//
//  1. a path equal to it, after turning '\' into '/' and cleaning it
//     (path.Clean, so "./a/b.jpg" is "a/b.jpg"); or, failing that,
//  2. when the cell is a bare file name (no '/'), the one path whose base
//     name equals it.
//
// Matching is case-sensitive, as file names are on most systems that hold
// evidence. A name that matches nothing gives ErrUnknownPhoto; a bare name
// that matches two or more paths gives ErrAmbiguousPhoto, listing them. Both
// are *ParseError values at the row's photo cell. The map holds the rows that
// matched, keyed by the path from paths, in sheet order; the error joins
// every problem (nil when none).
//
// Overrides must agree across a photo's rows: a row whose lat/lon or time
// differs from an earlier row of the same photo is reported
// (ErrConflictingOverride, located at the record's first line) and dropped.
func (s *Sheet) Resolve(paths []string) (map[string][]Row, error) {
	exact := make(map[string]string, len(paths))
	byBase := map[string][]string{}
	for _, p := range paths {
		exact[p] = p
		b := path.Base(p)
		byBase[b] = append(byBase[b], p)
	}
	out := map[string][]Row{}
	var probs []*ParseError
	for _, r := range s.Rows {
		cell := strings.ReplaceAll(r.Photo, `\`, "/")
		clean := path.Clean(cell)
		if p, ok := exact[clean]; ok {
			out[p] = append(out[p], r)
			continue
		}
		var err error
		if !strings.Contains(clean, "/") {
			switch m := byBase[clean]; len(m) {
			case 1:
				out[m[0]] = append(out[m[0]], r)
				continue
			case 0:
				err = fmt.Errorf("%w: %q", ErrUnknownPhoto, r.Photo)
			default:
				m = append([]string(nil), m...)
				sort.Strings(m)
				err = fmt.Errorf("%w: %q matches %s", ErrAmbiguousPhoto, r.Photo, strings.Join(m, ", "))
			}
		} else {
			err = fmt.Errorf("%w: %q", ErrUnknownPhoto, r.Photo)
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
