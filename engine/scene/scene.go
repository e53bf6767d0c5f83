package scene

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"clatter/shapes"
	"clatter/shapes/mesh"

	"github.com/pelletier/go-toml/v2"
)

// Scene is a scene file read, checked and converted to SI units.
type Scene struct {
	// File is the scene's path as given, used in messages.
	File string
	// Units are the file's units; result writers convert back to them.
	Units Units
	// World is the [world] section.
	World Settings
	// Materials are sorted by name; Pairs, Bodies and Kicks are in file order.
	Materials []Material
	Pairs     []Pair
	Bodies    []Body
	Kicks     []Kick
	// Joints and Drives are in file order.
	Joints []Joint
	Drives []Drive
	// Gates are the counting gates, in file order (gate.go).
	Gates []Gate
	// Sweep is the study section, or nil when the scene has none.
	Sweep *Sweep
	// Drop is the [drop] section, or nil.
	Drop *Drop
	// Warnings are things that are allowed but doubtful, one sentence each,
	// with file and line.
	Warnings []string

	raw   map[string]any
	lines lineIndex
	opt   Options
	cache map[string][]byte // mesh files read, by resolved path
	// meshes holds the shapes made from mesh files, shared by the scenes
	// of With (meshcache.go).
	meshes map[meshKey]madeMesh
}

// Settings are the [world] section in SI: gravity, step, duration, rest
// and seed. (The world itself, with its bodies, is the engine.World that
// Build makes.)
type Settings struct {
	Gravity        shapes.Vec3
	Step, Duration float64
	// UntilSettled ends a run once every dynamic body has rested for RestTime.
	UntilSettled bool
	// RestSpeed (m/s), RestSpin (rad/s) and RestTime (s) define rest.
	RestSpeed, RestSpin, RestTime float64
	// Seed draws the random orientations.
	Seed uint64
}

// Material is one [material.NAME] section.
type Material struct {
	Name                                  string
	Friction, StaticFriction, Restitution float64
	Stiffness                             Compliance // stiffness.go; zero: rigid
	Line                                  int
}

// Pair is one [[pair]] section: coefficients for two materials, overriding
// the mixing rule. A nil coefficient keeps the mixed value.
type Pair struct {
	A, B                                  string
	Friction, StaticFriction, Restitution *float64
	Stiffness                             Compliance // stiffness.go; zero: the materials'
	Line                                  int
}

// Body is one [[body]] section, in SI.
type Body struct {
	Name string
	Line int
	// Static bodies are not moved by gravity or contact: they never move,
	// unless Driven, when they follow their [[drive]] (the engine's
	// kinematic bodies). Planes and triangle meshes are always static.
	Static, Driven bool
	// Kind is the shape key: "box", "sphere", "cylinder", "capsule",
	// "plane" or "mesh"; Triangles is set for a mesh kept as triangles.
	Kind      string
	Triangles bool
	Shape     shapes.Shape
	// MeshFile is the resolved path of a mesh's file.
	MeshFile string
	// Part is the mesh part of a mesh body kept as its convex hull.
	Part     *mesh.Part
	Material string
	// Density (kg/m^3) or Mass (kg) of a dynamic body: exactly one is set.
	Density, Mass float64
	// Props are the mass properties of a dynamic body, in the shape's frame.
	Props shapes.Mass
	// Position is the centre of mass of a dynamic body, the shape origin of
	// a static one; Orientation turns the shape's own axes.
	Position    shapes.Vec3
	Orientation shapes.Quat
	// RandomOrientation is set when the file says orientation = "random";
	// Orientation then holds the draw from World.Seed.
	RandomOrientation bool
	Velocity, Spin    shapes.Vec3
}

// kindName says how the body moves, for messages.
func (b *Body) kindName() string {
	switch {
	case b.Driven:
		return "driven"
	case b.Static:
		return "static"
	}
	return "dynamic"
}

// Kick is one [[kick]] section, in SI.
type Kick struct {
	Body    string
	Time    float64
	Impulse shapes.Vec3
	// At is the world point of application; AtCenter means the centre of mass.
	At       shapes.Vec3
	AtCenter bool
	Line     int
}

// Options tell Parse where mesh files are.
type Options struct {
	// Dir is the directory mesh paths are relative to (the scene file's).
	Dir string
	// FS, if set, is the file system mesh paths are read from (slash
	// paths, as for an embedded study); otherwise the operating system's.
	FS fs.FS
}

// Error is one problem in a scene file.
type Error struct {
	File string
	Line int
	Msg  string
	// Cause, if set, is the error behind Msg, for errors.As (for example
	// the *engine.OverlapError of bodies that start inside each other).
	Cause error
}

// Unwrap returns the error behind the message, if any.
func (e *Error) Unwrap() error { return e.Cause }

func (e *Error) Error() string {
	if e.Line <= 0 {
		return fmt.Sprintf("%s: %s", e.File, e.Msg)
	}
	return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
}

// Errors are all the problems found in a scene file, in line order.
type Errors []*Error

