package engine

import (
	"errors"
	"math"
	"strings"
	"testing"

	"clatter/contact"
	"clatter/shapes"
)

func TestSolveErrorNamesBodiesAndMaterials(t *testing.T) {
	// The contact solver refuses a point that is no longer finite, naming
	// it by index and key; the world's message names the two bodies and
	// their materials instead, and blames the moving one.
	w := newTestWorld(t, DefaultConfig())
	steel, err := w.AddMaterial(Material{Name: "steel", Friction: 0.3})
	if err != nil {
		t.Fatal(err)
	}
	abs, err := w.AddMaterial(Material{Name: "abs", Friction: 0.4})
	if err != nil {
		t.Fatal(err)
	}
	floor := mustAdd(t, w, BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: steel})
	part := mustAdd(t, w, BodyDef{Name: "cap", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000, Material: abs})
	w.collision.points = []contact.Point{{A: int32(floor), B: int32(part), Position: shapes.Vec3{math.NaN(), 0, 0}, Normal: shapes.Vec3{0, 0, 1}, Key: 0x9e3779b97f4a7c15}}
	raw := errors.New("contact: point 0 (key 0x9e3779b97f4a7c15), bodies 0, 1: position, separation, surface velocity and coefficients must be finite")
	got := w.solveError(raw)
	var de *DivergenceError
	msg := got.Error()
	if !errors.As(got, &de) || de.Name != "cap" {
		t.Fatalf("%v: want a divergence of the moving body cap", got)
	}
	for _, want := range []string{`body "floor" (material "steel")`, `body "cap" (material "abs")`, "no longer a finite number"} {
		if !strings.Contains(msg, want) {
			t.Errorf("message %q lacks %q", msg, want)
		}
	}
	if strings.Contains(msg, "0x") || strings.Contains(msg, "bodies 0, 1") {
		t.Errorf("message %q names indices or a key hash", msg)
	}
}
