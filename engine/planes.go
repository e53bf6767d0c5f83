package engine

import (
	"math"
	"slices"

	"clatter/collide/broad"
	"clatter/shapes"
)

// Planes outside the sweep. A plane's bounds are infinite, so in the sweep
// it overlaps every box and becomes a candidate pair with every awake body
// (a bin of five walls and a thousand parts gave five thousand pairs a
// step, nearly all of them far apart). Planes are therefore kept out of the
// broad phase and met by a direct test instead: a body is a candidate for
// a plane when the lowest point of its bounds along the plane's normal
// (the support of the box in the direction -n, Ericson, "Real-Time
// Collision Detection", 2005, sec. 5.2.3) lies within the plane's margin.
// The bounds already carry the body's speculative margin, so a pair the
// test leaves out is one the narrow phase would have found empty.

// planeSet holds the bodies with unbounded shapes and the collision
// filter of every body (the broad phase keeps its own copy for the rest).
type planeSet struct {
	ids    []BodyID     // bodies with unbounded shapes, in id order
	filter [][2]uint32  // category and mask of every body, by id
	sap    [][2]int32   // scratch: the sweep's pairs
	found  [][2]int32   // scratch: the planes' pairs
	nd     []planeWorld // each plane's world normal and offset
	ndOK   bool         // nd holds the static planes where they are
}

// planeWorld is a plane in world coordinates: {x : n . x <= d}.
type planeWorld struct {
	n shapes.Vec3
	d float64
}

// planeTol, relative to the plane's offset plus the body's distance from
// the origin, is how far beyond the plane the bounds may lie and still make
// a pair: the narrow phase computes the same distance from the shape's
// vertices with rounding of about 1e-16 of those lengths, so a thousand
// times that keeps every pair it could find.
const planeTol = 1e-13

// unbounded reports whether a shape's bounds are infinite: a plane, not an
// empty shape (whose bounds are inverted, and which the broad phase refuses).
func unbounded(s shapes.Shape) bool {
	b := s.Bounds()
	for k := 0; k < 3; k++ {
		if b.Min[k] > b.Max[k] {
			return false
		}
	}
	return !finiteVec(b.Min) || !finiteVec(b.Max)
}

// addPlane records body id as a plane, outside the broad phase.
func (w *World) addPlane(id BodyID) {
	w.collision.planes.ids = append(w.collision.planes.ids, id)
}

// broadPairs returns in dst[:0] the candidate pairs of the awake bodies:
// the broad phase's, merged with those of the planes, all in the broad
// phase's order (smaller id first, sorted by first id and then second).
func (w *World) broadPairs(dst [][2]int32) [][2]int32 {
	c := &w.collision
	pl := &c.planes
	if len(pl.ids) == 0 {
		return c.bp.Pairs(dst[:0])
	}
	pl.sap = pl.sap[:0]
	if c.bp.Len() > 1 { // a single part over a floor has no pair to sweep for
		pl.sap = c.bp.Pairs(pl.sap)
	}
	pl.found = w.planePairs(pl.found[:0])
	return broad.MergePairs(dst[:0], pl.sap, pl.found)
}

// planePairs appends the pairs of a plane and a dynamic body whose bounds
// reach it, sorted. A static plane pairs with awake bodies only, a moving
// (kinematic) one with sleeping bodies too, as in the broad phase.
func (w *World) planePairs(dst [][2]int32) [][2]int32 {
	pl := &w.collision.planes
	if w.active.poseAll { // placed by hand since the poses were taken
		pl.ndOK = false
	}
	if len(pl.nd) != len(pl.ids) {
		pl.nd, pl.ndOK = append(pl.nd[:0], make([]planeWorld, len(pl.ids))...), false
	}
	// A static plane moves only when placed by hand (SetPose clears ndOK).
	for j, p := range pl.ids {
		if !pl.ndOK || w.b.kind[p] != Static {
			pl.nd[j] = w.planeInWorld(p)
		}
	}
	pl.ndOK = true
	// Plane by plane, so that the pairs come out sorted (a plane's id is
	// usually below those of the bodies it meets): visiting body by body
	// interleaved the planes and left a sort of a thousand pairs a step.
	for j, p := range pl.ids {
		if w.b.kind[p] == Static {
			for _, id := range w.awakeBodies() {
				if w.b.kind[id] == Dynamic {
					dst = w.meetPlane(dst, id, j)
				}
			}
			continue
		}
		for i, k := range w.b.kind { // a moving plane meets sleeping bodies too
			if k == Dynamic {
				dst = w.meetPlane(dst, BodyID(i), j)
			}
		}
	}
	// The pairs are sorted unless a plane was added after a body it pairs
	// with.
	if !slices.IsSortedFunc(dst, cmpPair) {
		slices.SortFunc(dst, cmpPair)
	}
	return dst
}

// meetPlane appends the pair of dynamic body i and plane j of pl.ids if
// their filters admit it and i's bounds reach the plane (pl.nd holds the
// planes in the world).
func (w *World) meetPlane(dst [][2]int32, i BodyID, j int) [][2]int32 {
	c := &w.collision
	pl := &c.planes
	p := pl.ids[j]
	f, g := pl.filter[i], pl.filter[p]
	if f[0]&g[1] == 0 || g[0]&f[1] == 0 {
		return dst
	}
	if boxReaches(&w.b.bounds[i], &pl.nd[j], c.margin[p]) {
		a, b := int32(p), int32(i)
		if a > b {
			a, b = b, a
		}
		dst = append(dst, [2]int32{a, b})
	}
	return dst
}

// planeInWorld returns plane body p's half-space in world coordinates,
// computed as the narrow phase computes it.
func (w *World) planeInWorld(p BodyID) planeWorld {
	pose := w.ShapePose(p)
	pl, ok := w.b.shape[p].(shapes.Plane)
	if !ok {
		if pp, isPtr := w.b.shape[p].(*shapes.Plane); isPtr && pp != nil {
			pl, ok = *pp, true
		}
	}
	if !ok {
		// An unbounded shape that is not a plane: every body is a candidate.
		return planeWorld{n: shapes.Vec3{}, d: math.Inf(1)}
	}
	q := pose.Orientation
	n := qrotate(&q, &pl.Normal)
	if l := n.Len(); l > 0 {
		n = n.Mul(1 / l)
	}
	o := pl.Normal.Mul(pl.Offset)
	return planeWorld{n: n, d: n.Dot(pose.Position.Add(qrotate(&q, &o)))}
}

// boxReaches reports whether the lowest point of box along the plane's
// normal lies within margin (plus rounding) of the plane or below it.
func boxReaches(box *shapes.AABB, pw *planeWorld, margin float64) bool {
	n := &pw.n
	low := 0.0
	for k := 0; k < 3; k++ {
		if n[k] >= 0 {
			low += n[k] * box.Min[k]
		} else {
			low += n[k] * box.Max[k]
		}
	}
	tol := planeTol * (math.Abs(pw.d) + math.Abs(box.Min[0]) + math.Abs(box.Min[1]) + math.Abs(box.Min[2]) +
		math.Abs(box.Max[0]) + math.Abs(box.Max[1]) + math.Abs(box.Max[2]))
	return !(low-pw.d > margin+tol) // NaN: keep the pair, the narrow phase decides
}

func cmpPair(a, b [2]int32) int {
	if a[0] != b[0] {
		return int(a[0]) - int(b[0])
	}
	return int(a[1]) - int(b[1])
}
