package engine

import (
	"errors"
	"math"
	"strings"
	"testing"

	"clatter/shapes"
)

func TestNoTunnelling(t *testing.T) {
	// Speculative contacts (the narrow phase's closing points): a 5 mm part falling
	// at 5 m/s onto a 2 mm thick wall with a 1 ms step moves 5 mm a step, more
	// than the wall's thickness, yet must be stopped on top of it.
	w := newTestWorld(t, Config{NoSleep: true})
	mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.001}}})
	for _, c := range []struct {
		name  string
		shape shapes.Shape
		half  float64
	}{
		{"cube", shapes.Box{Half: shapes.Vec3{0.0025, 0.0025, 0.0025}}, 0.0025},
		{"ball", shapes.Sphere{Radius: 0.0025}, 0.0025},
	} {
		id := mustAdd(t, w, BodyDef{Name: c.name, Shape: c.shape, Density: 1000,
			Position: shapes.Vec3{0.02 * float64(w.NumBodies()), 0, 0.0123}, Velocity: shapes.Vec3{0, 0, -5}})
		run(t, w, 1e-3, 0.05, nil)
		if z := w.Position(id)[2]; z < 0.001 {
			t.Errorf("%s passed through the wall: z = %.4f m", c.name, z)
		}
	}
}

func TestTriangleFlatMatchesPlane(t *testing.T) {
	// A box sliding across a flat made of 200 triangles has the same speed
	// profile as on an analytic plane (internal-edge correction of the mesh
	// contacts), within 1 percent of the starting speed at every sample.
	const tol = 0.01
	grid := func() *shapes.TriMesh {
		m := &shapes.TriMesh{}
		const n = 10 // 10 x 10 squares, 2 triangles each
		for j := 0; j <= n; j++ {
			for i := 0; i <= n; i++ {
				m.Vertices = append(m.Vertices, shapes.Vec3{-0.5 + float64(i)*1.5/n, -0.5 + float64(j)/n, 0})
			}
		}
		for j := 0; j < n; j++ {
			for i := 0; i < n; i++ {
				a := int32(j*(n+1) + i)
				b, c, d := a+1, a+int32(n+1), a+int32(n+2)
				m.Triangles = append(m.Triangles, [3]int32{a, b, d}, [3]int32{a, d, c})
			}
		}
		return m
	}()
	profile := func(floor shapes.Shape) []float64 {
		w := newTestWorld(t, DefaultConfig())
		mat, _ := w.AddMaterial(Material{Friction: 0.3})
		mustAdd(t, w, BodyDef{Name: "floor", Kind: Static, Shape: floor, Material: mat})
		id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.01}}, Density: 1000, Material: mat,
			Position: shapes.Vec3{-0.4, 0.03, 0.01}, Velocity: shapes.Vec3{2, 0, 0}})
		var v []float64
		run(t, w, 1e-3, 0.5, func() {
			if w.Steps()%10 == 0 {
				v = append(v, w.Velocity(id)[0])
			}
		})
		return v
	}
	plane := profile(shapes.Plane{Normal: shapes.Vec3{0, 0, 1}})
	mesh := profile(grid)
	for i := range plane {
		if math.Abs(plane[i]-mesh[i]) > tol*2 {
			t.Fatalf("sample %d: %.4f m/s on triangles, %.4f on the plane", i, mesh[i], plane[i])
		}
	}
}

func TestKick(t *testing.T) {
	// An impulse J at the centre of mass changes the velocity by J/m; at an
	// offset r it also spins the body by I^-1 (r x J) (impulse-momentum
	// theorem; any mechanics text). Zero gravity, so nothing else acts.
	w := newTestWorld(t, Config{NoSleep: true})
	half := shapes.Vec3{0.1, 0.05, 0.02}
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: half}, Mass: 2})
	if err := w.Kick(id, 0.0105, shapes.Vec3{0, 1, 0}, shapes.Vec3{0.1, 0, 0}, false); err != nil {
		t.Fatal(err)
	}
	run(t, w, 1e-3, 0.011, nil)
	if v := w.Velocity(id); math.Abs(v[1]-0.5) > 1e-12 {
		t.Fatalf("velocity %v, want 0.5 along y", v)
	}
	iz := 2 * (0.2*0.2 + 0.1*0.1) / 12
	// r x J = (0.1, 0, 0) x (0, 1, 0) = 0.1 z.
	if s := w.Spin(id); math.Abs(s[2]-0.1/iz) > 1e-9 {
		t.Fatalf("spin %v, want %g about z", s, 0.1/iz)
	}
	if err := w.Kick(id, 1, shapes.Vec3{math.NaN(), 0, 0}, shapes.Vec3{}, true); err == nil {
		t.Fatal("NaN impulse accepted")
	}
}

