package main

import (
	"fmt"
	"io"
	"os"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progress reports how far a batch has come, on stderr only.
type progress interface {
	step()   // one item done; safe for concurrent use
	finish() // the batch is over
}

// newProgress picks how to show progress: a bar when w is a terminal, a few
// plain lines when it is a file or pipe (a bar would redraw, and the bar
// library fsyncs a file on every redraw), nothing when quiet.
func newProgress(w io.Writer, total int, label string, quiet bool) progress {
	if quiet || total == 0 {
		return noProgress{}
	}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		return barProgress{progressbar.NewOptions(total,
			progressbar.OptionSetWriter(w), // the library's default is stdout
			progressbar.OptionSetDescription(label),
			progressbar.OptionShowCount(),
			progressbar.OptionShowIts(),
			progressbar.OptionSetItsString("files"),
			progressbar.OptionSetPredictTime(true),
			progressbar.OptionThrottle(100*time.Millisecond),
			progressbar.OptionClearOnFinish(),
		)}
	}
	return &lineProgress{w: w, total: total, label: label, start: time.Now()}
}

type noProgress struct{}

func (noProgress) step()   {}
func (noProgress) finish() {}

type barProgress struct{ bar *progressbar.ProgressBar }

func (b barProgress) step()   { _ = b.bar.Add(1) }
func (b barProgress) finish() { _ = b.bar.Finish() }

// lineProgress prints a line at every tenth of the batch.
type lineProgress struct {
	mu    sync.Mutex
	w     io.Writer
	total int
	done  int
	label string
	start time.Time
}

func (p *lineProgress) step() {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.done++
	if p.done*10/p.total != (p.done-1)*10/p.total || p.done == p.total {
		fmt.Fprintf(p.w, "%s: %d of %d files (%.0f s)\n", p.label, p.done, p.total, time.Since(p.start).Seconds())
	}
}

func (p *lineProgress) finish() {}
