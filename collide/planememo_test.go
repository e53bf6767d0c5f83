package collide

import (
	"math/rand"
	"reflect"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// TestPlaneMemoMatchesFresh: the remembered plane and hull size give the
// very manifolds of a detector that works them out afresh (the reference:
// planeConvex as it was), while the queries alternate between two planes
// (a floor and a tilted, offset one) and two hulls of different sizes, so
// that a memo answering for the wrong plane or hull would show.
func TestPlaneMemoMatchesFresh(t *testing.T) {
	rng := rand.New(rand.NewSource(5))
	hulls := []*shapes.Hull{
		ellipsoidHull(t, rng, 40, vec3{0.015, 0.012, 0.008}),
		ellipsoidHull(t, rng, 40, vec3{0.15, 0.12, 0.08}),
	}
	planes := []struct {
		pl   shapes.Plane
		pose shapes.Pose
	}{
		{shapes.Plane{Normal: vec3{0, 0, 1}}, shapes.Pose{Orientation: mgl64.QuatIdent()}},
		{shapes.Plane{Normal: vec3{0, 0, 1}, Offset: 0.01}, shapes.Pose{Position: vec3{0, 0, 0.002}, Orientation: mgl64.QuatRotate(0.2, vec3{1, 0, 0})}},
	}
	memo := NewDetector()
	for q := 0; q < 400; q++ {
		h, p := hulls[q%2], planes[(q/2)%2]
		// Resting on the plane or just above it, at a random tilt.
		rot := mgl64.QuatRotate(rng.Float64()*6.3, vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		n := p.pose.Orientation.Rotate(p.pl.Normal)
		on := p.pose.Position.Add(n.Mul(p.pl.Offset))
		low := h.Support(rot.Conjugate().Rotate(n.Mul(-1)))
		pos := on.Sub(rot.Rotate(low)).Add(n.Mul((rng.Float64() - 0.3) * 0.002))
		hp := shapes.Pose{Position: pos, Orientation: rot}
		got := memo.Collide(nil, p.pl, p.pose, h, hp, 0.001)
		want := NewDetector().Collide(nil, p.pl, p.pose, h, hp, 0.001)
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("query %d: remembered plane and size give %+v, afresh %+v", q, got, want)
		}
	}
	// The memo's size is the hull's own, whichever hull came before.
	var v, fresh view
	for _, h := range []*shapes.Hull{hulls[0], hulls[1], hulls[1], hulls[0]} {
		f := frame{rot: identity3}
		if !memo.capTop.view(&v, h, f) || !fresh.setConvex(h, f.rot, f.pos) || v.size != fresh.size {
			t.Fatalf("hull size %v, want %v", v.size, fresh.size)
		}
	}
}
