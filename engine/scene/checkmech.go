package scene

import (
	"math"
	"strconv"

	"clatter/engine"
	"clatter/shapes"
)

// Steps per period of the fastest vibration term below which a run is
// refused (the drive's motion is aliased: the track jumps rather than
// vibrates) and warned of (the stroke is resolved too coarsely for the
// hops it makes).
const (
	vibrationStepsRefuse = 4
	vibrationStepsWarn   = 20
)

// mechBounds is what joints and drives do to the speeds that the step
// check assumes: bodies held by joints to something fixed fall no farther
// than their assembly reaches, motors and drives push them.
type mechBounds struct {
	// drop is the largest height a held body can fall (absent: unheld).
	drop map[string]float64
	// motor is the largest surface speed a body's joint motors give it.
	motor map[string]float64
	// push is the largest surface speed of any drive or conveyor, which a
	// part that it touches can reach.
	push float64
}

// mechanismBounds works out the mechBounds of the scene.
func (s *Scene) mechanismBounds() mechBounds {
	mb := mechBounds{drop: map[string]float64{}, motor: map[string]float64{}}
	n := len(s.Bodies)
	find, index := s.assemblies()
	// The reach of each held group: the diagonal of the box around its
	// bodies and anchors.
	boxes := map[int]shapes.AABB{}
	grow := func(g int, bb shapes.AABB) {
		if old, ok := boxes[g]; ok {
			bb = old.Union(bb)
		}
		boxes[g] = bb
	}
	for i, b := range s.Bodies {
		if b.Static || find(i) != find(n) {
			continue
		}
		grow(find(i), s.worldBounds(i))
	}
	for _, j := range s.Joints {
		g := find(index(j.A))
		if g != find(n) {
			continue
		}
		for _, p := range []shapes.Vec3{j.Def.Anchor, j.Def.AnchorB} {
			grow(g, shapes.AABB{Min: p, Max: p})
		}
	}
	reach := 0.0
	if bb, ok := boxes[find(n)]; ok {
		reach = bb.Size().Len()
	}
	for i, b := range s.Bodies {
		if !b.Static && find(i) == find(n) {
			mb.drop[b.Name] = 2 * reach
		}
	}
	for _, j := range s.Joints {
		speed := math.Abs(j.Def.Motor.Speed)
		for _, c := range j.Program {
			speed = math.Max(speed, math.Abs(c.Motor.Speed))
		}
		if j.Kind == engine.Revolute {
			speed *= math.Max(reach, s.worldBounds(s.BodyIndex(j.A)).Size().Len())
		}
		for i, b := range s.Bodies {
			if !b.Static && (find(i) == find(index(j.A)) || b.Name == j.A) {
				mb.motor[b.Name] += speed
			}
		}
	}
	for _, d := range s.Drives {
		mb.push = math.Max(mb.push, s.driveSpeed(d))
	}
	return mb
}

// driveSpeed bounds the surface speed of a drive's body.
func (s *Scene) driveSpeed(d Drive) float64 {
	i := s.BodyIndex(d.Body)
	radius := s.worldBounds(i).Size().Len() / 2
	pos := s.Bodies[i].Position
	v := d.Conveyor.Len()
	switch m := d.Motion.(type) {
	case *engine.Vibration:
		for _, o := range m.Terms {
			w := 2 * math.Pi * o.Frequency
			if o.Rotary {
				v += o.Amplitude * w * (radius + m.Center.Sub(pos).Len())
			} else {
				v += o.Amplitude * w
			}
		}
	case *engine.Tilt:
		v += m.Rate * (radius + m.Point.Sub(pos).Len())
	case *engine.PoseTable:
		// A scene's table turns the body about its own origin: no point
		// of it is farther from there than arm.
		bb := s.worldBounds(i)
		arm := radius + bb.Min.Add(bb.Max).Mul(0.5).Sub(pos).Len()
		for k := 1; k < len(m.Times); k++ {
			dt := m.Times[k] - m.Times[k-1]
			a, b := m.Poses[k-1], m.Poses[k]
			turn := 2 * math.Acos(math.Min(1, math.Abs(a.Orientation.Dot(b.Orientation))))
			v = math.Max(v, (b.Position.Sub(a.Position).Len()+turn*arm)/dt)
		}
	}
	return v
}

// assemblies groups the bodies joined by joints: find returns the group
// of a body's index, and index the index of a body by name, n (the
// world's) for the world and for static and driven bodies, which hold
// like the world (a union-find over the bodies).
func (s *Scene) assemblies() (find func(int) int, index func(string) int) {
	n := len(s.Bodies)
	parent := make([]int, n+1)
	for i := range parent {
		parent[i] = i
	}
	find = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	index = func(name string) int {
		if name == "" {
			return n
		}
		if i := s.BodyIndex(name); i >= 0 && s.Bodies[i].Static {
			return n
		}
		return s.BodyIndex(name)
	}
	for _, j := range s.Joints {
		a, b := find(index(j.A)), find(index(j.B))
		if a != b {
			parent[a] = b
		}
	}
	return find, index
}

// worldBounds is the box around body i at its starting pose.
func (s *Scene) worldBounds(i int) shapes.AABB {
	b := s.Bodies[i]
	bb := b.Shape.Bounds()
	if !finite(bb.Min) || !finite(bb.Max) {
		return shapes.AABB{Min: b.Position, Max: b.Position}
	}
	return bb.Transform(shapes.Pose{Position: b.Position, Orientation: b.Orientation})
}

// checkVibration refuses and warns of steps too coarse for the drives'
// vibrations.
func (r *reader) checkVibration() {
	step := r.s.World.Step
	for i, d := range r.s.Drives {
		m, ok := d.Motion.(*engine.Vibration)
		if !ok {
			continue
		}
		for k, o := range m.Terms {
			if o.Frequency <= 0 {
				continue
			}
			per := 1 / (o.Frequency * step)
			path := []string{"drive", strconv.Itoa(i), "vibration", strconv.Itoa(k), "frequency"}
			fix := roundDown(1 / (vibrationStepsWarn * o.Frequency))
			switch {
			case per < vibrationStepsRefuse:
				r.errAt(path, "drive of %q: the %g Hz vibration gets only %.3g steps of %g s per period, too few to follow it; use a step of at most %s s", d.Body, o.Frequency, per, step, fix)
			case per < vibrationStepsWarn:
				r.warnAt(path, "drive of %q: the %g Hz vibration gets only %.3g steps of %g s per period; the parts' hops are resolved coarsely, a step of %s s is safer", d.Body, o.Frequency, per, step, fix)
			}
		}
	}
}
