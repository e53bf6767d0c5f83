package scene

import (
	"strconv"
	"strings"
)

// lineIndex maps the path of every key, table and array element of a TOML
// document to the line where it is written, so that errors found after
// decoding can name their line. Paths are the keys from the root, with the
// index of each element of an array of tables or of an array value as a
// decimal segment: "body", "0", "shape", "box".
//
// The TOML decoder keeps key positions to itself, and keeps one per key
// name rather than per array element, so the index is built by a small
// scanner of its own. It runs only on documents the decoder has accepted,
// which keeps it simple; on anything it does not understand it stops and
// keeps what it has, and it never panics.
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

// indexLines builds the line index of a TOML document.
func indexLines(src string) (ix lineIndex) {
	ix = lineIndex{}
	defer func() {
		if recover() != nil {
			return // keep what was recorded
		}
	}()
	s := &lineScanner{src: src, line: 1, ix: ix, arrays: map[string]int{}}
	s.document()
	return ix
}

type lineScanner struct {
	src    string
	i      int
	line   int
	ix     lineIndex
	arrays map[string]int // resolved path of an array of tables -> elements so far
	steps  int            // guards against a loop that makes no progress
}

func (s *lineScanner) eof() bool { return s.i >= len(s.src) }

func (s *lineScanner) peek() byte {
	if s.eof() {
		return 0
	}
	return s.src[s.i]
}

func (s *lineScanner) advance() {
	if s.eof() {
		return
	}
	if s.src[s.i] == '\n' {
		s.line++
	}
	s.i++
}

func (s *lineScanner) record(path []string, line int) {
	k := pathKey(path)
	if _, ok := s.ix[k]; !ok {
		s.ix[k] = line
	}
}

// skipBlank skips spaces and tabs, and newlines and comments if nl.
func (s *lineScanner) skipBlank(nl bool) {
	for !s.eof() {
		switch c := s.peek(); {
		case c == ' ' || c == '\t' || c == '\r':
			s.advance()
		case c == '\n' && nl:
			s.advance()
		case c == '#':
			for !s.eof() && s.peek() != '\n' {
				s.advance()
			}
		default:
			return
		}
	}
}

func (s *lineScanner) document() {
	var table []string
	for !s.eof() {
		s.steps++
		if s.steps > len(s.src)+16 {
			return
		}
		s.skipBlank(true)
		if s.eof() {
			return
		}
		start := s.i
		line := s.line
		if s.peek() == '[' {
			s.advance()
			double := s.peek() == '['
			if double {
				s.advance()
			}
			s.skipBlank(false)
			keys := s.key()
			if keys == nil {
				return
			}
			s.skipBlank(false)
			for s.peek() == ']' {
				s.advance()
			}
			table = s.resolve(keys)
			if double {
				k := pathKey(table)
				n := s.arrays[k]
				s.arrays[k] = n + 1
				s.record(table, line)
				table = append(table, strconv.Itoa(n))
			}
			for n := 1; n <= len(table); n++ {
				s.record(table[:n], line)
			}
		} else {
			keys := s.key()
			if keys == nil {
				return
			}
			path := append(append([]string{}, table...), keys...)
			for n := len(table) + 1; n <= len(path); n++ {
				s.record(path[:n], line)
			}
			s.skipBlank(false)
			if s.peek() != '=' {
				return
			}
			s.advance()
			s.skipBlank(false)
			s.value(path)
		}
		if s.i == start {
			return
		}
	}
}

// resolve turns the keys of a table header into a path, adding the current
// element index after every prefix that names an array of tables.
func (s *lineScanner) resolve(keys []string) []string {
	var p []string
	for _, k := range keys {
		p = append(p, k)
		if n, ok := s.arrays[pathKey(p)]; ok && n > 0 {
			p = append(p, strconv.Itoa(n-1))
		}
	}
	// The header's own last key is not an element of itself.
	if len(p) > 0 && len(keys) > 0 && p[len(p)-1] != keys[len(keys)-1] {
		if _, ok := s.arrays[pathKey(p[:len(p)-1])]; ok {
			p = p[:len(p)-1]
		}
	}
	return p
}

// key reads a dotted key: bare or quoted parts joined by dots.
func (s *lineScanner) key() []string {
	var keys []string
	for {
		s.skipBlank(false)
		var k string
		switch c := s.peek(); {
		case c == '"' || c == '\'':
			k = s.str()
		case isBare(c):
			st := s.i
			for !s.eof() && isBare(s.peek()) {
				s.advance()
			}
			k = s.src[st:s.i]
		default:
			return nil
		}
		keys = append(keys, k)
		s.skipBlank(false)
		if s.peek() != '.' {
			return keys
		}
		s.advance()
	}
}

func isBare(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

// str reads a basic or literal string, single- or multi-line, and returns
// its content (escapes decoded where Go's rules agree with TOML's).
func (s *lineScanner) str() string {
	q := s.peek()
	multi := strings.HasPrefix(s.src[s.i:], strings.Repeat(string(q), 3))
	if multi {
		for k := 0; k < 3; k++ {
			s.advance()
		}
		st := s.i
		end := strings.Repeat(string(q), 3)
		for !s.eof() && !strings.HasPrefix(s.src[s.i:], end) {
			if q == '"' && s.peek() == '\\' {
				s.advance()
			}
			s.advance()
		}
		content := s.src[st:s.i]
		for k := 0; k < 3; k++ {
			s.advance()
		}
		for s.peek() == q { // up to two quotes may close the content
			s.advance()
		}
		return content
	}
	s.advance()
	st := s.i
	for !s.eof() && s.peek() != q && s.peek() != '\n' {
		if q == '"' && s.peek() == '\\' {
			s.advance()
		}
		s.advance()
	}
	raw := s.src[st:s.i]
	s.advance()
	if q == '"' {
		if u, err := strconv.Unquote(`"` + raw + `"`); err == nil {
			return u
		}
	}
	return raw
}

// value skips one value, recording the lines of the keys of inline tables
// and of the elements of arrays below path.
func (s *lineScanner) value(path []string) {
	switch c := s.peek(); {
	case c == '"' || c == '\'':
		s.str()
	case c == '{':
		s.advance()
		for !s.eof() {
			s.skipBlank(true)
			if s.peek() == '}' {
				s.advance()
				return
			}
			line := s.line
			keys := s.key()
			if keys == nil {
				return
			}
			sub := append(append([]string{}, path...), keys...)
			for n := len(path) + 1; n <= len(sub); n++ {
				s.record(sub[:n], line)
			}
			s.skipBlank(false)
			if s.peek() != '=' {
				return
			}
			s.advance()
			s.skipBlank(false)
			s.value(sub)
			s.skipBlank(true)
			if s.peek() == ',' {
				s.advance()
			}
		}
	case c == '[':
		s.advance()
		for n := 0; !s.eof(); n++ {
			s.skipBlank(true)
			if s.peek() == ']' {
				s.advance()
				return
			}
			sub := append(append([]string{}, path...), strconv.Itoa(n))
			s.record(sub, s.line)
			st := s.i
			s.value(sub)
			if s.i == st {
				return
			}
			s.skipBlank(true)
			if s.peek() == ',' {
				s.advance()
			}
		}
	default:
		st := s.i
		for !s.eof() && !strings.ContainsRune(",]}#\n", rune(s.peek())) {
			s.advance()
		}
		if s.i == st {
			s.advance()
		}
	}
}
