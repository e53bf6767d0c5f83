package engine

import (
	"fmt"
	"math"

	"clatter/shapes"
)

// OverlapError reports bodies that are inside each other before the first
// step: bad input, not a simulation result. Left alone, the contact solver
// would push them apart with energy that no real part has.
type OverlapError struct {
	// Inner is the body to move (the moving one of the pair), Outer the one
	// it is inside; Depth (m) is how far, and Out the unit direction in which
	// moving Inner by Depth separates them.
	Inner, Outer         BodyID
	InnerName, OuterName string
	Depth                float64
	Out                  shapes.Vec3
	// Up is the unit direction against gravity (+z without gravity), to
	// word Out; Others counts further overlapping pairs.
	Up     shapes.Vec3
	Others int
}

func (e *OverlapError) Error() string {
	d := fmtLength(e.Depth)
	msg := fmt.Sprintf("body %q starts %s inside body %q; move it %s by at least %s", e.InnerName, d, e.OuterName, e.direction(), d)
	if e.Others > 0 {
		msg += fmt.Sprintf(" (%d more pairs of bodies also start inside each other)", e.Others)
	}
	return msg
}

// direction words Out: up or down when it is within a few degrees of the
// vertical, else as a vector.
func (e *OverlapError) direction() string {
	const vertical = 0.995 // cos 5.7 degrees
	switch c := e.Out.Dot(e.Up); {
	case c > vertical:
		return "up"
	case c < -vertical:
		return "down"
	}
	return fmt.Sprintf("along (%.3g, %.3g, %.3g)", e.Out[0], e.Out[1], e.Out[2])
}

// fmtLength writes a length in mm, rounded up to the 0.01 mm below 1 mm
// and to the 0.1 mm above, so that moving a body by the amount named is
// enough. The rounding up ignores the last bits of a binary fraction
// (12.3 mm is 0.012300000000000001 m).
func fmtLength(m float64) string {
	up := func(x float64) float64 { return math.Ceil(x * (1 - 1e-9)) }
	if m < 1e-3 {
		return fmt.Sprintf("%.2f mm", up(m*1e5)/100)
	}
	return fmt.Sprintf("%.1f mm", up(m*1e4)/10)
}

// CheckOverlaps reports, as an *OverlapError naming the deepest pair, the
// bodies that are inside each other by more than their contacts' slop (the
// sink that resting contact itself leaves, slop.go). Pairs that never collide (static or
// kinematic with each other, filtered out, joined by a joint) are not
// checked. Call it after the bodies are placed and before the first step.
func (w *World) CheckOverlaps() error {
	c := &w.collision
	for i, k := range w.b.kind {
		if k != Static {
			w.b.bounds[i] = w.worldBounds(BodyID(i), 0)
			_ = c.bp.Move(int32(i), w.b.bounds[i])
		}
	}
	var worst *OverlapError
	n := 0
	c.pairs = w.broadPairs(c.pairs)
	for _, p := range c.pairs {
		a, b := BodyID(p[0]), BodyID(p[1])
		if w.b.kind[a] != Dynamic && w.b.kind[b] != Dynamic || w.jointedApart(a, b) {
			continue
		}
		c.manifolds = c.det.Collide(c.manifolds[:0], w.b.shape[a], w.ShapePose(a), w.b.shape[b], w.ShapePose(b), 0)
		depth, normal := 0.0, shapes.Vec3{}
		for _, mf := range c.manifolds {
			for k := 0; k < mf.Count; k++ {
				if d := -mf.Points[k].Separation; d > depth {
					depth, normal = d, mf.Normal
				}
			}
		}
		if depth <= w.pairSlop(a, b) { // (slop.go)
			continue
		}
		n++
		if worst != nil && depth <= worst.Depth {
			continue
		}
		// Move the moving body: B along the normal (from A toward B), or
		// A against it when B cannot move.
		e := &OverlapError{Inner: b, Outer: a, Depth: depth, Out: normal}
		if w.b.kind[b] != Dynamic {
			e.Inner, e.Outer, e.Out = a, b, normal.Mul(-1)
		}
		worst = e
	}
	if worst == nil {
		return nil
	}
	worst.InnerName, worst.OuterName = w.b.name[worst.Inner], w.b.name[worst.Outer]
	worst.Others = n - 1
	worst.Up = shapes.Vec3{0, 0, 1}
	if g := w.cfg.Gravity; g.Len() > 0 {
		worst.Up = g.Mul(-1 / g.Len())
	}
	return worst
}
