package mesh

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"clatter/units"

	"github.com/hschendel/stl"
)

// Unit is the length of one unit of a file's numbers, in metres.
type Unit float64

// Length units of STL files (sizes from package units).
const (
	Metre      Unit = units.Metre
	Centimetre Unit = units.Centimetre
	Millimetre Unit = units.Millimetre
	Inch       Unit = units.Inch
)

// ParseUnit reads a unit name: "m", "cm", "mm" or "in".
func ParseUnit(s string) (Unit, error) {
	if slices.Contains(units.FileLengths, s) {
		u, _ := units.Lookup(s)
		return Unit(u.SI), nil
	}
	return 0, fmt.Errorf("unknown length unit %q; use m, cm, mm or in", s)
}

// String returns the unit's name, or its length in metres for other units.
func (u Unit) String() string {
	for _, n := range units.FileLengths {
		if v, _ := units.Lookup(n); float64(u) == v.SI {
			return n
		}
	}
	return strconv.FormatFloat(float64(u), 'g', -1, 64) + " m"
}

// STL layout: an 80-byte header, a little-endian uint32 triangle count,
// then 50 bytes per triangle (normal, three corners, 2 attribute bytes).
const (
	binaryHeader   = 84
	binaryTriangle = 50
	// sniffSize is how much of the start is examined to tell ASCII from binary.
	sniffSize = 1024
)

// LoadSTL reads a binary or ASCII STL file whose numbers are in unit and
// welds it into a mesh in metres, named by path.
func LoadSTL(path string, unit Unit) (*Mesh, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadSTL(f, path, unit)
}

// ReadSTL reads a binary or ASCII STL from r, which must be positioned at
// its start; name identifies it in errors. Coordinates are multiplied by
// unit to give metres.
//
// The reader tells the formats apart as the file size demands: a binary file
// is exactly 84 + 50 n bytes for the n triangles its header counts. A file
// that is not, and does not begin with "solid" followed by text, is a damaged
// binary file, and the error says how (truncated, or a count that disagrees
// with the size).
func ReadSTL(r io.ReadSeeker, name string, unit Unit) (*Mesh, error) {
	if !(unit > 0) || math.IsInf(float64(unit), 0) {
		return nil, fmt.Errorf("%s: length unit must be positive, got %v", name, float64(unit))
	}
	size, err := r.Seek(0, io.SeekEnd)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if _, err := r.Seek(0, io.SeekStart); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if size == 0 {
		return nil, fmt.Errorf("%s: empty file", name)
	}
	start := make([]byte, min(size, sniffSize))
	if _, err := io.ReadFull(r, start); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if _, err := r.Seek(0, io.SeekStart); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}

	var soup soupWriter
	isBinary := size >= binaryHeader && uint64(binary.LittleEndian.Uint32(start[80:84]))*binaryTriangle+binaryHeader == uint64(size)
	switch {
	case isBinary:
		n := binary.LittleEndian.Uint32(start[80:84])
		if n == 0 {
			return nil, fmt.Errorf("%s: no triangles (a binary STL whose header counts 0)", name)
		}
		if uint64(n)*3 > maxCorners {
			return nil, fmt.Errorf("%s: %d triangles are more than a mesh can index", name, n)
		}
		soup.limit = int(n)
		if err := stl.CopyAll(r, &soup); err != nil {
			return nil, fmt.Errorf("%s: binary STL: %v", name, err)
		}
	case asciiStart(start) >= 0:
		src := r
		if k := asciiStart(start); k > 0 || !bytes.HasPrefix(start, []byte("solid ")) {
			// The library wants the first line to begin with exactly
			// "solid "; present a bare "solid", a byte-order mark or
			// leading blanks to it as that.
			if k += len("solid"); k < len(start) && start[k] == ' ' {
				k++
			}
			src = &splicedReader{head: []byte("solid "), r: r, tailStart: int64(k), tailSize: size - int64(k), seek: true}
		}
		if err := stl.CopyAll(src, &soup); err != nil {
			return nil, asciiError(name, err)
		}
		// The library stops at the first "endsolid"; a file with several
		// solids (one per body, as some exporters write) would lose the rest.
		if n, err := countWord(r, "endsolid"); err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		} else if n > 1 {
			return nil, fmt.Errorf("%s: ASCII STL holds %d solids; only one per file can be read, so export each body to its own file", name, n)
		}
		if soup.err == nil && len(soup.coords) == 0 {
			return nil, fmt.Errorf("%s: no triangles (an ASCII STL without facets)", name)
		}
	default:
		return nil, binarySizeError(name, size, start)
	}
	if soup.err != nil {
		return nil, fmt.Errorf("%s: %v", name, soup.err)
	}
	return build(name, soup.coords, float64(unit), nil)
}

// binarySizeError explains why a file that is not ASCII is not a valid
// binary STL either: its size does not match its triangle count.
func binarySizeError(name string, size int64, start []byte) error {
	if size < binaryHeader {
		return fmt.Errorf("%s: not an STL file: %d bytes is shorter than the 84-byte binary header, and it does not begin with \"solid\" as an ASCII STL does", name, size)
	}
	n := uint64(binary.LittleEndian.Uint32(start[80:84]))
	body := uint64(size) - binaryHeader
	whole, rest := body/binaryTriangle, body%binaryTriangle
	if need := n*binaryTriangle + binaryHeader; need > uint64(size) && rest != 0 {
		return fmt.Errorf("%s: truncated binary STL: the header counts %d triangles (%d bytes) but the file ends after %d bytes, inside triangle %d; export the part again", name, n, need, size, whole+1)
	}
	stray := ""
	if rest != 0 {
		stray = fmt.Sprintf(" and %d stray bytes", rest)
	}
	return fmt.Errorf("%s: binary STL: the triangle count in the header (%d) disagrees with the file size (%d bytes hold %d triangles%s); the file is damaged or its exporter wrote a wrong count", name, n, size, whole, stray)
}

