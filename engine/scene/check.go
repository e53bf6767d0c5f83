package scene

import (
	"fmt"
	"math"

	"clatter/engine"
	"clatter/shapes"
)

// Limits on the time step relative to the scene's sizes and speeds. The
// solver resolves contact once per step, with speculative contacts that
// reach as far as a body can move in the step, so a fast part stops at a
// thin plate or another part instead of passing through it: cubes of 2 to
// 10 mm dropped 0.3 m at 1/60 and 1/30 s, moving up to 40 times their size
// in a step, all come to rest face down on a 1 mm plate (engine
// TestSmallPartsAtCoarseSteps). Its impacts are resolved coarsely, though,
// and a spinning part's corners turn through what the speculative contacts
// of one pose foresee; a step that moves a part many times its size is
// refused. Gravity's own motion in one step, g step^2, is no limit: resting
// contact holds parts far smaller than it (cubes of 2 mm at 1/30 s, where
// g step^2 is 11 mm: engine TestSmallPartsAtCoarseSteps).
const (
	// travelRefuse and travelWarn: the largest travel in one step, as a
	// multiple of a body's smallest size, refused and warned of. The
	// refusal is a quarter of the 40 sizes the tests above hold.
	travelRefuse = 10.0
	travelWarn   = 1.0
	// slopSizeWarn: bodies thinner than this many times their contact slop
	// (engine.SlopOf: 0.2 mm, or 1 percent of a small part's radius) rest
	// visibly sunk into their supports.
	slopSizeWarn = 5
	// manySteps warns of a run that will take long.
	manySteps = 2e6
)

// stepCheck is what checkStep knows of the scene as a whole.
type stepCheck struct {
	path      []string // of [world] step, or nil for the default step
	g         float64  // gravity, m/s2
	up        shapes.Vec3
	lowest    float64 // the lowest point of the static bodies, along up
	anyStatic bool
	kick      map[string]float64 // surface speed kicks give, by body
	mb        mechBounds
}

// checkStep refuses a step the solver cannot hold for the sizes and speeds
// of the scene, and warns of borderline ones.
func (r *reader) checkStep() {
	s := r.s
	w := s.World
	c := &stepCheck{path: []string{"world", "step"}, g: w.Gravity.Len(), up: shapes.Vec3{0, 0, 1}}
	if _, given := r.stepGiven(); !given {
		c.path = nil
	}
	if c.g > 0 {
		c.up = w.Gravity.Mul(-1 / c.g)
	}
	c.lowest, c.anyStatic = s.lowestStatic(c.up)
	c.kick = s.kickSpeeds()
	c.mb = s.mechanismBounds()
	r.checkVibration()
	for _, b := range s.Bodies {
		if !b.Static {
			r.checkBodyStep(c, b)
		}
	}
	if n := w.Duration / w.Step; n > manySteps {
		r.warnAt(c.path, "the run takes %.3g steps (duration %g s / step %g s); it may take a while", n, w.Duration, w.Step)
	}
}

// lowestStatic returns the lowest point of the static bodies along up,
// and whether there are any.
func (s *Scene) lowestStatic(up shapes.Vec3) (float64, bool) {
	lowest, anyStatic := math.Inf(1), false
	for _, b := range s.Bodies {
		if !b.Static {
			continue
		}
		anyStatic = true
		bb := b.Shape.Bounds()
		if _, plane := b.Shape.(shapes.Plane); plane || !finite(bb.Min) || !finite(bb.Max) {
			lowest = math.Min(lowest, up.Dot(b.Position))
			continue
		}
		pose := shapes.Pose{Position: b.Position, Orientation: b.Orientation}
		wb := bb.Transform(pose)
		for k := 0; k < 8; k++ {
			c := wb.Min
			for a := 0; a < 3; a++ {
				if k&(1<<a) != 0 {
					c[a] = wb.Max[a]
				}
			}
			lowest = math.Min(lowest, up.Dot(c))
		}
	}
	return lowest, anyStatic
}

// kickSpeeds bounds the surface speed the kicks give each body.
func (s *Scene) kickSpeeds() map[string]float64 {
	kickSpeed := map[string]float64{}
	for _, k := range s.Kicks {
		i := s.BodyIndex(k.Body)
		// A kick off the centre also spins the body; twice the translation
		// speed bounds the surface speed for ordinary parts.
		kickSpeed[k.Body] += 2 * k.Impulse.Len() / s.Bodies[i].Props.Mass
	}
	return kickSpeed
}