func TestBadBodies(t *testing.T) {
	w := newTestWorld(t, DefaultConfig())
	cases := []struct {
		def  BodyDef
		want string
	}{
		{BodyDef{Name: "a", Shape: shapes.Sphere{Radius: 1}, Mass: -2}, `body "a": mass must be positive, got -2`},
		{BodyDef{Name: "b", Shape: shapes.Sphere{Radius: 1}}, `body "b": density must be positive`},
		{BodyDef{Name: "c"}, `body "c": no shape`},
		{BodyDef{Name: "d", Shape: shapes.Sphere{Radius: 1}, Density: 1, Position: shapes.Vec3{math.NaN(), 0, 0}}, `must be finite`},
		{BodyDef{Name: "e", Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Density: 1}, `only be static`},
		{BodyDef{Name: "f", Shape: shapes.Sphere{Radius: 1}, Density: 1, Material: 7}, `unknown material`},
		{BodyDef{Name: "g", Kind: Static, Shape: &shapes.Compound{}}, `no valid bounds`},
	}
	for _, c := range cases {
		_, err := w.AddBody(c.def)
		if err == nil || !errors.Is(err, ErrBadBody) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: got %v, want %q", c.def.Name, err, c.want)
		}
	}
	if _, err := w.AddMaterial(Material{Name: "x", Restitution: 1.5}); err == nil || !strings.Contains(err.Error(), "restitution") {
		t.Errorf("restitution 1.5 accepted: %v", err)
	}
	if _, err := w.AddMaterial(Material{Name: "y", Friction: 0.5, StaticFriction: 0.2}); err == nil {
		t.Error("static friction below kinetic accepted")
	}
}

func TestMixingRule(t *testing.T) {
	// Without a pair entry, each coefficient is the geometric mean (common
	// trade practice, documented in material.go); a pair entry overrides it.
	w := newTestWorld(t, DefaultConfig())
	a, _ := w.AddMaterial(Material{Name: "a", Friction: 0.2, Restitution: 0.8})
	b, _ := w.AddMaterial(Material{Name: "b", Friction: 0.8, Restitution: 0.2})
	if c := w.Pair(a, b); math.Abs(c.Friction-0.4) > 1e-15 || math.Abs(c.Restitution-0.4) > 1e-15 {
		t.Fatalf("mixed %+v, want friction 0.4 and restitution 0.4", c)
	}
	if err := w.SetPair(b, a, PairCoefficients{Friction: 0.3, Restitution: 0.1}); err != nil {
		t.Fatal(err)
	}
	if c := w.Pair(a, b); c.Friction != 0.3 || c.StaticFriction != 0.3 || c.Restitution != 0.1 {
		t.Fatalf("pair override not used: %+v", c)
	}
}

func TestSleepWakeAndEvents(t *testing.T) {
	// A box dropped onto a floor: an impact event, a contact begin, sleep,
	// settled; a kick wakes it.
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5, Restitution: 0.3})
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.05}}, Density: 500, Material: mat,
		Position: shapes.Vec3{0, 0, 0.2}})
	seen := map[EventKind]int{}
	var impact Event
	run(t, w, 1e-3, 2, func() {
		for _, e := range w.Events() {
			seen[e.Kind]++
			if e.Kind == Impact && impact.Speed == 0 {
				impact = e
			}
		}
	})
	for _, k := range []EventKind{Impact, ContactBegin, Sleep, Settled} {
		if seen[k] == 0 {
			t.Errorf("no %s event", k)
		}
	}
	// First impact speed: sqrt(2 g h) with h = 0.15 m of fall (free fall;
	// any mechanics text), within one step of gravity g dt.
	if want := math.Sqrt(2 * g0 * 0.15); math.Abs(impact.Speed-want) > g0*1e-3+1e-3 {
		t.Errorf("impact at %.4f m/s, want %.4f", impact.Speed, want)
	}
	if w.Awake(id) {
		t.Fatal("box still awake")
	}
	if err := w.Kick(id, w.Time(), shapes.Vec3{0, 0, 0.5}, shapes.Vec3{}, true); err != nil {
		t.Fatal(err)
	}
	run(t, w, 1e-3, 0.01, nil)
	if !w.Awake(id) || w.Velocity(id)[2] <= 0 {
		t.Fatal("kick did not wake the box")
	}
}

func TestDivergenceGuard(t *testing.T) {
	// A NaN velocity set by a caller stops the run with an error naming the body.
	w := newTestWorld(t, DefaultConfig())
	id := mustAdd(t, w, BodyDef{Name: "cap", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000})
	w.SetVelocity(id, shapes.Vec3{math.Inf(1), 0, 0}, shapes.Vec3{})
	err := w.Step(1e-3)
	var de *DivergenceError
	if !errors.As(err, &de) || de.Name != "cap" {
		t.Fatalf("got %v, want a divergence error on body cap", err)
	}
	if w.Step(1e-3) != err {
		t.Fatal("a stopped world ran on")
	}
}
