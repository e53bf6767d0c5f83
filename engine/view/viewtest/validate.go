package viewtest

import (
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
)

// Issues is the part of the validator's report the tests read.
type Issues struct {
	NumErrors   int `json:"numErrors"`
	NumWarnings int `json:"numWarnings"`
	Messages    []struct {
		Code     string `json:"code"`
		Message  string `json:"message"`
		Severity int    `json:"severity"` // 0 error, 1 warning, 2 information, 3 hint
		Pointer  string `json:"pointer"`
	} `json:"messages"`
}

// String lists the errors and warnings, one a line.
func (is Issues) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d errors, %d warnings", is.NumErrors, is.NumWarnings)
	for _, m := range is.Messages {
		if m.Severity <= 1 {
			fmt.Fprintf(&b, "\n  %s %s: %s", m.Code, m.Pointer, m.Message)
		}
	}
	return b.String()
}

// validateScript runs the validator on one file and prints its issues as
// JSON.
const validateScript = `
const validator = require(process.argv[2]);
const data = new Uint8Array(require('fs').readFileSync(process.argv[3]));
validator.validateBytes(data, {maxIssues: 200}).then(
  (r) => { process.stdout.write(JSON.stringify(r.issues)); },
  (e) => { console.error(String(e)); process.exit(1); });
`

var npmOnce struct {
	sync.Once
	module string
	err    error
}

// cacheDir is where the tools are installed, kept between test runs.
func cacheDir() string {
	d, err := os.UserCacheDir()
	if err != nil {
		d = os.TempDir()
	}
	return filepath.Join(d, "clatter-test")
}

// validatorModule installs gltf-validator with npm into the cache (once
// per machine; a file lock keeps the test processes of several packages
// from installing at once) and returns its folder.
func validatorModule() (string, error) {
	npmOnce.Do(func() {
		prefix := filepath.Join(cacheDir(), "npm")
		mod := filepath.Join(prefix, "node_modules", "gltf-validator")
		if err := os.MkdirAll(prefix, 0o755); err != nil {
			npmOnce.err = err
			return
		}
		unlock, err := lock(filepath.Join(prefix, ".lock"))
		if err != nil {
			npmOnce.err = err
			return
		}
		defer unlock()
		if _, err := os.Stat(filepath.Join(mod, "package.json")); err != nil {
			if _, err := exec.LookPath("npm"); err != nil {
				npmOnce.err = fmt.Errorf("npm is not installed")
				return
			}
			out, err := exec.Command("npm", "install", "--prefix", prefix, "--no-audit", "--no-fund", "gltf-validator").CombinedOutput()
			if err != nil {
				npmOnce.err = fmt.Errorf("npm install gltf-validator: %v\n%s", err, out)
				return
			}
		}
		npmOnce.module = mod
	})
	return npmOnce.module, npmOnce.err
}

func lock(path string) (func(), error) {
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR, 0o644)
	if err != nil {
		return nil, err
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX); err != nil {
		f.Close()
		return nil, err
	}
	return func() { syscall.Flock(int(f.Fd()), syscall.LOCK_UN); f.Close() }, nil
}

// Validate runs the Khronos glTF validator on a .glb file and returns its
// issues. It skips the test when Node.js or the validator cannot be had.
func Validate(t testing.TB, path string) Issues {
	t.Helper()
	if _, err := exec.LookPath("node"); err != nil {
		t.Skip("skipped: Node.js is not installed, so the Khronos glTF validator (npm package gltf-validator) cannot run; install nodejs and npm")
	}
	mod, err := validatorModule()
	if err != nil {
		t.Skipf("skipped: cannot install the Khronos glTF validator: %v", err)
	}
	script := filepath.Join(t.TempDir(), "validate.js")
	if err := os.WriteFile(script, []byte(validateScript), 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command("node", script, mod, path).Output()
	if err != nil {
		msg := ""
		if ee, ok := err.(*exec.ExitError); ok {
			msg = string(ee.Stderr)
		}
		t.Fatalf("the glTF validator failed on %s: %v %s", path, err, msg)
	}
	var is Issues
	if err := json.Unmarshal(out, &is); err != nil {
		t.Fatalf("cannot read the validator's report: %v\n%s", err, out)
	}
	return is
}
