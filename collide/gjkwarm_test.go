package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// Tolerances of the warm start against the cold one, relative to the sum
// of the shapes' sizes. Both runs of GJK stop when their bounds on the
// distance agree to gjkRelTol (1e-13) of the squared distance, or on
// rounding, so apart they agree to far below warmDistTol. Overlapping,
// EPA's face is final when the support point along its normal lies within
// epaCurvedTol (1e-7, on a cylinder; epaRelTol, 1e-10, on polytopes) of
// the length of the polytope's farthest point, which is at most twice the
// sum of the sizes for shapes that overlap; so each run's depth, and the
// overlap along its normal, is within 2e-7 of the sum of the sizes of the
// true depth, and two runs within twice that: warmDepthTol.
const (
	warmDistTol  = 1e-9
	warmDepthTol = 4e-7
	// warmNormalTol is the angle (rad) the normals of shapes apart may
	// differ by: the direction between the closest points, found to about
	// the square root of GJK's relative tolerance (3e-7) where the points
	// are unique, with a margin. Overlapping, the normal of least depth is
	// flat to first order in the depth (a few milliradians for a depth
	// within epaCurvedTol on the cylinders here), so there the test asks
	// instead that each normal's overlap be the depth, within warmDepthTol.
	warmNormalTol = 1e-5
)

// TestWarmGJKMatchesCold: GJK started from the pair's last simplex
// (gjkwarm.go) finds the same separation, normal and overlap as GJK and
// EPA from scratch, step after step, for boxes, cylinders and hulls
// moving through approach, contact and overlap at random poses; a second
// detector fed the same queries gives the same results bit for bit; and
// the warm start does answer those queries in fewer iterations.
func TestWarmGJKMatchesCold(t *testing.T) {
	rng := rand.New(rand.NewSource(53))
	ss := []shapes.Shape{
		shapes.Box{Half: vec3{0.05, 0.03, 0.02}},
		shapes.Cylinder{Radius: 0.03, HalfLength: 0.04},
		ellipsoidHull(t, rng, 40, vec3{0.05, 0.04, 0.03}),
		prismHull(t, 6, 0.04, 0.02),
		shapes.Cylinder{Radius: 0.01, HalfLength: 0.012},
	}
	// A pour moves a part up to a few millimetres and a hundredth of a
	// radian a step; the tracks here move B by 1 to 3 mm and turn both.
	const steps, dt = 120, 1e-3
	warm, again, cold := NewDetector(), NewDetector(), NewDetector()
	var queries, overlaps, apart, warmIters, coldIters int
	for i, a := range ss {
		for j, b := range ss {
			for k := 0; k < 6; k++ {
				dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
				pa := shapes.Pose{Position: vec3{rng.Float64(), rng.Float64(), rng.Float64()}, Orientation: randomRotation(rng)}
				pb := shapes.Pose{Position: pa.Position.Add(dir.Mul(0.08 + 0.04*rng.Float64())), Orientation: randomRotation(rng)}
				vel := dir.Mul(-1 - 2*rng.Float64())
				spinA := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(3)
				spinB := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(5)
				key := uint64(i*100 + j*10 + k)
				for s := 0; s < steps; s++ {
					fa, fb := poseFrame(pa), poseFrame(pb)
					rot, pos := fa.relative(fb)
					var va, vb view
					va.setConvex(a, identity3, vec3{})
					vb.setConvex(b, rot, pos)
					warm.warm.begin(key, a, b)
					// The iterations of GJK as distance runs it, from the same start.
					ws := warm.warm.s
					warmIters += warm.gjkFrom(&va, &vb, false, posInf, refinable(&va, &vb), &ws).iters
					coldIters += cold.gjkRefined(&va, &vb, false, posInf, refinable(&va, &vb)).iters
					rw, okW := warm.distance(&va, &vb, posInf)
					warm.warm.end()
					again.warm.begin(key, a, b)
					if r2, _ := again.distance(&va, &vb, posInf); r2 != rw {
						t.Fatalf("%T-%T track %d step %d: two detectors fed the same queries differ", a, b, k, s)
					}
					again.warm.end()
					again.warm.nextStep()
					rc, okC := cold.distance(&va, &vb, posInf)
					warm.warm.nextStep()
					queries++
					scale := va.size + vb.size
					if okW != okC {
						t.Fatalf("%T-%T track %d step %d: warm ok %v, cold ok %v", a, b, k, s, okW, okC)
					}
					tol := warmDistTol * scale
					if rc.sep < 0 {
						tol = warmDepthTol * scale
						overlaps++
					} else {
						apart++
					}
					if d := math.Abs(rw.sep - rc.sep); !(d <= tol) {
						t.Errorf("%T-%T track %d step %d: separation warm %.15g, cold %.15g (differ by %.3g, tolerance %.3g)", a, b, k, s, rw.sep, rc.sep, d, tol)
					}
					if rc.sep >= 0 {
						if ang := math.Acos(math.Min(1, rw.n.Dot(rc.n))); !(ang <= warmNormalTol) {
							t.Errorf("%T-%T track %d step %d (sep %.3g): normals %v and %v differ by %.3g rad", a, b, k, s, rc.sep, rw.n, rc.n, ang)
						}
					} else if d := overlapAlong(&va, &vb, rw.n) + rc.sep; !(math.Abs(d) <= tol) {
						t.Errorf("%T-%T track %d step %d: depth %.15g, overlap along the warm normal %.15g (%.3g, tolerance %.3g); along the cold one %.3g", a, b, k, s, -rc.sep, -rc.sep+d, d, tol, overlapAlong(&va, &vb, rc.n)+rc.sep)
					}
					pb.Position = pb.Position.Add(vel.Mul(dt))
					pb.Orientation = mgl64.QuatRotate(spinB.Len()*dt, spinB.Normalize()).Mul(pb.Orientation).Normalize()
					pa.Orientation = mgl64.QuatRotate(spinA.Len()*dt, spinA.Normalize()).Mul(pa.Orientation).Normalize()
				}
			}
		}
	}
	if overlaps < queries/5 || apart < queries/5 {
		t.Errorf("%d queries, %d overlapping, %d apart: the tracks do not cover both", queries, overlaps, apart)
	}
	// From last step's simplex GJK needs few iterations (measured: 8
	// percent of the cold start's here: overlapping pairs end at once, most
	// pairs near contact pass the stopping test on last step's features);
	// half is the least a warm start must save to be worth its memory.
	if 2*warmIters > coldIters {
		t.Errorf("warm start: %d GJK iterations, cold: %d", warmIters, coldIters)
	}
	t.Logf("%d queries (%d overlapping); GJK iterations warm %d, cold %d", queries, overlaps, warmIters, coldIters)
}

// overlapAlong is how far views a and b overlap along unit n (from a toward
// b): the extent of a along n less that of b's lowest point.
func overlapAlong(a, b *view, n vec3) float64 {
	return a.supportFull(n).Dot(n) - b.supportFull(n.Mul(-1)).Dot(n)
}
