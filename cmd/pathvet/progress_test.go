package main

import (
	"bytes"
	"os"
	"strings"
	"testing"
)

// No progress line where standard error is not a terminal, or with --quiet.
func TestProgressLine_OnlyOnTerminal(t *testing.T) {
	var buf bytes.Buffer
	if p := newProgressLine(&buf, false); p != nil || p.callback() != nil {
		t.Fatal("a progress line on a buffer")
	}
	if newProgressLine(os.Stderr, true) != nil {
		t.Fatal("a progress line with --quiet")
	}
	p := newProgressLine(&buf, false)
	p.clear()
	if buf.Len() != 0 {
		t.Fatalf("wrote %q", buf.String())
	}
}

// The line is redrawn in place and wiped at the end.
func TestProgressLine_Draws(t *testing.T) {
	var buf bytes.Buffer
	p := &progressLine{w: &buf}
	p.update("missing data: imputations", 0, 20)
	p.update("missing data: imputations", 20, 20)
	p.clear()
	out := buf.String()
	if !strings.Contains(out, "\r\033[Kpathvet: missing data: imputations: 20 of 20 done") ||
		!strings.HasSuffix(out, "\r\033[K") {
		t.Fatalf("drew %q", out)
	}
}