func (es Errors) Error() string {
	s := make([]string, len(es))
	for i, e := range es {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// ErrBadScene is wrapped by every error that Load and Parse return, so that
// callers can tell bad input from other failures with errors.Is.
var ErrBadScene = errors.New("bad scene")

func (es Errors) Is(target error) bool { return target == ErrBadScene }

// Unwrap returns the problems, so that errors.As finds their causes.
func (es Errors) Unwrap() []error {
	out := make([]error, len(es))
	for i, e := range es {
		out[i] = e
	}
	return out
}

// maxErrors is how many problems are reported at once; past it the rest
// are likely consequences of the first.
const maxErrors = 20

// Load reads a scene file from disk; mesh paths are relative to its folder.
func Load(file string) (*Scene, error) {
	data, err := ReadInput(file, MaxSceneBytes)
	if err != nil {
		return nil, Errors{{File: file, Line: 0, Msg: fmt.Sprintf("cannot read the scene: %v", unwrapPath(err))}}
	}
	return Parse(data, file, Options{Dir: filepath.Dir(file)})
}

func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// Parse reads a scene from data; name identifies it in messages.
func Parse(data []byte, name string, opt Options) (*Scene, error) {
	if len(data) > MaxSceneBytes {
		return nil, Errors{{File: name, Msg: fmt.Sprintf("the scene is %s, larger than the %s clatter reads", byteSize(int64(len(data))), byteSize(MaxSceneBytes))}}
	}
	if e := checkShape(data, name); e != nil {
		return nil, Errors{e}
	}
	var raw map[string]any
	if err := toml.Unmarshal(data, &raw); err != nil {
		var de *toml.DecodeError
		if errors.As(err, &de) {
			line, _ := de.Position()
			return nil, Errors{{File: name, Line: line, Msg: "not valid TOML: " + strings.TrimPrefix(de.Error(), "toml: ")}}
		}
		return nil, Errors{{File: name, Line: 1, Msg: "not valid TOML: " + err.Error()}}
	}
	doc := locate(data)
	arraysOfTables(raw, doc.tables)
	s := &Scene{File: name, raw: raw, lines: doc.lines, opt: opt, cache: map[string][]byte{}, meshes: map[meshKey]madeMesh{}}
	return s.read()
}

// With returns the scene with the numeric key at the dotted path set to v
// (a plain number in the file's units), re-read and checked: the way a
// study varies a key. Paths are those of [sweep.vary]: "world.step",
// "material.abs.friction", "body.cap.position.2", "kick.0.time".
func (s *Scene) With(key string, v float64) (*Scene, error) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil, Errors{{File: s.File, Line: 1, Msg: fmt.Sprintf("value for %q must be a finite number, got %g", key, v)}}
	}
	raw := deepCopy(s.raw).(map[string]any)
	if key == DropNumberKey {
		addDropNumber(raw)
	}
	p, err := resolveKey(raw, key)
	if err != nil {
		return nil, Errors{{File: s.File, Line: 1, Msg: err.Error()}}
	}
	p.set(v)
	n := &Scene{File: s.File, raw: raw, lines: s.lines, opt: s.opt, cache: s.cache, meshes: s.meshes}
	return n.read()
}

// arraysOfTables gives the arrays of tables of raw (at the paths of
// tables) the type []map[string]any, which tells them apart from arrays
// of values written inline.
func arraysOfTables(raw map[string]any, tables [][]string) {
	for _, p := range tables {
		var cur any = raw
		for _, k := range p[:len(p)-1] {
			switch t := cur.(type) {
			case map[string]any:
				cur = t[k]
			case []map[string]any:
				if i, err := strconv.Atoi(k); err == nil && i >= 0 && i < len(t) {
					cur = t[i]
				}
			}
		}
		m, ok := cur.(map[string]any)
		if !ok {
			continue
		}
		if a, ok := m[p[len(p)-1]].([]any); ok {
			list := make([]map[string]any, len(a))
			for i, x := range a {
				list[i], _ = x.(map[string]any)
			}
			m[p[len(p)-1]] = list
		}
	}
}

func deepCopy(v any) any {
	switch t := v.(type) {
	case map[string]any:
		m := make(map[string]any, len(t))
		for k, x := range t {
			m[k] = deepCopy(x)
		}
		return m
	case []map[string]any:
		a := make([]map[string]any, len(t))
		for i, x := range t {
			a[i] = deepCopy(x).(map[string]any)
		}
		return a
	case []any:
		a := make([]any, len(t))
		for i, x := range t {
			a[i] = deepCopy(x)
		}
		return a
	}
	return v
}

// readFile reads a mesh file named relative to the scene.
func (s *Scene) readFile(rel string) (string, []byte, error) {
	var p string
	if s.opt.FS != nil {
		p = path.Join(s.opt.Dir, filepath.ToSlash(rel))
	} else if filepath.IsAbs(rel) {
		p = rel
	} else {
		p = filepath.Join(s.opt.Dir, rel)
	}
	if d, ok := s.cache[p]; ok {
		return p, d, nil
	}
	var d []byte
	var err error
	if s.opt.FS != nil {
		d, err = fs.ReadFile(s.opt.FS, p)
	} else {
		d, err = ReadInput(p, MaxInputBytes)
	}
	if err != nil {
		return p, nil, err
	}
	s.cache[p] = d
	return p, d, nil
}

// MaterialIndex returns the index of a material in s.Materials, or -1.
func (s *Scene) MaterialIndex(name string) int {
	i := sort.Search(len(s.Materials), func(i int) bool { return s.Materials[i].Name >= name })
	if i < len(s.Materials) && s.Materials[i].Name == name {
		return i
	}
	return -1
}

// BodyIndex returns the index of a body in s.Bodies, or -1.
func (s *Scene) BodyIndex(name string) int {
	for i := range s.Bodies {
		if s.Bodies[i].Name == name {
			return i
		}
	}
	return -1
}
