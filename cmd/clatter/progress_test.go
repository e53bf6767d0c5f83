package main

import (
	"bytes"
	"io"
	"os"
	"testing"
)

func TestIsTerminal(t *testing.T) {
	// /dev/null is a character device but no terminal (POSIX isatty(3)
	// fails on it with ENOTTY), so no progress bar is drawn into it.
	null, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	if err != nil {
		t.Skipf("no %s here: %v", os.DevNull, err)
	}
	defer null.Close()
	file, err := os.Create(t.TempDir() + "/log")
	if err != nil {
		t.Fatal(err)
	}
	defer file.Close()
	for _, c := range []struct {
		name string
		w    io.Writer
	}{{os.DevNull, null}, {"a plain file", file}, {"a buffer", &bytes.Buffer{}}} {
		if isTerminal(c.w) {
			t.Errorf("isTerminal(%s) = true, want false", c.name)
		}
	}
}
