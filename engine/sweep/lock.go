package sweep

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// LockFile is the file in an output folder that says which process is
// writing into it. It exists only while a sweep, resume or merge writes
// there (or after a crash, when it no longer holds anything back).
const LockFile = ".clatter.lock"

// Lock is the hold of one process on an output folder: one writer per
// folder, so that two sweeps never run the same trials into one
// trials.csv. On unix it is an advisory lock (flock) on LockFile, which
// the system lets go of when the process ends, however it ends: a lock
// left by a crash does not block a --resume.
type Lock struct {
	path string
	f    *os.File
}

// Holder is what a lock file says about the process that holds it.
type Holder struct {
	PID   int
	Host  string
	Since time.Time
}

func (h Holder) String() string {
	if h.PID == 0 {
		return "another process (it has not yet written its name)"
	}
	s := fmt.Sprintf("process %d on host %s", h.PID, h.Host)
	if !h.Since.IsZero() {
		s += ", since " + h.Since.UTC().Format(time.RFC3339)
	}
	return s
}

// ErrLocked is wrapped by the error of LockFolder for a folder in use.
var ErrLocked = errors.New("folder in use")

// lockedError is a folder in use: bad input (choose another folder), and
// ErrLocked.
type lockedError struct{ msg string }

func (e *lockedError) Error() string        { return e.msg }
func (e *lockedError) Is(target error) bool { return target == ErrLocked || target == ErrBadInput }

// LockFolder takes the folder dir (made if missing) for this process. A
// folder in use by a live process is refused with an error that wraps
// ErrBadInput and ErrLocked and names that process.
func LockFolder(dir string) (*Lock, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, badf("cannot make the output folder %s: %v", dir, unwrapPath(err))
	}
	p := filepath.Join(dir, LockFile)
	for range 10 {
		f, err := os.OpenFile(p, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			return nil, badf("cannot write into %s: %v", dir, unwrapPath(err))
		}
		held, err := tryLock(f)
		if err != nil {
			f.Close()
			return nil, fmt.Errorf("cannot lock %s: %w", p, err)
		}
		if held {
			h := readHolder(f)
			f.Close()
			return nil, &lockedError{fmt.Sprintf("%s is in use by %s, which is writing a sweep there; wait for it to end, or choose another folder with -o", dir, h)}
		}
		// The holder before us may have removed the file after we opened
		// it: then ours is a lock on a file no one else will find.
		if same, err := samePath(f, p); err != nil || !same {
			f.Close()
			continue
		}
		l := &Lock{path: p, f: f}
		if err := l.writeHolder(); err != nil {
			l.Release()
			return nil, badf("cannot write into %s: %v", dir, unwrapPath(err))
		}
		return l, nil
	}
	return nil, badf("cannot lock %s: it keeps being replaced by another process", p)
}

// samePath reports whether the open file f is still the file at p.
func samePath(f *os.File, p string) (bool, error) {
	a, err := f.Stat()
	if err != nil {
		return false, err
	}
	b, err := os.Stat(p)
	if err != nil {
		return false, nil
	}
	return os.SameFile(a, b), nil
}

func (l *Lock) writeHolder() error {
	host, _ := os.Hostname()
	text := fmt.Sprintf("pid %d\nhost %s\nsince %s\n", os.Getpid(), host, time.Now().UTC().Format(time.RFC3339))
	if err := l.f.Truncate(0); err != nil {
		return err
	}
	_, err := l.f.WriteAt([]byte(text), 0)
	return err
}

func readHolder(f *os.File) Holder {
	b := make([]byte, 512)
	n, _ := f.ReadAt(b, 0)
	var h Holder
	for _, line := range strings.Split(string(b[:n]), "\n") {
		k, v, _ := strings.Cut(line, " ")
		switch k {
		case "pid":
			h.PID, _ = strconv.Atoi(v)
		case "host":
			h.Host = v
		case "since":
			h.Since, _ = time.Parse(time.RFC3339, v)
		}
	}
	return h
}

// Release gives the folder up: the lock file is removed while still held,
// so that no one takes a lock on a file about to go.
func (l *Lock) Release() {
	if l == nil || l.f == nil {
		return
	}
	os.Remove(l.path)
	unlock(l.f)
	l.f.Close()
	l.f = nil
}
