package audit

import (
	"cmp"
	"context"
	"runtime"
	"slices"
	"strings"
	"sync"
)

// reportOrder returns the entries' indices in report order: by relative
// path, then by input root (as package report sorts its photos).
func reportOrder(entries []Entry) []int {
	order := make([]int, len(entries))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		return cmp.Or(strings.Compare(entries[a].Rel, entries[b].Rel), strings.Compare(entries[a].Root, entries[b].Root))
	})
	return order
}

// inOrder calls work(k) for k in 0..n-1 on up to workers goroutines (0: one
// per core) and passes each result to emit, on the calling goroutine, in
// the order of k. At most window results wait for an earlier one, so a
// slow item pauses the workers rather than filling memory. Once ctx is
// cancelled, or emit fails, no further k is started, the calls under way
// finish, and the error (emit's first, else ctx.Err()) is returned. emit
// may be nil.
func inOrder[T any](parent context.Context, n, workers, window int, work func(k int) T, emit func(k int, v T) error) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	window = max(window, workers)
	ctx, cancel := context.WithCancel(parent)
	defer cancel()

	type result struct {
		k int
		v T
	}
	next := make(chan int)
	results := make(chan result, workers)
	slots := make(chan struct{}, window) // one per item started and not yet emitted
	go func() {
		defer close(next)
		for k := 0; k < n && ctx.Err() == nil; k++ {
			select {
			case slots <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case next <- k:
			case <-ctx.Done():
				return
			}
		}
	}()
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for k := range next {
				results <- result{k, work(k)}
			}
		}()
	}
	go func() { wg.Wait(); close(results) }()

	var emitErr error
	waiting := map[int]T{}
	want := 0
	for r := range results {
		if emitErr != nil {
			continue // drain, so the workers can finish
		}
		waiting[r.k] = r.v
		for {
			v, ok := waiting[want]
			if !ok {
				break
			}
			delete(waiting, want)
			if emit != nil {
				if err := emit(want, v); err != nil {
					emitErr = err
					cancel()
					break
				}
			}
			want++
			<-slots
		}
	}
	if emitErr != nil {
		return emitErr
	}
	return parent.Err()
}

// parallel calls fn(i) for i in 0..n-1 on up to workers goroutines (0: one
// per core), in any order, and waits for them. Once ctx is cancelled no
// further i is started, the calls under way finish, and ctx.Err() is
// returned.
func parallel(ctx context.Context, n, workers int, fn func(i int)) error {
	return inOrder(ctx, n, workers, n, func(i int) struct{} { fn(i); return struct{}{} }, nil)
}
