package engine

import (
	"errors"
	"math"
	"strings"
	"testing"

	"clatter/shapes"
)

func TestDivergenceNamesCause(t *testing.T) {
	// A spin that is not a number (as a blow-up leaves it) stops the run at
	// the next step with an error naming the body, the time and the part
	// of its state, and advising only what a user can change: the step.
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
	id := mustAdd(t, w, BodyDef{Name: "lid", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.005}}, Density: 900, Material: mat, Position: shapes.Vec3{0, 0, 0.1}})
	run(t, w, 1e-3, 0.01, nil)
	w.SetVelocity(id, shapes.Vec3{}, shapes.Vec3{math.NaN(), 0, 0})
	err := w.Step(1e-3)
	var de *DivergenceError
	if !errors.As(err, &de) {
		t.Fatalf("error %v, want a *DivergenceError", err)
	}
	if de.Name != "lid" || math.Abs(de.Time-0.011) > 1e-12 {
		t.Errorf("body %q at t = %g s, want \"lid\" at 0.011 s", de.Name, de.Time)
	}
	msg := err.Error()
	t.Log(msg)
	for _, want := range []string{`body "lid"`, "is no longer a finite number", "try a smaller step"} {
		if !strings.Contains(msg, want) {
			t.Errorf("message %q lacks %q", msg, want)
		}
	}
	if strings.Contains(msg, "sub-step") {
		t.Errorf("message %q suggests sub-steps, which a scene cannot set", msg)
	}
}
