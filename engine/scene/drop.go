package scene

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"clatter/engine/pack"
	"clatter/shapes"
)

// Drop is the [drop] section: a free-fall drop test of one body onto a
// static surface, in the face numbering of the drop-test standards (see
// package pack). Simulation informs the design of a package; it does not
// replace the drop tests the standards and carriers require.
type Drop struct {
	Body   string
	Strike pack.Feature
	// Height is the free fall of the body's lowest point to the surface
	// (m); ByMass says it was taken from the ISTA 1A table for the mass.
	Height float64
	ByMass bool
	// Onto is the static body struck; Up its surface's normal (world).
	Onto string
	Up   shapes.Vec3
	// Below is the face below the body at the start: the struck face, or
	// the bottom face 3 for an edge or corner drop.
	Below pack.Face
	Line  int
}

// DropNumberKey is the varied key of the ten-drop sequence: its value n
// (1 to 10) makes the case the n-th drop of pack.TenDrops.
const DropNumberKey = "drop.number"

// TenDrops is the only sequence [sweep] drops may name.
const TenDrops = "ten"

// dropKeys are the keys of [drop].
type dropKeys struct {
	Body   Text  `toml:"body"`
	Strike Text  `toml:"strike"`
	Height value `toml:"height"` // a length or "by mass"
	Onto   Text  `toml:"onto"`
	Number Whole `toml:"number"` // set by a study of the ten drops
}

func (r *reader) drop(root section) {
	sec, ok := r.table(root, "drop", "[drop]", "[drop] ")
	if !ok {
		r.noTenDrops(root)
		return
	}
	var k dropKeys
	r.decode(sec, &k)
	d := &Drop{Line: r.s.lines.line(sec.path)}
	name, okB := r.requiredText(sec, k.Body, "name the body to drop, e.g. body = \"carton\"")
	strike, okS := r.requiredText(sec, k.Strike, "name the face, edge or corner that strikes, e.g. strike = \"corner 2-3-5\" (faces: 1 top, 2 right side, 3 bottom, 4 left side, 5 near end, 6 far end)")
	if okS {
		ft, err := pack.ParseFeature(strike)
		if err != nil {
			r.errAt(k.Strike.path, "[drop] strike %v", err)
			okS = false
		}
		d.Strike = ft
	}
	bi := -1
	if okB {
		bi = r.droppedBody(name, k.Body.path)
	}
	d.Body = name
	onto := r.dropSurface(sec, k.Onto, d)
	if !k.Height.Given() {
		r.errAt(sec.path, "[drop] height is missing: give the free fall of the body's lowest point, e.g. height = \"760 mm\", or height = \"by mass\" for the ISTA 1A table")
		return
	}
	if bi < 0 || !okS || onto < 0 || r.n > 0 {
		return
	}
	b := &r.s.Bodies[bi]
	if !r.dropHeight(sec, k.Height, b, d) {
		return
	}
	if n, given := r.whole(sec, k.Number, 0); given {
		d.Strike = r.tenDropsStrike(k.Number.path, b, n, d.Strike)
	}
	r.dropConflicts(sec, b)
	if _, given := r.at([]string{"body", strconv.Itoa(bi), "orientation"}).(map[string]any); given {
		r.warnAt(sec.path, "[drop] sets the orientation of body %q: the one it gives (line %d) is not used", name, b.Line)
	}
	if r.n > 0 {
		return
	}
	if err := r.s.place(b, &r.s.Bodies[onto], d); err != nil {
		r.errAt(sec.path, "[drop] body %q: %v", name, err)
		return
	}
	r.s.Drop = d
	r.tenDrops(root)
}

// droppedBody returns the index of the body [drop] names, or -1 after
// saying why it cannot be dropped.
func (r *reader) droppedBody(name string, path []string) int {
	bi := r.bodyNamed(name, path, "[drop] ")
	if bi >= 0 && r.s.Bodies[bi].Static {
		r.errAt(path, "[drop] body %q is %s; only a body moved by gravity and contact can be dropped", name, r.s.Bodies[bi].kindName())
		return -1
	}
	if bi >= 0 && r.s.jointed(name) {
		r.errAt(path, "[drop] body %q is held by a joint; a drop test lets a body fall freely", name)
		return -1
	}
	return bi
}

