package report

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// sink is the result files of a run being written: each through a buffer,
// all flushed together after every trajectory sample, so that a killed
// process leaves the events and the trajectory up to the same sample. A
// write error stops the run; each file is then cut back to the end of the
// last sample written in full, so that it holds no torn row.
type sink struct {
	dir   string
	files []*outFile
	kept  float64 // time of the last sample flushed to every file; -1 before
	err   *WriteError
}

type outFile struct {
	name string
	f    *os.File
	bw   *bufio.Writer
	good int64 // size of the file after the last complete flush
}

func newSink(dir string) *sink { return &sink{dir: dir, kept: -1} }

// create makes one result file and returns its buffer.
func (s *sink) create(name string) (*bufio.Writer, error) {
	f, err := os.Create(filepath.Join(s.dir, name))
	if err != nil {
		return nil, err
	}
	of := &outFile{name: name, f: f, bw: bufio.NewWriterSize(f, 1<<16)}
	s.files = append(s.files, of)
	return of.bw, nil
}

// commit flushes every file after the rows of time t. It reports false,
// and records the error, when a file could not be written.
func (s *sink) commit(t float64) bool {
	if s.err != nil {
		return false
	}
	for _, of := range s.files {
		if err := of.bw.Flush(); err != nil {
			s.fail(of, err)
			return false
		}
	}
	for _, of := range s.files {
		n, err := of.f.Seek(0, io.SeekCurrent)
		if err != nil {
			s.fail(of, err)
			return false
		}
		of.good = n
	}
	s.kept = t
	return true
}

// fail records a write error and cuts every file back to its last
// complete sample.
func (s *sink) fail(of *outFile, err error) {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	s.err = &WriteError{Dir: s.dir, File: of.name, Err: err, Kept: s.kept}
	for _, o := range s.files {
		if o.f.Truncate(o.good) != nil {
			s.err.Torn = append(s.err.Torn, o.name)
		}
	}
}

// close closes the files; the last commit has flushed them.
func (s *sink) close() {
	for _, of := range s.files {
		of.f.Close()
	}
	s.files = nil
}

// WriteError is a run stopped because its results could not be written (a
// full disk, a quota, a removed folder). It says what the folder keeps.
type WriteError struct {
	Dir, File string
	Err       error
	// Kept is the time of the last sample that every file holds in full,
	// -1 if none; Stopped the simulated time when the run stopped.
	Kept, Stopped float64
	// Summary tells whether summary.json (of the state at Stopped) was
	// written; Torn names files that could not be cut back to Kept.
	Summary bool
	Torn    []string
}

func (e *WriteError) Unwrap() error { return e.Err }

func (e *WriteError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "cannot write %s: %v; the run stopped at t = %.6g s. ", filepath.Join(e.Dir, e.File), e.Err, e.Stopped)
	if e.Kept >= 0 {
		fmt.Fprintf(&b, "Kept in %s: %s and %s up to t = %.6g s", e.Dir, TrajectoryFile, EventsFile, e.Kept)
	} else {
		fmt.Fprintf(&b, "%s and %s in %s hold nothing of the run", TrajectoryFile, EventsFile, e.Dir)
	}
	if len(e.Torn) > 0 {
		fmt.Fprintf(&b, " (the last row of %s may be cut off)", strings.Join(e.Torn, " and "))
	}
	if e.Summary {
		fmt.Fprintf(&b, "; %s holds the state at t = %.6g s", SummaryFile, e.Stopped)
	} else {
		fmt.Fprintf(&b, "; %s was not written", SummaryFile)
	}
	b.WriteString(". Free space or choose another folder with -o, and run again.")
	return b.String()
}

// interruptedError is a run stopped from outside (Ctrl-C, SIGTERM). Its
// message says so in the user's words; it wraps the context's error.
type interruptedError struct {
	time  float64
	cause error
}

func (e *interruptedError) Error() string { return fmt.Sprintf("interrupted at t = %.6g s", e.time) }
func (e *interruptedError) Unwrap() error { return e.cause }