// topSpeed bounds the speed a point of moving body b can reach: its
// starting, kicked, drawn and driven speeds, and its fall.
func (s *Scene) topSpeed(c *stepCheck, b Body, radius float64) float64 {
	w, g := s.World, c.g
	top, extra := s.sweepReach(b.Name, radius)
	v0 := b.Velocity.Len() + b.Spin.Len()*radius + c.kick[b.Name] + extra + c.mb.motor[b.Name] + c.mb.push
	fall := g * w.Duration
	if c.anyStatic && g > 0 {
		// The fall is of the body's underside, not its centre: a part
		// resting on the floor falls nowhere.
		h := math.Max(0, math.Max(s.underside(b, c.up)-s.heightBelow(b, c.up), top)-c.lowest)
		fall = math.Min(fall, math.Sqrt(2*g*h))
	}
	if h, held := c.mb.drop[b.Name]; held {
		fall = math.Min(fall, math.Sqrt(2*g*h))
	}
	v := math.Sqrt(v0*v0 + fall*fall)
	if v0+g*w.Duration < v {
		v = v0 + g*w.Duration
	}
	return v
}

// checkBodyStep judges the step for one moving body.
func (r *reader) checkBodyStep(c *stepCheck, b Body) {
	s, w := r.s, r.s.World
	bb := b.Shape.Bounds()
	sz := bb.Size()
	size := math.Min(sz[0], math.Min(sz[1], sz[2]))
	v := s.topSpeed(c, b, sz.Len()/2)
	travel := v * w.Step
	fix := math.Inf(1)
	if v > 0 {
		fix = travelWarn * size / v
	}
	u := s.Units
	what := fmt.Sprintf("[world] step %g s", w.Step)
	if c.path == nil {
		what = fmt.Sprintf("the default step %g s", w.Step)
	}
	sizeText := fmt.Sprintf("%.3g %s", u.FromSI(size, Length), u.Length)
	switch {
	case travel > travelRefuse*size:
		r.errAt(r.pathOr(c.path, b), "%s is too large for body %q (smallest size %s): at the %.3g %s it can reach it would move %.3g %s in one step, more than %g times its own size; use a step of at most %s s",
			what, b.Name, sizeText, u.FromSI(v, Speed), u.Symbol(Speed), u.FromSI(travel, Length), u.Length, travelRefuse, roundDown(fix))
	case travel > travelWarn*size:
		r.warnAt(r.pathOr(c.path, b), "%s is coarse for body %q (smallest size %s, speeds up to %.3g %s, so up to %.3g %s in one step, more than its size): its impacts are resolved coarsely; a step of %s s is finer",
			what, b.Name, sizeText, u.FromSI(v, Speed), u.Symbol(Speed), u.FromSI(travel, Length), u.Length, roundDown(fix))
	}
	// The slop shrinks with a small part (engine.SlopOf) but not with a
	// thin one: a sheet keeps the slop of its breadth.
	if slop := engine.SlopOf(sz.Len() / 2); size < slopSizeWarn*slop {
		r.warnAt(r.pathOr(nil, b), "body %q is only %s thick; the solver's contact slop of %.3g %s is a large part of it, so it will rest visibly sunk into its support", b.Name, sizeText, u.FromSI(slop, Length), u.Length)
	}
}

func (r *reader) stepGiven() (any, bool) {
	wm, ok := r.s.raw["world"].(map[string]any)
	if !ok {
		return nil, false
	}
	v, ok := wm["step"]
	return v, ok
}

// pathOr returns p, or the path of body b's section when p is nil.
func (r *reader) pathOr(p []string, b Body) []string {
	if p != nil {
		return p
	}
	for i := range r.s.Bodies {
		if r.s.Bodies[i].Name == b.Name {
			return []string{"body", fmt.Sprint(i)}
		}
	}
	return nil
}

// roundDown writes x rounded down to 1, 2 or 5 times a power of ten.
func roundDown(x float64) string {
	if !(x > 0) || math.IsInf(x, 0) {
		return fmt.Sprint(x)
	}
	p := math.Pow(10, math.Floor(math.Log10(x)))
	m := x / p
	switch {
	case m >= 5:
		m = 5
	case m >= 2:
		m = 2
	default:
		m = 1
	}
	return fmt.Sprintf("%g", m*p)
}

