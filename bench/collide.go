package bench

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/go-gl/mathgl/mgl64"

	"clatter/collide"
	"clatter/shapes"
)

func init() {
	Register(
		Benchmark{Name: "CollideGJKHull40", Fn: CollideGJKHull40},
		Benchmark{Name: "CollideEPAHull40", Fn: CollideEPAHull40},
		Benchmark{Name: "CollideBoxBoxResting", Fn: CollideBoxBoxResting},
		Benchmark{Name: "CollideBoxBoxRandom", Fn: CollideBoxBoxRandom},
		Benchmark{Name: "CollideHullHullResting", Fn: CollideHullHullResting},
		Benchmark{Name: "CollideHullHullRandom", Fn: CollideHullHullRandom},
		Benchmark{Name: "CollideBoxHullRandom", Fn: CollideBoxHullRandom},
		Benchmark{Name: "CollidePairApart", Fn: CollidePairApart},
		Benchmark{Name: "CollideBoxPlane", Fn: CollideBoxPlane},
		Benchmark{Name: "CollideCylinderBox", Fn: CollideCylinderBox},
		Benchmark{Name: "CollideBoxMesh", Fn: CollideBoxMesh},
		Benchmark{Name: "CollideCylinderMesh", Fn: CollideCylinderMesh},
	)
}

// collidePoses is the number of precomputed poses each benchmark cycles
// through, so that branch predictors and caches see varied inputs.
const collidePoses = 256

// sphereHull is the hull of n points drawn uniformly on a sphere of radius
// r (every point is a vertex).
func sphereHull(b *testing.B, rng *rand.Rand, n int, r float64) *shapes.Hull {
	pts := make([]shapes.Vec3, n)
	for i := range pts {
		v := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		pts[i] = v.Normalize().Mul(r)
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		b.Fatal(err)
	}
	return h
}

// randomQuat is uniform on SO(3) (Shoemake, Graphics Gems III, 1992).
func randomQuat(rng *rand.Rand) shapes.Quat {
	u1, u2, u3 := rng.Float64(), rng.Float64(), rng.Float64()
	a, c := math.Sqrt(1-u1), math.Sqrt(u1)
	return shapes.Quat{W: c * math.Cos(2*math.Pi*u3), V: shapes.Vec3{a * math.Sin(2*math.Pi*u2), a * math.Cos(2*math.Pi*u2), c * math.Sin(2*math.Pi*u3)}}
}

// pairPoses returns poses of B around A at distances drawn from [lo, hi]
// between centres, randomly turned.
func pairPoses(rng *rand.Rand, lo, hi float64) []shapes.Pose {
	out := make([]shapes.Pose, collidePoses)
	for i := range out {
		dir := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
		out[i] = shapes.Pose{Position: dir.Mul(lo + (hi-lo)*rng.Float64()), Orientation: randomQuat(rng)}
	}
	return out
}

// restingPoses returns poses of a part resting on the plane z = top with
// penetration about 1 mm of a 0.1 m part, slightly tilted and turned as in a
// settled pile (the lowest point at depth pen).
func restingPoses(rng *rand.Rand, s shapes.Convex, top, spread float64) []shapes.Pose {
	out := make([]shapes.Pose, collidePoses)
	for i := range out {
		q := mgl64.QuatRotate(2*math.Pi*rng.Float64(), shapes.Vec3{0, 0, 1}).Mul(mgl64.QuatRotate(0.002*rng.NormFloat64(), shapes.Vec3{1, 0, 0}))
		low := q.Rotate(s.Support(q.Conjugate().Rotate(shapes.Vec3{0, 0, -1})))[2]
		out[i] = shapes.Pose{Position: shapes.Vec3{spread * (2*rng.Float64() - 1), spread * (2*rng.Float64() - 1), top - low - 1e-3}, Orientation: q}
	}
	return out
}