// asciiStart returns the offset of the "solid" keyword that begins an ASCII
// STL, after an optional UTF-8 byte-order mark and blanks, or -1 when start
// is not the beginning of one: the keyword must be followed by white space
// or the end, and the text must hold no control characters (binary files,
// even those whose header begins with "solid", have zero bytes early on).
func asciiStart(start []byte) int {
	k := 0
	if bytes.HasPrefix(start, []byte("\xef\xbb\xbf")) {
		k = 3
	}
	for k < len(start) && (start[k] == ' ' || start[k] == '\t') {
		k++
	}
	if !bytes.HasPrefix(start[k:], []byte("solid")) {
		return -1
	}
	if e := k + len("solid"); e < len(start) && !isSpace(start[e]) {
		return -1
	}
	for _, c := range start {
		if (c < 0x20 && !isSpace(c)) || c == 0x7f {
			return -1
		}
	}
	return k
}

func isSpace(c byte) bool {
	return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\v' || c == '\f'
}

// asciiError rewords the library's parse report, a list of "line: message"
// entries, as one error at the first faulty line.
func asciiError(name string, err error) error {
	for _, l := range strings.Split(err.Error(), "\n") {
		line, msg, ok := strings.Cut(l, ": ")
		if _, perr := strconv.Atoi(line); !ok || perr != nil {
			continue
		}
		switch {
		case strings.Contains(msg, `"endsolid" expected`):
			msg = `ASCII STL ends without "endsolid" (cut short?)`
		case strings.Contains(msg, "parse float"):
			msg = "ASCII STL: a coordinate is not a number, or too large for a float32"
		default:
			msg = "ASCII STL: " + msg
		}
		return fmt.Errorf("%s:%s: %s", name, line, msg)
	}
	return fmt.Errorf("%s: ASCII STL: %s", name, strings.TrimSpace(err.Error()))
}

// countWord counts the occurrences of word in r from its start, reading in
// blocks that overlap by the word's length.
func countWord(r io.ReadSeeker, word string) (int, error) {
	if _, err := r.Seek(0, io.SeekStart); err != nil {
		return 0, err
	}
	w := []byte(word)
	buf := make([]byte, 1<<16)
	keep, count := 0, 0
	for {
		n, err := r.Read(buf[keep:])
		n += keep
		count += bytes.Count(buf[:n], w)
		if err == io.EOF {
			return count, nil
		}
		if err != nil {
			return 0, err
		}
		// Carry the tail that could begin an occurrence cut by the block end;
		// it is too short to hold a whole one, so nothing counts twice.
		keep = min(n, len(w)-1)
		copy(buf, buf[n-keep:n])
	}
}

// soupWriter receives the library's triangles as a stream and keeps their
// corners as float32, as STL stores them, for welding.
type soupWriter struct {
	coords []float32
	limit  int // triangles announced by a binary header, 0 if unknown
	facets int
	err    error // the first facet with a coordinate that is not finite
}

func (w *soupWriter) SetName(string)         {}
func (w *soupWriter) SetBinaryHeader([]byte) {}
func (w *soupWriter) SetASCII(bool)          {}

// SetTriangleCount preallocates for binary files, whose count was checked
// against the file size before reading.
func (w *soupWriter) SetTriangleCount(n uint32) {
	if int(n) == w.limit {
		w.coords = make([]float32, 0, 9*int(n))
	}
}

func (w *soupWriter) AppendTriangle(t stl.Triangle) {
	w.facets++
	if w.err != nil {
		return
	}
	if 3*w.facets > maxCorners {
		w.err = fmt.Errorf("more than %d triangles are more than a mesh can index", maxCorners/3)
		return
	}
	for k, v := range t.Vertices {
		for _, c := range v {
			if math.IsNaN(float64(c)) || math.IsInf(float64(c), 0) {
				w.err = fmt.Errorf("facet %d: corner %d is not a finite number (%v %v %v)", w.facets, k+1, v[0], v[1], v[2])
				return
			}
		}
		w.coords = append(w.coords, v[0], v[1], v[2])
	}
}

// splicedReader presents head followed by the bytes of r from tailStart on
// as one seekable stream.
type splicedReader struct {
	head      []byte
	r         io.ReadSeeker
	tailStart int64
	tailSize  int64
	off       int64
	seek      bool // r must be repositioned before the next read
}

func (s *splicedReader) Read(p []byte) (int, error) {
	n := 0
	if h := int64(len(s.head)); s.off < h {
		n = copy(p, s.head[s.off:])
		s.off += int64(n)
		p = p[n:]
	}
	if len(p) == 0 {
		return n, nil
	}
	if s.seek {
		if _, err := s.r.Seek(s.tailStart+s.off-int64(len(s.head)), io.SeekStart); err != nil {
			return n, err
		}
		s.seek = false
	}
	m, err := s.r.Read(p)
	s.off += int64(m)
	if n > 0 && err == io.EOF {
		err = nil
	}
	return n + m, err
}

func (s *splicedReader) Seek(offset int64, whence int) (int64, error) {
	switch whence {
	case io.SeekStart:
	case io.SeekCurrent:
		offset += s.off
	case io.SeekEnd:
		offset += int64(len(s.head)) + s.tailSize
	default:
		return s.off, errors.New("mesh: bad whence")
	}
	if offset < 0 {
		return s.off, errors.New("mesh: seek before start")
	}
	s.off, s.seek = offset, true
	return offset, nil
}