// dropHeight reads the height of the drop: a length, or "by mass" for the
// ISTA 1A table's height for the body's mass.
func (r *reader) dropHeight(sec section, hv value, b *Body, d *Drop) bool {
	if s, isStr := hv.v.(string); isStr && strings.TrimSpace(s) == "by mass" {
		h, err := pack.HeightByMass(b.Props.Mass)
		if err != nil {
			r.errAt(hv.path, "[drop] height \"by mass\": %v", err)
			return false
		}
		d.Height, d.ByMass = h, true
	} else if isStr && strings.HasPrefix(strings.TrimSpace(s), "by") {
		r.errAt(hv.path, "[drop] height %q: write height = \"by mass\" for the ISTA 1A table's height, or a length such as \"760 mm\"", s)
		return false
	} else if h, ok := r.scalar(sec, Quantity{hv}, Length, 0); ok {
		if h < 0 {
			r.errAt(hv.path, "[drop] height must be >= 0, got %s", show(hv.v))
			return false
		}
		d.Height = h
	} else {
		return false
	}
	return true
}

// dropSurface finds the static plane struck: onto, or the only static
// plane of the scene. It returns its index, or -1 after reporting why.
func (r *reader) dropSurface(sec section, ontov Text, d *Drop) int {
	if name, given := r.text(sec, ontov); given {
		i := r.bodyNamed(name, ontov.path, "[drop] onto: ")
		if i < 0 {
			return -1
		}
		if _, plane := r.s.Bodies[i].Shape.(shapes.Plane); !plane || r.s.Bodies[i].Driven {
			r.errAt(ontov.path, "[drop] onto %q must be a static plane (shape = { plane = [0, 0, 1] }): the drop-test standards strike a flat, rigid surface", name)
			return -1
		}
		d.Onto = name
		return i
	}
	found := -1
	for i := range r.s.Bodies {
		if _, plane := r.s.Bodies[i].Shape.(shapes.Plane); plane && !r.s.Bodies[i].Driven {
			if found >= 0 {
				r.errAt(sec.path, "[drop] the scene has more than one static plane (%q, %q): name the one struck, e.g. onto = %q", r.s.Bodies[found].Name, r.s.Bodies[i].Name, r.s.Bodies[found].Name)
				return -1
			}
			found = i
		}
	}
	if found < 0 {
		r.errAt(sec.path, "[drop] the scene has no static plane to drop onto: add a floor, e.g. [[body]] name = \"floor\" shape = { plane = [0, 0, 1] }")
		return -1
	}
	d.Onto = r.s.Bodies[found].Name
	return found
}

// dropConflicts refuses keys that would undo the drop's starting state.
func (r *reader) dropConflicts(sec section, b *Body) {
	if b.Velocity != (shapes.Vec3{}) || b.Spin != (shapes.Vec3{}) {
		r.errAt(sec.path, "[drop] body %q has a velocity or spin: a drop starts at rest; remove them from the body (line %d)", b.Name, b.Line)
	}
	if sw := r.s.Sweep; sw != nil {
		for _, n := range sw.RandomOrientation {
			if n == b.Name {
				r.errAt(sec.path, "[drop] body %q also has a random orientation in [sweep.randomize]; a drop sets its orientation (vary drop.height, or use drops = \"ten\")", b.Name)
			}
		}
		for _, h := range sw.Height {
			if h.Body == b.Name {
				r.errAt(sec.path, "[drop] body %q also has a random height in [sweep.randomize]; vary drop.height instead", b.Name)
			}
		}
		for _, sp := range sw.Spin {
			if sp.Body == b.Name {
				r.errAt(sec.path, "[drop] body %q also has a random spin in [sweep.randomize]; a drop starts at rest", b.Name)
			}
		}
		for _, v := range sw.VelocityJitter {
			if v.Body == b.Name {
				r.errAt(sec.path, "[drop] body %q also has a random velocity in [sweep.randomize]; a drop starts at rest", b.Name)
			}
		}
		for _, j := range sw.Jitter {
			if j.Body == b.Name && j.Amount[2] != 0 {
				r.errAt(sec.path, "[drop] body %q also has a random position along z in [sweep.randomize]; that would change the drop height: jitter x and y only, and vary drop.height", b.Name)
			}
		}
	}
}

