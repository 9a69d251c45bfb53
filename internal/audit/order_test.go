package audit

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"sync/atomic"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/testkit/smallset"
	"github.com/gnomon-forensics/gnomon/report"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// TestInOrder: results come out in the order of k whatever order the
// workers finish in, no more than window of them wait at once, and both a
// cancelled context and a failing emit stop the run with their error.
func TestInOrder(t *testing.T) {
	const n, workers, window = 500, 4, 16
	var started, emitted atomic.Int64
	var maxAhead int64
	var got []int
	rng := rand.New(rand.NewPCG(1, 2))
	delays := make([]time.Duration, n)
	for i := range delays {
		delays[i] = time.Duration(rng.IntN(200)) * time.Microsecond
	}
	err := inOrder(context.Background(), n, workers, window,
		func(k int) int {
			if ahead := started.Add(1) - emitted.Load(); ahead > atomic.LoadInt64(&maxAhead) {
				atomic.StoreInt64(&maxAhead, ahead)
			}
			time.Sleep(delays[k])
			return k * k
		},
		func(k, v int) error {
			if v != k*k {
				t.Errorf("emit(%d, %d): value of another item", k, v)
			}
			got = append(got, k)
			emitted.Add(1)
			return nil
		})
	if err != nil {
		t.Fatal(err)
	}
	for i, k := range got {
		if i != k {
			t.Fatalf("emitted %d at position %d", k, i)
		}
	}
	if len(got) != n {
		t.Errorf("%d emitted, want %d", len(got), n)
	}
	if maxAhead > window {
		t.Errorf("%d items started ahead of the emitted ones, window is %d", maxAhead, window)
	}

	ctx, cancel := context.WithCancel(context.Background())
	calls := 0
	err = inOrder(ctx, n, workers, window, func(k int) int { return k }, func(k, v int) error {
		if calls++; calls == 10 {
			cancel()
		}
		return nil
	})
	if !errors.Is(err, context.Canceled) || calls >= n {
		t.Errorf("cancelled after 10: err %v after %d emits", err, calls)
	}

	boom := errors.New("disk full")
	calls = 0
	err = inOrder(context.Background(), n, workers, window, func(k int) int { return k }, func(k, v int) error {
		if calls++; calls == 3 {
			return boom
		}
		return nil
	})
	if !errors.Is(err, boom) || calls != 3 {
		t.Errorf("failing emit: err %v after %d emits, want %v after 3", err, calls, boom)
	}
}

// TestSpoolRoundTrip: what the spool gives back is what went in, byte for
// byte and bit for bit: names that are not valid UTF-8, NaN, a known zero
// offset (a pointer to zero values); all but the diagnosis's basis, which
// the spool's record does not keep (nothing after Examine reads it).
func TestSpoolRoundTrip(t *testing.T) {
	nan := math.NaN()
	in := []stored{
		{SHA256: "ab", Size: 7, Container: "jpeg", Thumbnail: "thumbnails/000001.jpg", Finding: solarcheck.Finding{
			Path: "caf\xe9/\x00\n,\"=1+1\".jpg", Camera: "Make|Model|\xff", HasClaimed: true,
			Claimed: time.Date(2026, 3, 29, 1, 30, 0, 123456789, time.UTC),
			Wall:    zone.Wall{Year: 2026, Month: 3, Day: 29, Hour: 2, Minute: 30, HasOffset: true, OffsetSec: 3600},
			Claim:   zone.Claimed{Rule: "offset_tag", Zones: []string{"Europe/Paris"}, Candidates: []zone.Candidate{{UTC: time.Date(2026, 3, 29, 1, 30, 0, 0, time.UTC), Zone: "Europe/Paris", Real: true}}},
			Offset:  &solarcheck.Interval{}, Sun: &solarcheck.SunSample{AzimuthDeg: nan},
			Checks:  []solarcheck.Check{{Kind: solarcheck.KindGPSClock, Status: solarcheck.Agrees, Figure: -0.5, HasFigure: true, Sentence: "\u202eevil"}},
			Verdict: solarcheck.DSTSlip,
			Basis:   solarcheck.Basis{GPSOffset: &solarcheck.Interval{Sec: 3600, LowSec: 3590, HighSec: 3610}, StepSec: 3600, PlaceNote: " note"},
		}},
		{Error: "truncated", Finding: solarcheck.Finding{Path: "b.jpg", Verdict: solarcheck.Unreadable}},
		{},
	}
	sp, err := createSpool(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	defer sp.remove()
	for i := range in {
		if err := sp.add(&in[i]); err != nil {
			t.Fatal(err)
		}
	}
	if err := sp.finish(); err != nil {
		t.Fatal(err)
	}
	for pass := 0; pass < 2; pass++ { // read as often as needed
		rd, err := sp.reader()
		if err != nil {
			t.Fatal(err)
		}
		for i := range in {
			var got stored
			if err := rd.next(&got); err != nil {
				t.Fatalf("pass %d, item %d: %v", pass, i, err)
			}
			// NaN is not equal to itself: check it, then compare the rest.
			if i == 0 {
				if g := got.Finding.Sun; g == nil || !math.IsNaN(g.AzimuthDeg) {
					t.Errorf("NaN azimuth came back as %+v", g)
				}
				got.Finding.Sun = in[0].Finding.Sun
			}
			want := in[i]
			want.Finding.Basis = solarcheck.Basis{}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("pass %d, item %d:\n got %+v\nwant %+v", pass, i, got, want)
			}
		}
		rd.close()
	}
}

