package collide

import (
	"math"

	"clatter/shapes"
)

// What planeConvex works out again for every query of a part on a plane
// though it changes only with the shapes: the plane's half-space in the
// world (a static plane's frame never moves) and the hull's size for the
// tolerances (from its bounds, two square roots). Each is remembered with
// the inputs it came from, compared bit for bit, so a query gives the same
// numbers as one that works them out afresh.

// planeMemo is the last plane's world normal nw and offset dw: the plane is
// {x : nw.x <= dw}.
type planeMemo struct {
	key    [16]uint64 // the bits of the frame's rotation and position, the normal and the offset
	nw     vec3
	dw     float64
	ok, on bool // on: key holds a plane; ok: it has a normal
}

// get returns the world normal and offset of plane pl at frame f, and
// false for a plane of zero normal.
func (m *planeMemo) get(pl shapes.Plane, f frame) (vec3, float64, bool) {
	var key [16]uint64
	for i, x := range f.rot {
		key[i] = math.Float64bits(x)
	}
	for i := 0; i < 3; i++ {
		key[9+i] = math.Float64bits(f.pos[i])
		key[12+i] = math.Float64bits(pl.Normal[i])
	}
	key[15] = math.Float64bits(pl.Offset)
	if m.on && key == m.key {
		return m.nw, m.dw, m.ok
	}
	m.key, m.on = key, true
	m.nw, m.dw, m.ok = planeWorld(pl, f)
	return m.nw, m.dw, m.ok
}

// planeWorld is the plane's unit normal in the world and its offset along
// it, as planeConvex has always computed them.
func planeWorld(pl shapes.Plane, f frame) (vec3, float64, bool) {
	nw := mul(f.rot, pl.Normal)
	if l := nw.Len(); l > 0 && math.Abs(l-1) > 1e-12 {
		nw = nw.Mul(1 / l)
	} else if l == 0 {
		return nw, 0, false
	}
	return nw, nw.Dot(f.pos.Add(mul(f.rot, pl.Normal.Mul(pl.Offset)))), true
}

// view fills v for shape s at frame f, as v.setConvex does, taking a hull's
// size from the memo when it is the hull of the last query.
func (t *hullTop) view(v *view, s shapes.Shape, f frame) bool {
	h, isHull := s.(*shapes.Hull)
	if isHull && h != nil && h == t.sized && len(h.Vertices) > 0 {
		*v = view{rot: f.rot, pos: f.pos, kind: kHull, hull: h, size: t.size}
		return true
	}
	if !v.setConvex(s, f.rot, f.pos) {
		return false
	}
	if v.kind == kHull {
		t.sized, t.size = v.hull, v.size
	}
	return true
}
