package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// cradleGapTol: the final velocities against the sequence of pairwise
// impacts, as a fraction of the striking speed; the tolerance of
// TestNewtonsCradle (the requirement), which the order of the pairs within a
// pass moves by up to 1 percent for e < 1.
const cradleGapTol = 0.02

// cradleMomentumTol: momentum of free bodies under contact impulses alone
// is conserved to rounding.
const cradleMomentumTol = 1e-9

func TestCradleStrikerArrivesWithinStep(t *testing.T) {
	// Five equal balls touching in a row, struck by a sixth that arrives
	// part-way through a step. With e = 1 the striker stops and the last
	// ball leaves at the striking speed; with e < 1 the outcome is the
	// sequence of pairwise impacts, each by the 1D law of restitution for
	// equal masses (Guendelman, Bridson and Fedkiw, "Nonconvex rigid bodies
	// with stacking", SIGGRAPH 2003; any dynamics text for the pairwise law);
	// momentum is conserved exactly. Parts of 1 mm in steps of 1/60 s to
	// 0.1 ms, and of 0.4 m: the outcome must not depend on the step or the
	// scale.
	cases := []struct {
		name     string
		r, v, dt float64
	}{
		{"1 mm balls at 0.1 ms", 0.5e-3, 0.3, 1e-4},
		{"1 mm balls at 1 ms", 0.5e-3, 0.3, 1e-3},
		{"4 cm balls at 1 ms", 0.02, 1, 1e-3},
		{"4 cm balls at 1/60 s", 0.02, 1, 1.0 / 60},
		{"0.4 m balls at 1/120 s", 0.2, 3, 1.0 / 120},
		{"0.4 m balls at 0.1 ms", 0.2, 3, 1e-4},
	}
	const n = 6
	for _, c := range cases {
		for _, e := range []float64{1, 0.8} {
			w := newTestWorld(t, Config{NoSleep: true})
			mat, _ := w.AddMaterial(Material{Restitution: e})
			// The striker closes its gap 37 percent of the way into a step.
			gap := (10 + 0.37) * c.v * c.dt
			ids := make([]BodyID, n)
			for i := range ids {
				x, vel := 2*c.r*float64(i-1), shapes.Vec3{}
				if i == 0 {
					x, vel[0] = -2*c.r-gap, c.v
				}
				ids[i] = mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: c.r}, Density: 7800, Material: mat,
					Position: shapes.Vec3{x, 0, 0}, Velocity: vel})
			}
			run(t, w, c.dt, gap/c.v+200*c.dt, nil)
			want := pairwiseSequence(n, e, c.v)
			p := 0.0
			for i, id := range ids {
				got := w.Velocity(id)[0]
				p += got
				if math.Abs(got-want[i]) > cradleGapTol*c.v {
					t.Errorf("%s, e = %g: ball %d moves at %.4g m/s, want %.4g (all: %v)", c.name, e, i, got, want[i], velocitiesX(w, ids))
				}
			}
			if math.Abs(p-c.v) > cradleMomentumTol*c.v {
				t.Errorf("%s, e = %g: momentum %.12g m/s x m, want %g", c.name, e, p, c.v)
			}
		}
	}
}

// pairwiseSequence is the outcome of a striker at v hitting n-1 equal balls
// at rest: pairwise impacts of equal masses in order along the row,
// repeated until no pair approaches.
func pairwiseSequence(n int, e, v float64) []float64 {
	u := make([]float64, n)
	u[0] = v
	for pass := 0; pass < 1000; pass++ {
		hit := false
		for i := 0; i+1 < n; i++ {
			if a := u[i] - u[i+1]; a > 1e-12*v {
				mid := (u[i] + u[i+1]) / 2
				u[i], u[i+1] = mid-e*a/2, mid+e*a/2
				hit = true
			}
		}
		if !hit {
			break
		}
	}
	return u
}

func velocitiesX(w *World, ids []BodyID) []float64 {
	out := make([]float64, len(ids))
	for i, id := range ids {
		out[i] = w.Velocity(id)[0]
	}
	return out
}
