package viewtest

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sync"
	"testing"
	"time"
)

var browserOnce struct {
	sync.Once
	path string
	err  error
}

// browserNames are the names Debian's and other distributions' Chromium
// packages install.
var browserNames = []string{"chromium", "chromium-browser", "google-chrome", "google-chrome-stable"}

func findBrowser() string {
	for _, n := range browserNames {
		if p, err := exec.LookPath(n); err == nil {
			return p
		}
	}
	return ""
}

// browser finds a headless Chromium, installing Debian's package with
// apt-get when it is missing and the tests run as root (as CI does).
func browser() (string, error) {
	browserOnce.Do(func() {
		if p := findBrowser(); p != "" {
			browserOnce.path = p
			return
		}
		if _, err := exec.LookPath("apt-get"); err != nil || os.Geteuid() != 0 {
			browserOnce.err = fmt.Errorf("no Chromium found (%v) and cannot install one: apt-get needs root", browserNames)
			return
		}
		unlock, err := lock(filepath.Join(os.TempDir(), "clatter-test-apt.lock"))
		if err != nil {
			browserOnce.err = err
			return
		}
		defer unlock()
		if p := findBrowser(); p != "" { // installed by another test process
			browserOnce.path = p
			return
		}
		ctx, cancel := context.WithTimeout(context.Background(), 8*time.Minute)
		defer cancel()
		for _, args := range [][]string{{"update", "-qq"}, {"install", "-y", "-qq", "chromium"}} {
			cmd := exec.CommandContext(ctx, "apt-get", args...)
			cmd.Env = append(os.Environ(), "DEBIAN_FRONTEND=noninteractive")
			if out, err := cmd.CombinedOutput(); err != nil {
				browserOnce.err = fmt.Errorf("apt-get %v: %v\n%s", args, err, out)
				return
			}
		}
		browserOnce.path = findBrowser()
		if browserOnce.path == "" {
			browserOnce.err = fmt.Errorf("apt-get installed chromium but it is not on PATH")
		}
	})
	return browserOnce.path, browserOnce.err
}

// Headless runs a headless Chromium on a local page with a fresh profile
// and no network services, with extra arguments (--screenshot=...,
// --dump-dom), and returns its standard output. It skips the test when no
// browser can be had.
func Headless(t testing.TB, page string, extra ...string) []byte {
	t.Helper()
	bin, err := browser()
	if err != nil {
		t.Skipf("skipped: no headless browser: %v", err)
	}
	abs, err := filepath.Abs(page)
	if err != nil {
		t.Fatal(err)
	}
	args := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run",
		"--user-data-dir=" + t.TempDir(), "--window-size=1000,1000"}
	args = append(append(args, extra...), "file://"+abs)
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, args...)
	var stderr []byte
	out, err := cmd.Output()
	if ee, ok := err.(*exec.ExitError); ok {
		stderr = ee.Stderr
	}
	if err != nil {
		t.Fatalf("%s: %v\n%s", bin, err, stderr)
	}
	return out
}
