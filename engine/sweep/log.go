package sweep

import (
	"bufio"
	"bytes"
	"container/heap"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
)

// A table is the layout of one of the CSV files written as trials finish
// (trials.csv, failures.csv): its header, and what a trial's group of rows
// looks like, so that a file cut off by a crash can be read back to its
// last complete trial.
type table struct {
	header string
	fields int
	// rows is the number of rows of one trial, 0 for any number (the rows
	// of a trial are then those in a run with its case and trial); names,
	// if set, the value of column nameCol in each of them (the moving
	// bodies in order).
	rows    int
	nameCol int
	names   []string
	cases   int64
	trials  int64
}

func trialsTable(m *Meta) *table {
	names := make([]string, len(m.Bodies))
	for i, b := range m.Bodies {
		names[i] = b.Name
	}
	return &table{header: m.trialsHeader(), fields: 16 + len(m.Vary), rows: len(names), nameCol: 3 + len(m.Vary), names: names, cases: m.Cases, trials: m.Trials}
}

func failuresTable(m *Meta) *table {
	return &table{header: failuresHeader, fields: 4, rows: 1, cases: m.Cases, trials: m.Trials}
}

// group is the rows of one trial, g its global index.
type group struct {
	g    int64
	data []byte
}

// A csvLine splits single lines of CSV (RFC 4180, by encoding/csv) into
// fields. Its zero value is ready to use; it keeps one csv.Reader, fed a
// line at a time, so that scanning a large file allocates little. Each row
// of our files is one line: the logs are framed by line breaks, so that a
// row torn by a crash or damaged stays confined to its own line.
type csvLine struct {
	src bytes.Reader
	r   *csv.Reader
}

// split returns the fields of line (without its line break); ok is false
// for a malformed line. The slice is reused by the next call.
func (l *csvLine) split(line []byte) (fields []string, ok bool) {
	if l.r == nil {
		l.r = csv.NewReader(&l.src)
		l.r.FieldsPerRecord = -1
		l.r.ReuseRecord = true
	}
	// The Reader has read src to its end (the line holds no line break, so
	// a record ends only there), so it reads the next line from src afresh.
	l.src.Reset(line)
	f, err := l.r.Read()
	return f, err == nil
}

// csvField returns s as one CSV field, quoted as encoding/csv's Writer
// quotes it.
func csvField(s string) string {
	var b strings.Builder
	w := csv.NewWriter(&b)
	w.Write([]string{s}) // a strings.Builder does not fail
	w.Flush()
	return strings.TrimSuffix(b.String(), "\n")
}

// scanStats counts what a scan dropped.
type scanStats struct {
	// end is the offset just past the last complete line.
	end int64
	// torn is set when the file ends in a line without its line break:
	// a row cut off by a crash.
	torn bool
	// dropped counts complete lines that are not part of a complete,
	// valid trial.
	dropped int
}

// scan reads a file of tb's layout and calls fn for every complete, valid
// trial in file order. With header set the first line must be tb's header.
func (tb *table) scan(r io.Reader, header bool, fn func(group) error) (scanStats, error) {
	br := bufio.NewReaderSize(r, 1<<16)
	var st scanStats
	var split csvLine
	var fields []string
	var cur []byte
	curG, curN := int64(-1), 0
	flush := func() error {
		if curN == 0 {
			return nil
		}
		if curN == tb.rows || tb.rows == 0 {
			if err := fn(group{g: curG, data: cur}); err != nil {
				return err
			}
		} else {
			st.dropped += curN
		}
		cur, curG, curN = nil, -1, 0
		return nil
	}
	first := header
	for {
		line, err := br.ReadSlice('\n')
		if err == bufio.ErrBufferFull {
			// A line longer than the buffer: gather it whole.
			long := append([]byte(nil), line...)
			for err == bufio.ErrBufferFull {
				line, err = br.ReadSlice('\n')
				long = append(long, line...)
			}
			line = long
		}
		if err != nil && err != io.EOF {
			return st, err
		}
		if len(line) == 0 {
			break
		}
		if line[len(line)-1] != '\n' {
			st.torn = true
			break
		}
		st.end += int64(len(line))
		body := line[:len(line)-1]
		if first {
			first = false
			if string(body) != tb.header {
				return st, fmt.Errorf("its first line is %q, not the header %q", truncate(string(body), 120), truncate(tb.header, 120))
			}
			continue
		}
		g, ok := tb.parse(body, &split, &fields, curN, curG)
		if !ok {
			st.dropped++
			if err := flush(); err != nil {
				return st, err
			}
			continue
		}
		if g != curG || (tb.rows > 0 && curN == tb.rows) {
			if err := flush(); err != nil {
				return st, err
			}
			if !tb.starts(fields) {
				st.dropped++
				continue
			}
			curG = g
		}
		cur = append(cur, line...)
		curN++
		if err == io.EOF {
			break
		}
	}
	if first {
		return st, errors.New("it is empty, without even its header")
	}
	return st, flush()
}

func truncate(s string, n int) string {
	if len(s) <= n {
		return s
	}
	return s[:n] + "..."
}

