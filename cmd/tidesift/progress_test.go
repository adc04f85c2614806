package main

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

func TestProgressOnlyOnATerminal(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(streams{ErrOut: &buf, ErrTerminal: false}, "ranking")
	p.Update(5, 10) // a nil bar ignores calls
	p.Done()
	if buf.Len() != 0 {
		t.Errorf("a bar on a non-terminal wrote %q", buf.String())
	}
}

func TestProgressDraws(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(streams{ErrOut: &buf, ErrTerminal: true}, "ranking")
	clock := time.Unix(0, 0)
	p.start = clock
	p.now = func() time.Time { return clock }
	p.Update(0, 4)
	clock = clock.Add(time.Second)
	p.Update(2, 4)
	p.Update(3, 4) // within 100 ms of the last draw: skipped
	clock = clock.Add(time.Second)
	p.Update(4, 4)
	out := buf.String()
	for _, want := range []string{
		"\rranking [..............................]   0%   0.0s",
		"\rranking [###############...............]  50%   1.0s",
		"\rranking [##############################] 100%   2.0s",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%q", want, out)
		}
	}
	if strings.Contains(out, " 75%") {
		t.Errorf("redrew within 100 ms: %q", out)
	}
	p.Done()
	if !strings.HasSuffix(buf.String(), "\r") {
		t.Errorf("Done did not clear the line: %q", buf.String())
	}
}
