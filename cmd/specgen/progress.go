package main

import (
	"fmt"
	"io"
	"os"
	"sync"
	"time"
)

// progressDelay is how long a build runs before it reports progress:
// quick builds stay quiet.
const progressDelay = time.Second

// progress shows how far a build is. On a terminal it keeps one line up to
// date; otherwise it writes a plain line at the end of each stage. Nothing
// shows before progressDelay.
type progress struct {
	w      io.Writer
	tty    bool
	start  time.Time
	mu     sync.Mutex
	last   time.Time
	counts map[string]string
	order  []string
	shown  bool
}

func newProgress(w io.Writer) *progress {
	tty := false
	if f, ok := w.(*os.File); ok {
		if info, err := f.Stat(); err == nil && info.Mode()&os.ModeCharDevice != 0 {
			tty = true
		}
	}
	return &progress{w: w, tty: tty, start: time.Now(), counts: map[string]string{}}
}

// update records a stage's count; it is safe for concurrent use.
func (p *progress) update(stage string, done, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if _, ok := p.counts[stage]; !ok {
		p.order = append(p.order, stage)
	}
	p.counts[stage] = fmt.Sprintf("%d/%d %s", done, total, stage)
	now := time.Now()
	if now.Sub(p.start) < progressDelay {
		return
	}
	finished := done == total
	if p.tty {
		if finished || now.Sub(p.last) > 100*time.Millisecond {
			p.last = now
			fmt.Fprintf(p.w, "\r\033[K%s", p.line())
			p.shown = true
		}
		return
	}
	if finished {
		fmt.Fprintf(p.w, "specgen: %s\n", p.counts[stage])
	}
}

func (p *progress) line() string {
	s := "specgen:"
	for _, st := range p.order {
		s += " " + p.counts[st] + ","
	}
	return s[:len(s)-1]
}

// done ends the terminal line, if one was drawn.
func (p *progress) done() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.tty && p.shown {
		fmt.Fprintln(p.w)
	}
}