// TestSpoolRecordFields: the spool's record carries every field of
// solarcheck.Finding but its basis, with the same type, so that a field
// added to Finding cannot be lost between examination and report unnoticed.
func TestSpoolRecordFields(t *testing.T) {
	rec := reflect.TypeOf(record{})
	fin := reflect.TypeOf(solarcheck.Finding{})
	for i := 0; i < fin.NumField(); i++ {
		f := fin.Field(i)
		if f.Name == "Basis" {
			continue
		}
		r, ok := rec.FieldByName(f.Name)
		if !ok || r.Type != f.Type {
			t.Errorf("Finding.%s (%v) is not carried by the spool's record: add it to record, recordOf and record.stored", f.Name, f.Type)
		}
	}
	if _, ok := rec.FieldByName("Basis"); ok {
		t.Error("the record keeps the diagnosis basis")
	}
}

// TestRunStreamsInReportOrder: with two inputs holding the same relative
// paths, Photos hands out every entry once, sorted by path then root (the
// order package report requires), the verdicts line up with the photos,
// Close removes the spool, and a cancelled run leaves no spool behind.
func TestRunStreamsInReportOrder(t *testing.T) {
	a, b := filepath.Join(t.TempDir(), "b-second"), filepath.Join(t.TempDir(), "a-first")
	for _, d := range []string{a, b} {
		if _, err := smallset.Write(d, 5, smallset.Options{}); err != nil {
			t.Fatal(err)
		}
	}
	entries, err := Walk([]string{a, b})
	if err != nil {
		t.Fatal(err)
	}
	x := solarcheck.NewExaminer(solarcheck.Options{Zones: zone.NewFinder(nil)})
	spoolDir := t.TempDir()
	res, err := Run(context.Background(), entries, Options{Examiner: x, SpoolDir: spoolDir, Workers: 3})
	if err != nil {
		t.Fatal(err)
	}
	var got []report.Photo
	err = res.Photos(context.Background(), true, func(p *report.Photo) error {
		got = append(got, *p)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != len(entries) || len(res.Verdicts) != len(entries) {
		t.Fatalf("%d photos and %d verdicts for %d entries", len(got), len(res.Verdicts), len(entries))
	}
	for k := range got {
		if got[k].Verdict != res.Verdicts[k] {
			t.Errorf("photo %d (%s): verdict %q, Verdicts says %q", k, got[k].Path, got[k].Verdict, res.Verdicts[k])
		}
		if k > 0 {
			p, q := got[k-1], got[k]
			if p.Path > q.Path || (p.Path == q.Path && p.Root >= q.Root) {
				t.Errorf("photo %d (%s in %s) comes after %s in %s", k, q.Path, q.Root, p.Path, p.Root)
			}
		}
	}
	if err := res.Close(); err != nil {
		t.Fatal(err)
	}
	if des, _ := os.ReadDir(spoolDir); len(des) != 0 {
		t.Errorf("Close left %d files in the spool folder", len(des))
	}

	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, entries, Options{Examiner: x, SpoolDir: spoolDir}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled run: err %v, want context.Canceled", err)
	}
	if des, _ := os.ReadDir(spoolDir); len(des) != 0 {
		t.Errorf("a cancelled run left %d files in the spool folder", len(des))
	}
}