// place sets the dropped body's starting pose: at rest, the struck feature
// presented to the surface, the lowest point Height above it; its
// horizontal position is the body's position projected onto the surface.
func (s *Scene) place(b, floor *Body, d *Drop) error {
	pl := floor.Shape.(shapes.Plane)
	up := floor.Orientation.Rotate(pl.Normal).Normalize()
	g := s.World.Gravity
	if !(g.Len() > 0) || up.Dot(g.Normalize()) > -math.Cos(levelTol) {
		return fmt.Errorf("the surface %q must be level: its normal %v must point against gravity %v", floor.Name, up, g)
	}
	d.Up = up
	if len(d.Strike) == 1 {
		d.Below = d.Strike[0]
	} else {
		d.Below = 3
	}
	q, err := pack.DropOrientation(b.Shape.Bounds(), b.Props.Center, d.Strike, up)
	if err != nil {
		return err
	}
	low, ok := pack.Lowest(b.Shape, b.Props.Center, q, up)
	if !ok {
		return fmt.Errorf("its shape cannot be dropped")
	}
	surface := floor.Position.Add(floor.Orientation.Rotate(pl.Normal.Mul(pl.Offset)))
	p := b.Position.Sub(up.Mul(up.Dot(b.Position.Sub(surface))))
	b.Position = p.Add(up.Mul(d.Height + low))
	b.Orientation = q
	b.RandomOrientation = false
	return nil
}

// levelTol is how far (rad) the struck surface may be from level: a
// thousandth of a degree, rounding in a file's normal, not a slope.
const levelTol = 1e-3 * math.Pi / 180

// tenDrops reads [sweep] drops = "ten": the study's cases become the ten
// drops of the sequence, through the varied key drop.number.
func (r *reader) tenDrops(root section) {
	sw := r.s.Sweep
	v, ok := r.sweepDrops(root)
	if !ok || sw == nil {
		return
	}
	if v != TenDrops {
		r.errAt([]string{"sweep", "drops"}, "[sweep] drops must be %q (the ten-drop sequence), got %q", TenDrops, v)
		return
	}
	for _, vr := range sw.Vary {
		if vr.Key == DropNumberKey {
			r.errAt([]string{"sweep", "drops"}, "[sweep] drops = \"ten\" varies %s itself; remove its [[sweep.vary]] (line %d)", DropNumberKey, vr.Line)
			return
		}
	}
	seq := Vary{Key: DropNumberKey, Values: []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, Line: sw.Line}
	sw.Vary = append([]Vary{seq}, sw.Vary...)
	sw.Drops = TenDrops
}

// noTenDrops refuses drops = "ten" without a [drop] section.
func (r *reader) noTenDrops(root section) {
	if _, ok := r.sweepDrops(root); ok {
		r.errAt([]string{"sweep", "drops"}, "[sweep] drops needs a [drop] section naming the body, e.g. [drop] body = \"carton\" strike = \"corner 2-3-5\" height = \"by mass\"")
	}
}

func (r *reader) sweepDrops(root section) (string, bool) {
	sm, ok := root.m["sweep"].(map[string]any)
	if !ok {
		return "", false
	}
	v, ok := sm["drops"]
	if !ok {
		return "", false
	}
	s, isStr := v.(string)
	if !isStr {
		r.errAt([]string{"sweep", "drops"}, "[sweep] drops must be the string %q, got %s", TenDrops, show(v))
		return "", false
	}
	return s, true
}

// tenDropsStrike returns the n-th drop (1 to 10) of the ten-drop sequence
// for body b.
func (r *reader) tenDropsStrike(path []string, b *Body, n int64, def pack.Feature) pack.Feature {
	if n < 1 || n > 10 {
		r.errAt(path, "[drop] number must be 1 to 10 (a drop of the ten-drop sequence), got %d", n)
		return def
	}
	return pack.TenDrops(b.Shape.Bounds())[n-1]
}

// addDropNumber gives a document's [drop] a number key for a study to set.
func addDropNumber(raw map[string]any) {
	if d, ok := raw["drop"].(map[string]any); ok {
		if _, has := d["number"]; !has {
			d["number"] = int64(1)
		}
	}
}
