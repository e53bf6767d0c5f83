package scene

import (
	"bytes"
	"sort"
	"strconv"
	"strings"

	"github.com/pelletier/go-toml/v2/unstable"
)

// lineIndex maps the path of every key, table and array element of a TOML
// document to the line where it is written, so that errors found after
// decoding can name their line. Paths are the keys from the root, with the
// index of each element of an array of tables or of an array value as a
// decimal segment: "body", "0", "shape", "box".
//
// The lines come from the TOML parser's syntax tree, which keeps where
// every key and value is written; the index only resolves the elements of
// arrays of tables, which the tree names by their header.
type lineIndex map[string]int

func pathKey(p []string) string { return strings.Join(p, "\x1f") }

// line returns the line of path, or of its nearest recorded ancestor, or 1.
func (ix lineIndex) line(path []string) int {
	for n := len(path); n >= 0; n-- {
		if l, ok := ix[pathKey(path[:n])]; ok {
			return l
		}
	}
	return 1
}

// document is a parsed scene file: its values, and the line of each.
type document struct {
	lines lineIndex
	// tables are the paths of the arrays of tables ([[body]], and
	// [[drive.vibration]] as "drive", "0", "vibration").
	tables [][]string
}

// locate walks the syntax tree of a document that the decoder accepted.
func locate(data []byte) document {
	w := &locator{ix: lineIndex{}, arrays: map[string]int{}, newlines: newlines(data)}
	var p unstable.Parser
	p.Reset(data)
	var table []string
	for p.NextExpression() {
		e := p.Expression()
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			keys, line := w.key(e.Key())
			table = w.resolve(keys)
			if e.Kind == unstable.ArrayTable {
				k := pathKey(table)
				if _, seen := w.arrays[k]; !seen {
					w.tables = append(w.tables, table)
				}
				n := w.arrays[k]
				w.arrays[k] = n + 1
				w.record(table, line)
				table = append(table, strconv.Itoa(n))
			}
			for n := 1; n <= len(table); n++ {
				w.record(table[:n], line)
			}
		case unstable.KeyValue:
			w.keyValue(table, e)
		}
	}
	return document{lines: w.ix, tables: w.tables}
}

type locator struct {
	ix       lineIndex
	arrays   map[string]int // resolved path of an array of tables -> elements so far
	tables   [][]string
	newlines []int // offsets of the document's line ends
}

// newlines returns the offsets of the '\n' bytes of data.
func newlines(data []byte) []int {
	var nl []int
	for i := 0; ; {
		j := bytes.IndexByte(data[i:], '\n')
		if j < 0 {
			return nl
		}
		nl = append(nl, i+j)
		i += j + 1
	}
}

// lineAt returns the line of a byte offset.
func (w *locator) lineAt(offset uint32) int {
	return sort.SearchInts(w.newlines, int(offset)) + 1
}

func (w *locator) record(path []string, line int) {
	k := pathKey(path)
	if _, ok := w.ix[k]; !ok {
		w.ix[k] = line
	}
}

// key returns the parts of a dotted key and the line of its first part.
func (w *locator) key(it unstable.Iterator) ([]string, int) {
	var keys []string
	line := 0
	for it.Next() {
		n := it.Node()
		if line == 0 {
			line = w.lineAt(n.Raw.Offset)
		}
		keys = append(keys, string(n.Data))
	}
	return keys, line
}

// resolve turns the keys of a table header into a path, adding the current
// element index after every prefix that names an array of tables.
func (w *locator) resolve(keys []string) []string {
	var p []string
	for i, k := range keys {
		p = append(p, k)
		if n, ok := w.arrays[pathKey(p)]; ok && n > 0 && i < len(keys)-1 {
			p = append(p, strconv.Itoa(n-1))
		}
	}
	return p
}

// keyValue records a key = value line below table.
func (w *locator) keyValue(table []string, e *unstable.Node) {
	keys, line := w.key(e.Key())
	path := append(append([]string{}, table...), keys...)
	for n := len(table) + 1; n <= len(path); n++ {
		w.record(path[:n], line)
	}
	w.value(path, e.Value(), line)
}

// value records the keys of inline tables and the elements of arrays
// below path; line is where the value's key is written.
func (w *locator) value(path []string, v *unstable.Node, line int) {
	switch v.Kind {
	case unstable.InlineTable:
		it := v.Children()
		for it.Next() {
			w.keyValue(path, it.Node())
		}
	case unstable.Array:
		it := v.Children()
		for i := 0; it.Next(); i++ {
			sub := append(append([]string{}, path...), strconv.Itoa(i))
			l := w.firstLine(it.Node(), line)
			w.record(sub, l)
			w.value(sub, it.Node(), l)
		}
	}
}

// firstLine returns the line where a value starts, or def for an empty
// array.
func (w *locator) firstLine(v *unstable.Node, def int) int {
	if v.Raw.Length > 0 {
		return w.lineAt(v.Raw.Offset)
	}
	if c := v.Child(); c != nil {
		if v.Kind == unstable.KeyValue { // the key is after the value
			c = c.Next()
		}
		return w.firstLine(c, def)
	}
	return def
}
