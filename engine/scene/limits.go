package scene

import (
	"fmt"
	"io"
	"math"
	"os"
)

// Limits on what a scene may hold, checked before the work they would
// cost is done, so that a hostile or mistaken file is refused with a
// message instead of exhausting memory or hanging.
const (
	// MaxSceneBytes bounds a scene file: a hand-written scene is a few
	// kilobytes, and one made by a script with ten thousand bodies a few
	// megabytes.
	MaxSceneBytes = 16 << 20
	// MaxInputBytes bounds a file a scene reads (a mesh, a pose table): a
	// binary STL of ten million triangles is 500 MB.
	MaxInputBytes = 1 << 30
	// MaxNesting bounds the depth of arrays and inline tables: the deepest
	// a scene needs is about 5 (a compound's pieces, each with an
	// orientation and its axis), and a parser's work and memory grow with
	// it.
	MaxNesting = 32
	// MaxValues bounds the values (numbers, strings, keys) of a scene file,
	// counted before it is parsed: a million is more than any scene needs
	// and keeps the parsed document within a few hundred megabytes.
	MaxValues = 1000000
)

// Physical ranges of the quantities a scene holds, in SI. They are far
// beyond any part, mechanism or room, and far enough from the largest
// float64 (1.8e308) that squares, cubes and products of them (areas,
// volumes, masses, inertias, energies) stay finite.
var quantityRange = map[Dim]float64{
	Length:       1e6,  // m: 1000 km
	Mass:         1e9,  // kg: a million tonnes
	Density:      1e6,  // kg/m3: 40 times the densest element (osmium, 22.6 g/cm3)
	Speed:        1e5,  // m/s: 30 times the fastest projectile
	Acceleration: 1e7,  // m/s2: a million g
	AngularSpeed: 1e6,  // rad/s: ten million rpm
	Time:         1e9,  // s: 30 years of simulated time
	Angle:        1e9,  // rad: 160 million turns (a motor program's total angle)
	Frequency:    1e7,  // Hz: 10 MHz
	Force:        1e12, // N
	Impulse:      1e12, // N s
	Torque:       1e12, // N m
	Stiffness:    1e15, // N/m: stiffer than any contact of solids
	Pressure:     1e13, // Pa: 10 times diamond's modulus
}

// otherRange bounds quantities of other dimensions, and plain numbers
// (direction vectors, quaternions, coefficients): |x| <= 1e15 keeps their
// squares and sums of squares finite, so that normalising a direction
// never overflows to nothing.
const otherRange = 1e15

// maxFriction is the largest friction coefficient accepted. Measured
// kinetic and static coefficients of dry surfaces lie below about 5
// (soft rubber on glass, clean metals in vacuum); a coefficient of 10
// already holds every contact that can hold. 100 leaves room for that
// common way of saying "never slides".
const maxFriction = 100

// maxUnitPower bounds the power of each base unit in a unit expression:
// the quantities of a scene have powers of at most 3 (a density's length),
// and the powers are kept in small integers.
const maxUnitPower = 6

// powersInRange refuses a unit whose powers, once e is multiplied in
// (sign 1) or divided out (sign -1), would pass maxUnitPower.
func powersInRange(unit string, d, e Dim, sign int8) error {
	for _, p := range []struct {
		name string
		a, b int8
	}{{"length", d.L, e.L}, {"mass", d.M, e.M}, {"time", d.T, e.T}, {"angle", d.A, e.A}} {
		if n := int(p.a) + int(sign)*int(p.b); n > maxUnitPower || n < -maxUnitPower {
			return fmt.Errorf("unit %q raises %s to a power beyond %d; no quantity of a scene has such a unit", unit, p.name, maxUnitPower)
		}
	}
	return nil
}

// rangeOf returns the largest magnitude accepted for a quantity of d, SI.
func rangeOf(d Dim) float64 {
	if m, ok := quantityRange[d]; ok {
		return m
	}
	return otherRange
}

// inRange checks a quantity after conversion to SI: finite (a unit can
// overflow a finite number) and within its dimension's range.
func (r *reader) inRange(x float64, d Dim, path []string, what string) bool {
	lim := rangeOf(d)
	if math.Abs(x) <= lim {
		return true
	}
	unit := " " + siUnit(d)
	if d == Dimensionless {
		unit = ""
	}
	switch {
	case math.IsInf(x, 0) || math.IsNaN(x):
		r.errAt(path, "%s overflows: converted to SI it is beyond the largest number; check the value and its unit", what)
	case d == Dimensionless:
		r.errAt(path, "%s is %.3g, beyond the largest plain number clatter accepts here (%g in size)", what, x, lim)
	default:
		r.errAt(path, "%s is %.3g%s, beyond what clatter accepts for %s (at most %g%s in size); check the value and its unit", what, x, unit, d, lim, unit)
	}
	return false
}

// siUnit names the SI unit of d for messages ("m", "kg/m3", "SI units").
func siUnit(d Dim) string {
	switch d {
	case Angle:
		return "rad"
	case AngularSpeed:
		return "rad/s"
	}
	u, err := NewUnits("m", "kg")
	if err != nil {
		return "SI units"
	}
	if s := u.Symbol(d); s != "" {
		return s
	}
	return "SI units"
}

