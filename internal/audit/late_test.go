package audit

import (
	"context"
	"strconv"
	"sync"
	"testing"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/testkit/smallset"
	"github.com/gnomon-forensics/gnomon/report"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// TestLateThumbnails: after a run without Options.Thumbs, every photo that
// report.html gives a card (all of them in a small batch) gets its
// thumbnail, named by its entry's place in the walk as during a run, and a
// cancelled context stops the pass.
func TestLateThumbnails(t *testing.T) {
	dir := t.TempDir()
	if _, err := smallset.Write(dir, 6, smallset.Options{}); err != nil {
		t.Fatal(err)
	}
	entries, err := Walk([]string{dir})
	if err != nil {
		t.Fatal(err)
	}
	x := solarcheck.NewExaminer(solarcheck.Options{Zones: zone.NewFinder(nil)})
	res, err := Run(context.Background(), entries, Options{Examiner: x, SpoolDir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	defer res.Close()
	var mu sync.Mutex
	calls := map[int]string{}
	thumbs := func(i int, e Entry, rec *exifread.Record) string {
		mu.Lock()
		defer mu.Unlock()
		calls[i] = e.Rel
		return "thumbnails/" + strconv.Itoa(i) + ".jpg"
	}
	if err := LateThumbnails(context.Background(), res, 2, exifread.Options{}, thumbs); err != nil {
		t.Fatal(err)
	}
	if len(calls) != len(entries) {
		t.Errorf("%d thumbnails written, want %d (one per carded photo)", len(calls), len(entries))
	}
	err = res.Photos(context.Background(), false, func(p *report.Photo) error {
		if p.Thumbnail == "" {
			t.Errorf("%s: no thumbnail", p.Path)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, rel := range calls {
		if entries[i].Rel != rel {
			t.Errorf("thumbnail %d made for %s, want entry %d's file %s", i, rel, i, entries[i].Rel)
		}
	}

	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := LateThumbnails(ctx, res, 2, exifread.Options{}, thumbs); err != context.Canceled {
		t.Errorf("cancelled: err %v, want context.Canceled", err)
	}
}
