package bench

import (
	"math"
	"testing"

	"github.com/go-gl/mathgl/mgl64"

	"clatter/collide"
	"clatter/shapes"
)

func init() {
	Register(Benchmark{Name: "BoxOnMeshFixture", Fn: BoxOnMeshFixture})
}

// fixtureTray is a moulded tray of about 20,000 triangles as a CAD
// exporter tessellates one: a flat 0.6 m x 0.4 m floor in 0.1 m cells (its
// flat faces need few triangles), nine locating bosses (radius 15 mm,
// height 20 mm, a 5 mm fillet on top, 64 facets round) at the cell corners
// inside, and a round lip (radius 10 mm) along the four sides, where the
// curved surfaces take nearly all of the triangles.
func fixtureTray() *shapes.TriMesh {
	m := &shapes.TriMesh{}
	// The floor: a grid of 6 x 4 cells at z = 0, facing up.
	const nx, ny, cell = 6, 4, 0.1
	fixtureGrid(m, nx, ny, func(i, j int) shapes.Vec3 {
		return shapes.Vec3{cell * float64(i), cell * float64(j), 0}
	}, func(shapes.Vec3) shapes.Vec3 { return shapes.Vec3{0, 0, 1} })
	// The bosses: a surface of revolution of the profile (r, z).
	const segs, rb, hb, fb, arc = 64, 0.015, 0.02, 0.005, 5
	var prof [][2]float64
	prof = append(prof, [2]float64{rb, 0})
	for k := 0; k <= arc; k++ {
		a := 0.5 * math.Pi * float64(k) / arc
		prof = append(prof, [2]float64{rb - fb + fb*math.Cos(a), hb - fb + fb*math.Sin(a)})
	}
	for k := 1; k <= 3; k++ { // the flat top in rings, as exporters do
		prof = append(prof, [2]float64{(rb - fb) * (1 - float64(k)/4), hb})
	}
	for bj := 1; bj < ny; bj++ {
		for bi := 1; bi < nx; bi += 2 {
			c := shapes.Vec3{cell * float64(bi), cell * float64(bj), 0}
			fixtureGrid(m, segs, len(prof)-1, func(i, j int) shapes.Vec3 {
				a := 2 * math.Pi * float64(i%segs) / segs
				return c.Add(shapes.Vec3{prof[j][0] * math.Cos(a), prof[j][0] * math.Sin(a), prof[j][1]})
			}, func(p shapes.Vec3) shapes.Vec3 {
				d := p.Sub(c)
				if d[2] > hb-fb {
					return shapes.Vec3{0, 0, 1}
				}
				return shapes.Vec3{d[0], d[1], 0}
			})
		}
	}
	// The lip: a tube along each side.
	const along, round, rl = 200, 6, 0.01
	lx, ly := nx*cell, ny*cell
	sides := [4][2]shapes.Vec3{{{0, 0, rl}, {lx, 0, rl}}, {{lx, 0, rl}, {lx, ly, rl}}, {{lx, ly, rl}, {0, ly, rl}}, {{0, ly, rl}, {0, 0, rl}}}
	for _, s := range sides {
		ax := s[1].Sub(s[0])
		u := ax.Normalize()
		w := shapes.Vec3{0, 0, 1}.Cross(u)
		fixtureGrid(m, along, round, func(i, j int) shapes.Vec3 {
			a := 2 * math.Pi * float64(j%round) / round
			return s[0].Add(ax.Mul(float64(i) / along)).Add(w.Mul(rl * math.Cos(a))).Add(shapes.Vec3{0, 0, rl * math.Sin(a)})
		}, func(p shapes.Vec3) shapes.Vec3 {
			d := p.Sub(s[0])
			return d.Sub(u.Mul(d.Dot(u)))
		})
	}
	return m
}

// fixtureGrid appends the (nu+1) x (nv+1) grid of points at(i, j) as
// triangles, each turned so that its normal agrees with out at its centre.
func fixtureGrid(m *shapes.TriMesh, nu, nv int, at func(i, j int) shapes.Vec3, out func(shapes.Vec3) shapes.Vec3) {
	base := int32(len(m.Vertices))
	for j := 0; j <= nv; j++ {
		for i := 0; i <= nu; i++ {
			m.Vertices = append(m.Vertices, at(i, j))
		}
	}
	idx := func(i, j int) int32 { return base + int32(j*(nu+1)+i) }
	add := func(a, b, c int32) {
		pa, pb, pc := m.Vertices[a], m.Vertices[b], m.Vertices[c]
		n := pb.Sub(pa).Cross(pc.Sub(pa))
		if n.Dot(out(pa.Add(pb).Add(pc).Mul(1.0/3))) < 0 {
			b, c = c, b
		}
		m.Triangles = append(m.Triangles, [3]int32{a, b, c})
	}
	for j := 0; j < nv; j++ {
		for i := 0; i < nu; i++ {
			add(idx(i, j), idx(i+1, j), idx(i+1, j+1))
			add(idx(i, j), idx(i+1, j+1), idx(i, j+1))
		}
	}
}

// BoxOnMeshFixture measures the narrow phase of one step for a box (0.1 m x
// 0.08 m x 0.06 m) resting on the floor of the fixture tray between its
// bosses: the pair's query as the world runs it each step (CollidePair and
// NextStep), at poses that differ from step to step by the micrometre
// jitter of a resting part. ns/op is the time per step.
func BoxOnMeshFixture(b *testing.B) {
	tray := collide.NewMesh(fixtureTray())
	box := shapes.Box{Half: shapes.Vec3{0.05, 0.04, 0.03}}
	const jitter = 8
	var poses [jitter]shapes.Pose
	for k := range poses {
		e := 1e-6 * float64(k)
		q := mgl64.QuatRotate(0.3+e, shapes.Vec3{0, 0, 1})
		poses[k] = shapes.Pose{Position: shapes.Vec3{0.2 + e, 0.15 - e, 0.03 - 1e-4 - e}, Orientation: q}
	}
	d := collide.NewDetector()
	dst := make([]collide.Manifold, 0, 8)
	step := func(i int) {
		dst = d.CollidePair(dst[:0], 1, tray, shapes.IdentityPose, box, poses[i%jitter], 0.002)
		d.NextStep()
	}
	for i := 0; i < 2*jitter; i++ {
		step(i)
	}
	points := 0
	b.ReportAllocs()
	b.ResetTimer()
	var cpu cpuClock // cputime.go
	cpu.start()
	for i := 0; i < b.N; i++ {
		step(i)
		for _, m := range dst {
			points += m.Count
		}
	}
	cpu.stop()
	cpu.report(b)
	b.ReportMetric(float64(points)/float64(b.N), "points/op")
	b.ReportMetric(float64(len(tray.TriMesh().Triangles)), "triangles")
}