// ReadInput reads a file named by a user: only a regular file (a fifo
// named by mistake would block, a device never end), and only up to limit
// bytes, checked before reading and while reading (a file may grow).
func ReadInput(path string, limit int64) ([]byte, error) {
	if err := CheckRegular(path); err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadOpened(f, path, limit)
}

// ReadOpened is ReadInput for a file already opened. Opening a fifo
// for reading blocks until a writer comes, so callers that may meet one
// check the path first with CheckRegular (as ReadInput does).
func ReadOpened(f *os.File, path string, limit int64) ([]byte, error) {
	st, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !st.Mode().IsRegular() {
		return nil, notRegular(path, st.Mode())
	}
	if st.Size() > limit {
		return nil, fmt.Errorf("%s is %s, larger than the %s clatter reads", path, byteSize(st.Size()), byteSize(limit))
	}
	data, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > limit {
		return nil, fmt.Errorf("%s grew beyond the %s clatter reads while it was read", path, byteSize(limit))
	}
	return data, nil
}

// CheckRegular refuses a path that is not a regular file, without opening
// it (opening a fifo blocks).
func CheckRegular(path string) error {
	st, err := os.Stat(path)
	if err != nil {
		return err
	}
	if !st.Mode().IsRegular() {
		return notRegular(path, st.Mode())
	}
	return nil
}

func notRegular(path string, m os.FileMode) error {
	kind := "not a regular file"
	switch {
	case m.IsDir():
		kind = "a folder, not a file"
	case m&os.ModeNamedPipe != 0:
		kind = "a named pipe (fifo), not a regular file"
	case m&os.ModeDevice != 0 || m&os.ModeCharDevice != 0:
		kind = "a device, not a regular file"
	case m&os.ModeSocket != 0:
		kind = "a socket, not a regular file"
	}
	return fmt.Errorf("%s is %s; clatter reads only regular files", path, kind)
}

func byteSize(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.3g GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.3g MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.3g KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}

// checkShape scans a TOML document before it is parsed and refuses one
// nested deeper than MaxNesting or with more than MaxValues values,
// naming the line. It follows TOML's strings and comments, so brackets
// inside them do not count.
func checkShape(data []byte, name string) *Error {
	depth, values, line := 0, 0, 1
	for i := 0; i < len(data); i++ {
		switch c := data[i]; c {
		case '\n':
			line++
		case '#':
			for i < len(data) && data[i] != '\n' {
				i++
			}
			i--
		case '"', '\'':
			end, lines := skipString(data, i)
			i, line = end, line+lines
			values++
		case '[', '{':
			depth++
			if depth > MaxNesting {
				return &Error{File: name, Line: line, Msg: fmt.Sprintf("arrays and tables are nested more than %d deep; a scene needs at most a few levels", MaxNesting)}
			}
		case ']', '}':
			depth--
		case ',', '=':
			values++
			if values > MaxValues {
				return &Error{File: name, Line: line, Msg: fmt.Sprintf("the file holds more than %d values; split the scene or the study", MaxValues)}
			}
		}
	}
	return nil
}

// skipString returns the index of the last byte of the string that starts
// at data[i] (basic or literal, one-line or multi-line) and the line
// breaks inside it. An unterminated string runs to the end; the parser
// reports it.
func skipString(data []byte, i int) (end, lines int) {
	q := data[i]
	multi := i+2 < len(data) && data[i+1] == q && data[i+2] == q
	j := i + 1
	if multi {
		j = i + 3
	}
	for ; j < len(data); j++ {
		c := data[j]
		switch {
		case c == '\\' && q == '"':
			if j+1 < len(data) && data[j+1] == '\n' {
				lines++
			}
			j++
		case c == '\n':
			lines++
			if !multi {
				return j - 1, lines - 1
			}
		case c == q && !multi:
			return j, lines
		case c == q && j+2 < len(data) && data[j+1] == q && data[j+2] == q:
			// A closing delimiter may be followed by up to two more quotes
			// that belong to the string.
			for j+3 < len(data) && data[j+3] == q {
				j++
			}
			return j + 2, lines
		}
	}
	return len(data) - 1, lines
}

// finiteProps refuses a body whose mass or inertia, computed from its
// shape and density or mass, is not a finite positive number with a finite
// inverse (the step divides by them): each input is within its range, but
// a product of extremes can still leave float64.
func (r *reader) finiteProps(b *Body, path []string, pre string) {
	p := b.Props
	ok := p.Mass > 0 && !math.IsInf(p.Mass, 0) && !math.IsInf(1/p.Mass, 0)
	for i := 0; i < 3 && ok; i++ {
		for j := 0; j < 3; j++ {
			ok = ok && !math.IsInf(p.Inertia.At(i, j), 0) && !math.IsNaN(p.Inertia.At(i, j))
		}
		ok = ok && p.Inertia.At(i, i) > 0 && !math.IsInf(1/p.Inertia.At(i, i), 0)
	}
	if !ok {
		r.errAt(path, "%sits mass (%g kg) or moments of inertia are beyond the range of numbers, or zero, for its size and density or mass; check their values and units", pre, p.Mass)
	}
}
