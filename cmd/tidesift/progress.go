package main

import (
	"fmt"
	"io"
	"strings"
	"sync"
	"time"
)

// progressBar draws a one-line progress bar, redrawn in place with a carriage
// return. It is only made for a terminal: on a pipe or a log file the caller
// uses no bar at all (see newProgress), so redirected output stays clean.
// Update may be called from several goroutines.
type progressBar struct {
	mu      sync.Mutex
	w       io.Writer
	label   string
	width   int
	start   time.Time
	now     func() time.Time
	lastPct int
	lastAt  time.Time
	drawn   bool
}

// newProgress returns a bar on the error stream when it is a terminal, else
// nil; a nil *progressBar ignores every call.
func newProgress(s streams, label string) *progressBar {
	if !s.ErrTerminal {
		return nil
	}
	return &progressBar{w: s.ErrOut, label: label, width: 30, now: time.Now, start: time.Now(), lastPct: -1}
}

// Update shows done of total. It redraws when the percentage changes, at
// most ten times a second.
func (p *progressBar) Update(done, total int) {
	if p == nil || total <= 0 {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	done = min(max(done, 0), total)
	pct := done * 100 / total
	t := p.now()
	if pct == p.lastPct || (t.Sub(p.lastAt) < 100*time.Millisecond && done < total) {
		return
	}
	p.lastPct, p.lastAt = pct, t
	fill := done * p.width / total
	fmt.Fprintf(p.w, "\r%s [%s%s] %3d%% %5.1fs", p.label,
		strings.Repeat("#", fill), strings.Repeat(".", p.width-fill), pct, t.Sub(p.start).Seconds())
	p.drawn = true
}

// Done clears the bar's line.
func (p *progressBar) Done() {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.drawn {
		fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", len(p.label)+p.width+16))
		p.drawn = false
	}
}
