package engine

import (
	"fmt"
	"strings"

	"clatter/contact"
	"clatter/shapes"
)

// Jams. A dynamic body pressed by a driven body against something that does
// not give way (a fixed wall, another drive, a chain of parts ending at
// one) has no motion left that satisfies every contact: the drive keeps
// closing, the contacts cannot all hold, and any answer the solver gives
// (the part squeezed through a wall or shot out of the gap) is wrong. The
// world stops instead, naming the part and what holds it.

// jamDepthSlops: a driven contact predicted to end the step deeper than
// this many of its slops, and still closing, is a jam. Resting and pushed
// contacts stay within one slop (position correction holds them there); a
// drive that closes on a blocked part adds its own travel every step, so
// the depth passes five slops (1 mm at the default slop, 5 percent of the
// radius of a part under 2 cm, whose slop follows its size: slop.go)
// within a few steps.
const jamDepthSlops = 5

// JamError reports a body squeezed between a driven body and others that
// do not give way.
type JamError struct {
	Body  BodyID
	Name  string
	Time  float64
	By    []string // the driven body first, then the others pressing on it
	Depth float64  // m, how far the drive has pressed into it
}

func (e *JamError) Error() string {
	return fmt.Sprintf("body %q is jammed at t = %.6g s between %s: the drive has pressed %.3g mm into it and it has nowhere to go; "+
		"change the drive's motion so that it stops short of the part, or leave the part room to move",
		e.Name, e.Time, quoteList(e.By), e.Depth*1e3)
}

func quoteList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	if len(q) <= 1 {
		return strings.Join(q, "")
	}
	return strings.Join(q[:len(q)-1], ", ") + " and " + q[len(q)-1]
}

// checkJam looks for a driven contact that the solve could not hold, after
// the solve and before the positions are integrated.
func (w *World) checkJam(dt float64) error {
	c := &w.collision
	for i := range c.points {
		p := &c.points[i]
		a, b := BodyID(p.A), BodyID(p.B)
		var part, drive BodyID
		switch {
		case w.drives(a) && w.b.kind[b] == Dynamic:
			part, drive = b, a
		case w.drives(b) && w.b.kind[a] == Dynamic:
			part, drive = a, b
		default:
			continue
		}
		// Relative normal velocity of B from A, with the position pass's
		// pseudo-velocities, which move the bodies too.
		vpA, wpA := w.pseudoVelocity(a)
		vpB, wpB := w.pseudoVelocity(b)
		ra, rb := p.Position.Sub(w.b.pos[a]), p.Position.Sub(w.b.pos[b])
		va := w.b.vel[a].Add(vpA).Add(w.b.spin[a].Add(wpA).Cross(ra))
		vb := w.b.vel[b].Add(vpB).Add(w.b.spin[b].Add(wpB).Cross(rb))
		vn := vb.Sub(va).Dot(p.Normal)
		depth := -(p.Separation + vn*dt)
		if vn >= 0 || depth <= jamDepthSlops*w.pairSlop(part, drive) { // (slop.go)
			continue
		}
		// The others that jam it push back against the drive: their push
		// on the part has a component against the drive's (a floor that
		// only carries the part's weight does not count). Against a fixed
		// or driven body the part cannot give way, and five of its own
		// slops is a jam at any size. Against moving parts only, the
		// squeeze may pass as they give way: a block among fifty in a
		// vibrating bowl was squeezed 0.55 mm (a tenth of its radius)
		// between the bowl and another block and then went on (measured),
		// so there it takes the depth of five default slops, as before the
		// slop followed the part's size.
		push := pushOn(p, part)
		if !w.opposed(part, drive, push, nil) && depth <= jamDepthSlops*w.cfg.Slop {
			continue
		}
		by := []string{w.b.name[drive]}
		w.opposed(part, drive, push, func(other BodyID) {
			if !containsName(by, w.b.name[other]) {
				by = append(by, w.b.name[other])
			}
		})
		return &JamError{Body: part, Name: w.b.name[part], Time: w.time, By: by, Depth: depth}
	}
	return nil
}

// opposed calls each (if not nil) with every body other than drive whose
// contact with part presses it against push, the drive's push on it, in
// the order of the contacts, and reports whether one of them is not a
// moving part (fixed).
func (w *World) opposed(part, drive BodyID, push shapes.Vec3, each func(BodyID)) (fixed bool) {
	for j := range w.collision.points {
		q := &w.collision.points[j]
		if q.NormalImpulse+q.ImpactImpulse <= 0 || (BodyID(q.A) != part && BodyID(q.B) != part) {
			continue
		}
		other := BodyID(q.A)
		if other == part {
			other = BodyID(q.B)
		}
		if other == drive || pushOn(q, part).Dot(push) >= -jamOpposed {
			continue
		}
		fixed = fixed || w.b.kind[other] != Dynamic
		if each != nil {
			each(other)
		}
	}
	return fixed
}

// jamOpposed: a contact opposes the drive if the cosine between its push
// and the drive's is below minus this (about 84 degrees apart or more).
const jamOpposed = 0.1

// pushOn is the direction in which contact p pushes body part.
func pushOn(p *contact.Point, part BodyID) shapes.Vec3 {
	if BodyID(p.B) == part {
		return p.Normal
	}
	return p.Normal.Mul(-1)
}

func containsName(names []string, n string) bool {
	for _, m := range names {
		if m == n {
			return true
		}
	}
	return false
}