func runCollide(b *testing.B, a shapes.Shape, pa shapes.Pose, s shapes.Shape, poses []shapes.Pose, margin float64) {
	d := collide.NewDetector()
	dst := make([]collide.Manifold, 0, 16)
	points := 0
	for _, p := range poses { // grow the buffers
		dst = d.Collide(dst[:0], a, pa, s, p, margin)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		dst = d.Collide(dst[:0], a, pa, s, poses[i%len(poses)], margin)
		for _, m := range dst {
			points += m.Count
		}
	}
	b.ReportMetric(float64(points)/float64(b.N), "points/op")
}

// CollideGJKHull40 measures one GJK distance query between two 40-vertex
// hulls of radius 1 whose centres are 2.2 to 4 apart (always separated):
// ns/op is the time per query.
func CollideGJKHull40(b *testing.B) {
	rng := rand.New(rand.NewPCG(40, 0x61c))
	ha, hb := sphereHull(b, rng, 40, 1), sphereHull(b, rng, 40, 1)
	poses := pairPoses(rng, 2.2, 4)
	d := collide.NewDetector()
	iters := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		r := d.Distance(ha, shapes.IdentityPose, hb, poses[i%len(poses)])
		iters += r.Iterations
	}
	b.ReportMetric(float64(iters)/float64(b.N), "iters/op")
}

// CollideEPAHull40 measures a penetration query (GJK then EPA) between two
// overlapping 40-vertex hulls (centres 0.5 to 1.8 apart).
func CollideEPAHull40(b *testing.B) {
	rng := rand.New(rand.NewPCG(41, 0x61c))
	ha, hb := sphereHull(b, rng, 40, 1), sphereHull(b, rng, 40, 1)
	poses := pairPoses(rng, 0.5, 1.8)
	d := collide.NewDetector()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d.Penetration(ha, shapes.IdentityPose, hb, poses[i%len(poses)])
	}
}

// CollideBoxBoxResting measures the manifold of a 0.1 m box resting on a
// larger box (four points each, the common case of a settled pile).
func CollideBoxBoxResting(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 0xb0b))
	part := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	runCollide(b, shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.1}}, shapes.Pose{Position: shapes.Vec3{0, 0, -0.1}, Orientation: mgl64.QuatIdent()},
		part, restingPoses(rng, part, 0, 0.3), 0.005)
}

// CollideBoxBoxRandom measures box-box manifolds at random overlapping
// poses (tumbling parts: faces, edges and corners).
func CollideBoxBoxRandom(b *testing.B) {
	rng := rand.New(rand.NewPCG(2, 0xb0b))
	box := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	runCollide(b, box, shapes.IdentityPose, box, pairPoses(rng, 0.04, 0.1), 0.005)
}

// CollideHullHullResting measures a 20-vertex hull (a decagonal prism)
// resting flat on another.
func CollideHullHullResting(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 0xb0b))
	var pts []shapes.Vec3
	for k := 0; k < 10; k++ {
		th := 2 * math.Pi * float64(k) / 10
		pts = append(pts, shapes.Vec3{0.05 * math.Cos(th), 0.05 * math.Sin(th), -0.02}, shapes.Vec3{0.05 * math.Cos(th), 0.05 * math.Sin(th), 0.02})
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		b.Fatal(err)
	}
	base := shapes.Pose{Position: shapes.Vec3{0, 0, -0.02}, Orientation: mgl64.QuatIdent()}
	runCollide(b, h, base, h, restingPoses(rng, h, 0, 0.03), 0.005)
}

// CollideHullHullRandom measures the manifold of two 40-vertex hulls at
// random overlapping poses.
func CollideHullHullRandom(b *testing.B) {
	rng := rand.New(rand.NewPCG(4, 0xb0b))
	ha, hb := sphereHull(b, rng, 40, 0.05), sphereHull(b, rng, 40, 0.05)
	runCollide(b, ha, shapes.IdentityPose, hb, pairPoses(rng, 0.05, 0.099), 0.005)
}

// CollideBoxHullRandom measures the manifold of a box and a 40-vertex hull
// at random overlapping poses (the box-hull separating-axis test).
func CollideBoxHullRandom(b *testing.B) {
	rng := rand.New(rand.NewPCG(9, 0xb0b))
	box := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	runCollide(b, box, shapes.IdentityPose, sphereHull(b, rng, 40, 0.05), pairPoses(rng, 0.05, 0.099), 0.005)
}