// parse checks one row and returns its trial's global index. A row that
// continues a group must name the next body of the trial.
func (tb *table) parse(line []byte, l *csvLine, fields *[]string, curN int, curG int64) (int64, bool) {
	f, ok := l.split(line)
	*fields = f
	if !ok || len(f) != tb.fields {
		return 0, false
	}
	c, err1 := strconv.ParseInt(f[0], 10, 64)
	t, err2 := strconv.ParseInt(f[1], 10, 64)
	if err1 != nil || err2 != nil || c < 0 || c >= tb.cases || t < 0 || t >= tb.trials {
		return 0, false
	}
	g := c*tb.trials + t
	if g == curG && curN < tb.rows && tb.names != nil && f[tb.nameCol] != tb.names[curN] {
		return 0, false
	}
	return g, true
}

// starts reports whether a row can begin a trial's group.
func (tb *table) starts(f []string) bool { return tb.names == nil || f[tb.nameCol] == tb.names[0] }

// sortLimit is the bytes of rows sorted in memory at once; larger files
// are sorted in runs of this size written to temporary files and merged,
// so that memory stays bounded whatever the number of trials.
var sortLimit = 64 << 20

// sorter puts groups in order of their global index, dropping repeats.
type sorter struct {
	dir    string
	buf    []group
	size   int
	spills []string
}

func (s *sorter) add(g group) error {
	g.data = slices.Clone(g.data)
	s.buf = append(s.buf, g)
	s.size += len(g.data)
	if s.size >= sortLimit {
		return s.spill()
	}
	return nil
}

func (s *sorter) sortBuf() {
	slices.SortStableFunc(s.buf, func(a, b group) int {
		switch {
		case a.g < b.g:
			return -1
		case a.g > b.g:
			return 1
		}
		return 0
	})
}

func (s *sorter) spill() error {
	s.sortBuf()
	p := filepath.Join(s.dir, fmt.Sprintf(".sort-%d.tmp", len(s.spills)))
	f, err := os.Create(p)
	if err != nil {
		return err
	}
	s.spills = append(s.spills, p)
	bw := bufio.NewWriterSize(f, 1<<16)
	for _, g := range s.buf {
		bw.Write(g.data)
	}
	if err := bw.Flush(); err != nil {
		f.Close()
		return err
	}
	s.buf, s.size = s.buf[:0], 0
	return f.Close()
}

// each calls fn for every group in order of global index; of groups with
// the same index the first added is kept, and dup is called with the
// others.
func (s *sorter) each(tb *table, fn func(group) error, dup func(kept, other group) error) error {
	defer s.cleanup()
	if len(s.spills) == 0 {
		s.sortBuf()
		for i, g := range s.buf {
			if i > 0 && g.g == s.buf[i-1].g {
				if err := dup(s.buf[i-1], g); err != nil {
					return err
				}
				continue
			}
			if err := fn(g); err != nil {
				return err
			}
		}
		return nil
	}
	if len(s.buf) > 0 {
		if err := s.spill(); err != nil {
			return err
		}
	}
	// A k-way merge of the sorted runs; ties go to the earlier run.
	h := &runHeap{}
	for i, p := range s.spills {
		f, err := os.Open(p)
		if err != nil {
			return err
		}
		defer f.Close()
		r := &run{index: i, next: make(chan group), errc: make(chan error, 1), stop: make(chan struct{})}
		defer close(r.stop)
		go func() {
			_, err := tb.scan(f, false, func(g group) error {
				select {
				case r.next <- group{g: g.g, data: slices.Clone(g.data)}:
					return nil
				case <-r.stop:
					return errStopped
				}
			})
			r.errc <- err
			close(r.next)
		}()
		if r.advance() {
			heap.Push(h, r)
		} else if err := <-r.errc; err != nil {
			return err
		}
	}
	var last *group
	for h.Len() > 0 {
		r := (*h)[0]
		g := r.head
		if last != nil && g.g == last.g {
			if err := dup(*last, g); err != nil {
				return err
			}
		} else {
			if err := fn(g); err != nil {
				return err
			}
			kept := g
			last = &kept
		}
		if r.advance() {
			heap.Fix(h, 0)
		} else {
			heap.Pop(h)
			if err := <-r.errc; err != nil {
				return err
			}
		}
	}
	return nil
}

var errStopped = errors.New("stopped")

func (s *sorter) cleanup() {
	for _, p := range s.spills {
		os.Remove(p)
	}
	s.spills = nil
}

// run is one sorted run of a k-way merge, read in its own goroutine.
type run struct {
	index int
	head  group
	next  chan group
	errc  chan error
	stop  chan struct{}
}

func (r *run) advance() bool {
	g, ok := <-r.next
	r.head = g
	return ok
}

type runHeap []*run

func (h runHeap) Len() int { return len(h) }
func (h runHeap) Less(i, j int) bool {
	if h[i].head.g != h[j].head.g {
		return h[i].head.g < h[j].head.g
	}
	return h[i].index < h[j].index
}
func (h runHeap) Swap(i, j int) { h[i], h[j] = h[j], h[i] }
func (h *runHeap) Push(x any)   { *h = append(*h, x.(*run)) }
func (h *runHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// writeAtomic writes a file through a temporary one, synced, so that a
// reader or a crash never leaves half of it.
func writeAtomic(path string, data []byte) error {
	tmp := path + ".tmp"
	f, err := os.Create(tmp)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	if err := f.Sync(); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}
