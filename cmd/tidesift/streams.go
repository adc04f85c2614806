package main

import (
	"io"
	"os"

	"golang.org/x/term"
)

// streams are the program's standard input and outputs, with whether each is a
// terminal. Tables and progress bars are drawn for a terminal; a pipe gets
// plain, stable text. Tests inject buffers.
type streams struct {
	In     io.Reader
	Out    io.Writer
	ErrOut io.Writer

	InTerminal, OutTerminal, ErrTerminal bool
}

// stdStreams returns the process's standard streams.
func stdStreams() streams {
	return streams{
		In:          os.Stdin,
		Out:         os.Stdout,
		ErrOut:      os.Stderr,
		InTerminal:  term.IsTerminal(int(os.Stdin.Fd())),
		OutTerminal: term.IsTerminal(int(os.Stdout.Fd())),
		ErrTerminal: term.IsTerminal(int(os.Stderr.Fd())),
	}
}