// CollidePairApart measures CollidePair on pairs that stay apart from step
// to step (a 40-vertex hull and a cylinder whose bounds overlap, as in a
// pile): after the first step each query is answered by the remembered
// separating direction. ns/op is the time per pair query.
func CollidePairApart(b *testing.B) {
	rng := rand.New(rand.NewPCG(10, 0xb0b))
	hull := sphereHull(b, rng, 40, 0.05)
	cyl := shapes.Cylinder{Radius: 0.03, HalfLength: 0.04}
	poses := pairPoses(rng, 0.11, 0.13) // apart, within the shapes' bounds
	d := collide.NewDetector()
	dst := make([]collide.Manifold, 0, 16)
	step := func() {
		for k, p := range poses {
			dst = d.CollidePair(dst[:0], uint64(k), hull, shapes.IdentityPose, cyl, p, 0.002)
		}
		d.NextStep()
	}
	step()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i += len(poses) {
		step()
	}
	st := d.Stats()
	b.ReportMetric(float64(st.Remembered)/float64(max(st.Remembered+st.GJKCalls, 1)), "remembered")
}

// CollideBoxPlane measures a box resting on the floor plane.
func CollideBoxPlane(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 0xb0b))
	part := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	runCollide(b, shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, shapes.IdentityPose, part, restingPoses(rng, part, 0, 1), 0.005)
}

// CollideCylinderBox measures a cylinder standing on a box (GJK, EPA and
// the cap clipped against the face).
func CollideCylinderBox(b *testing.B) {
	rng := rand.New(rand.NewPCG(6, 0xb0b))
	cyl := shapes.Cylinder{Radius: 0.03, HalfLength: 0.05}
	runCollide(b, shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.1}}, shapes.Pose{Position: shapes.Vec3{0, 0, -0.1}, Orientation: mgl64.QuatIdent()},
		cyl, restingPoses(rng, cyl, 0, 0.3), 0.005)
}

// collideTray is a bumpy tray of 128 x 128 cells of 1 cm (32,768
// triangles) whose dimples are gentle enough that parts rest across several
// triangles.
func collideTray() *collide.Mesh {
	const n, cell = 128, 0.01
	m := &shapes.TriMesh{}
	for j := 0; j <= n; j++ {
		for i := 0; i <= n; i++ {
			x, y := cell*float64(i), cell*float64(j)
			m.Vertices = append(m.Vertices, shapes.Vec3{x, y, 0.002 * math.Sin(9*x) * math.Cos(7*y)})
		}
	}
	at := func(i, j int) int32 { return int32(j*(n+1) + i) }
	for j := 0; j < n; j++ {
		for i := 0; i < n; i++ {
			m.Triangles = append(m.Triangles, [3]int32{at(i, j), at(i+1, j), at(i+1, j+1)}, [3]int32{at(i, j), at(i+1, j+1), at(i, j+1)})
		}
	}
	return collide.NewMesh(m)
}

func trayPoses(rng *rand.Rand, s shapes.Convex) []shapes.Pose {
	poses := restingPoses(rng, s, 0.002, 0.5)
	for i := range poses {
		poses[i].Position[0] += 0.64
		poses[i].Position[1] += 0.64
	}
	return poses
}

// CollideBoxMesh measures a 0.1 m box against the tray: the hierarchy
// query, the box against each triangle it overlaps (about twenty), internal
// edge correction and merging.
func CollideBoxMesh(b *testing.B) {
	rng := rand.New(rand.NewPCG(7, 0xb0b))
	part := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	runCollide(b, collideTray(), shapes.IdentityPose, part, trayPoses(rng, part), 0.005)
}

// CollideCylinderMesh is CollideBoxMesh for a standing cylinder (the
// general GJK and EPA path per triangle).
func CollideCylinderMesh(b *testing.B) {
	rng := rand.New(rand.NewPCG(8, 0xb0b))
	cyl := shapes.Cylinder{Radius: 0.03, HalfLength: 0.05}
	runCollide(b, collideTray(), shapes.IdentityPose, cyl, trayPoses(rng, cyl), 0.005)
}