func finite(v shapes.Vec3) bool {
	for _, c := range v {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return false
		}
	}
	return true
}

// sweepReach returns the highest starting height that the [sweep] section
// can draw for a body (-Inf if none) and the largest speed its draws can
// add to its surface (velocity jitter and spin times radius), so that the
// step is checked for the fastest trial.
func (s *Scene) sweepReach(body string, radius float64) (top, extra float64) {
	top = math.Inf(-1)
	sw := s.Sweep
	if sw == nil {
		return top, 0
	}
	for _, h := range sw.Height {
		if h.Body == body {
			top = h.High
		}
	}
	for _, j := range sw.Jitter {
		if j.Body == body {
			top = math.Max(top, s.bodyUp(body)+j.Amount.Len())
		}
	}
	for _, sp := range sw.Spin {
		if sp.Body == body {
			extra += sp.High * radius
		}
	}
	for _, v := range sw.VelocityJitter {
		if v.Body == body {
			extra += v.Amount.Len()
		}
	}
	return top, extra
}

// bodyUp is the height of a body's position along the direction opposite
// gravity (z when there is no gravity).
func (s *Scene) bodyUp(body string) float64 {
	i := s.BodyIndex(body)
	if i < 0 {
		return math.Inf(-1)
	}
	up := shapes.Vec3{0, 0, 1}
	if g := s.World.Gravity.Len(); g > 0 {
		up = s.World.Gravity.Mul(-1 / g)
	}
	return up.Dot(s.Bodies[i].Position)
}

// heightBelow is the height, along up, taken by the moving bodies stacked
// under body b (those whose box of bounds overlaps b's across up and whose
// centre is lower): b cannot fall farther than onto them, so a body resting
// on a stack, such as the top box of a tower, is not judged by a fall from
// its whole height above the floor.
func (s *Scene) heightBelow(b Body, up shapes.Vec3) float64 {
	box := func(c Body) shapes.AABB {
		return c.Shape.Bounds().Transform(shapes.Pose{Position: c.Position, Orientation: c.Orientation})
	}
	// Two horizontal axes: any pair perpendicular to up.
	e1 := shapes.Vec3{1, 0, 0}
	if math.Abs(up[0]) > 0.9 {
		e1 = shapes.Vec3{0, 1, 0}
	}
	e1 = e1.Sub(up.Mul(e1.Dot(up))).Normalize()
	e2 := up.Cross(e1)
	span := func(bb shapes.AABB, d shapes.Vec3) (lo, hi float64) {
		c, h := bb.Min.Add(bb.Max).Mul(0.5), bb.Max.Sub(bb.Min).Mul(0.5)
		r := math.Abs(d[0])*h[0] + math.Abs(d[1])*h[1] + math.Abs(d[2])*h[2]
		return d.Dot(c) - r, d.Dot(c) + r
	}
	bb := box(b)
	if !finite(bb.Min) || !finite(bb.Max) {
		return 0
	}
	total := 0.0
	for _, c := range s.Bodies {
		if c.Static || c.Name == b.Name || up.Dot(c.Position) >= up.Dot(b.Position) {
			continue
		}
		cb := box(c)
		if !finite(cb.Min) || !finite(cb.Max) {
			continue
		}
		overlap := true
		for _, d := range [2]shapes.Vec3{e1, e2} {
			blo, bhi := span(bb, d)
			clo, chi := span(cb, d)
			if bhi <= clo || chi <= blo {
				overlap = false
			}
		}
		if overlap {
			lo, hi := span(cb, up)
			total += hi - lo
		}
	}
	return total
}

// underside is the height along up of the lowest point of b's bounds at
// its start pose (its centre's height for an unbounded shape).
func (s *Scene) underside(b Body, up shapes.Vec3) float64 {
	bb := b.Shape.Bounds()
	if !finite(bb.Min) || !finite(bb.Max) {
		return up.Dot(b.Position)
	}
	wb := bb.Transform(shapes.Pose{Position: b.Position, Orientation: b.Orientation})
	c, h := wb.Min.Add(wb.Max).Mul(0.5), wb.Max.Sub(wb.Min).Mul(0.5)
	return up.Dot(c) - (math.Abs(up[0])*h[0] + math.Abs(up[1])*h[1] + math.Abs(up[2])*h[2])
}
