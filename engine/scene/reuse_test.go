package scene

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"clatter/engine"
)

// reuseScenes cover what a world holds between steps: a triangle-mesh
// fixture and sleep (fixture), joints with a motor and a driven body
// (flap-kicker), a driven body on a path (pusher), a hinge (pendulum),
// compliant contacts (cushioned-flat), a hull dropped from an STL file
// (drop), a feeder's wiper, and bounces with events (bounce).
var reuseScenes = []string{
	"../../testdata/scenes/fixture.toml",
	"../../testdata/mechanisms/flap-kicker.toml",
	"../../testdata/mechanisms/pusher.toml",
	"../../testdata/mechanisms/pendulum.toml",
	"../../testdata/packaging/cushioned-flat.toml",
	"../../testdata/scenes/drop.toml",
	"../../testdata/feeder/wiper.toml",
	"../../testdata/scenes/bounce.toml",
}

// reuseSteps caps the steps of a scene in the test: enough for the fixture's
// block to settle and fall asleep, the flap to swing and the cushion to
// rebound, in a test of a few seconds.
const reuseSteps = 2500

// TestBuildInSameAsNew runs each scene in a new world (BuildWith) and in one
// world that went through other scenes before (BuildIn), in three orders,
// and checks after every step that the two worlds are the same, bit for
// bit: every field of the world, down through the broad phase, the narrow
// phase's pair memory and the solver's warm start, and the events of the
// step. The reference is the new world: a reused world must be
// indistinguishable from it.
func TestBuildInSameAsNew(t *testing.T) {
	scenes := make([]*Scene, len(reuseScenes))
	for i, f := range reuseScenes {
		s, err := Load(f)
		if err != nil {
			t.Fatal(err)
		}
		scenes[i] = s
	}
	forward := []int{0, 1, 2, 3, 4, 5, 6, 7}
	backward := slices.Clone(forward)
	slices.Reverse(backward)
	shuffled := slices.Clone(forward)
	rand.New(rand.NewPCG(13, 1)).Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
	// Every step is compared whole in the first order; the other orders
	// compare whole states every deepEvery steps and at the end (the
	// bodies' state every step), to keep the test short.
	for k, order := range [][]int{forward, backward, append(shuffled, shuffled...)} {
		deepEvery := 1
		if k > 0 {
			deepEvery = 50
		}
		reused := &engine.World{}
		for _, i := range order {
			s := scenes[i]
			t.Run(fmt.Sprintf("order%d/%s", k, s.File), func(t *testing.T) {
				sameRun(t, s, reused, deepEvery)
			})
		}
	}
}

// TestResetSameAsNewWorld checks that a world that ran a scene and was
// Reset equals, field by field, a world from NewWorld with the same
// settings, and that a bad setting leaves the world as it was.
func TestResetSameAsNewWorld(t *testing.T) {
	s, err := Load(reuseScenes[1])
	if err != nil {
		t.Fatal(err)
	}
	w, _, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	for range 300 {
		if err := w.Step(s.World.Step); err != nil {
			t.Fatal(err)
		}
	}
	cfg := engine.DefaultConfig()
	cfg.SubSteps = 3
	if err := w.Reset(cfg); err != nil {
		t.Fatal(err)
	}
	fresh, err := engine.NewWorld(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if d := stateDiff(fresh, w); d != "" {
		t.Fatalf("a reset world differs from a new one: %s", d)
	}
	bad := cfg
	bad.Slop = -1
	if err := w.Reset(bad); err == nil {
		t.Fatal("Reset accepted a negative slop")
	}
	if d := stateDiff(fresh, w); d != "" {
		t.Fatalf("a refused Reset changed the world: %s", d)
	}
}

// sameRun steps scene s in a new world and in reused, comparing them.
func sameRun(t *testing.T, s *Scene, reused *engine.World, deepEvery int) {
	cfg := s.Config()
	fresh, ids, err := s.BuildWith(cfg)
	if err != nil {
		t.Fatal(err)
	}
	ids2, err := s.BuildIn(reused, cfg)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(ids, ids2) {
		t.Fatalf("body ids %v in the new world, %v in the reused one", ids, ids2)
	}
	if d := stateDiff(fresh, reused); d != "" {
		t.Fatalf("after building: %s", d)
	}
	steps := min(int(math.Ceil(s.World.Duration/s.World.Step-1e-9)), reuseSteps)
	for n := 1; n <= steps; n++ {
		e1, e2 := fresh.Step(s.World.Step), reused.Step(s.World.Step)
		if fmt.Sprint(e1) != fmt.Sprint(e2) {
			t.Fatalf("step %d: error %v in the new world, %v in the reused one", n, e1, e2)
		}
		if d := diff(reflect.ValueOf(fresh.Events()), reflect.ValueOf(reused.Events()), "events", map[[2]uintptr]bool{}); d != "" {
			t.Fatalf("step %d: %s", n, d)
		}
		for id := range fresh.NumBodies() {
			b := engine.BodyID(id)
			if d := diff(reflect.ValueOf(bodyState(fresh, b)), reflect.ValueOf(bodyState(reused, b)), fresh.Name(b), map[[2]uintptr]bool{}); d != "" {
				t.Fatalf("step %d: %s", n, d)
			}
		}
		if n%deepEvery == 0 || n == steps || e1 != nil {
			if d := stateDiff(fresh, reused); d != "" {
				t.Fatalf("step %d: %s", n, d)
			}
		}
		if e1 != nil {
			return
		}
	}
	if settled, _ := fresh.Settled(); s.File == reuseScenes[0] && !settled {
		t.Errorf("the fixture's block never settled in %d steps: the test does not reach sleep", steps)
	}
}

// scratchFields are buffers whose entries past what a step writes are
// never read: they hold whatever earlier use left, which differs between a
// buffer made new and one kept, without any effect on the run (the bodies'
// states, compared every step, and every other field stay equal).
var scratchFields = map[string]string{
	// Row k of the Cholesky factor is l[k*n : k*n+k+1] (contact/cholesky.go).
	"World.collision.solver.blk.l": "the factor's unused upper part",
}

// bodyState is what a body's trajectory is made of.
func bodyState(w *engine.World, id engine.BodyID) [5]any {
	return [5]any{w.Position(id), w.Orientation(id), w.Velocity(id), w.Spin(id), w.Awake(id)}
}

// stateDiff compares two worlds field by field (see diff).
func stateDiff(a, b *engine.World) string {
	return diff(reflect.ValueOf(a).Elem(), reflect.ValueOf(b).Elem(), "World", map[[2]uintptr]bool{})
}

// diff describes the first difference between a and b, or returns "".
// Floats compare by their bits; slices by length and elements (nil and
// empty alike: a new buffer and an emptied one); maps by their entries;
// pointers by what they point to, each pair of pointers once. What the
// world keeps through Reset on purpose (prepared meshes, principal axes)
// is left out.
func diff(a, b reflect.Value, path string, seen map[[2]uintptr]bool) string {
	if a.IsValid() != b.IsValid() {
		return path + ": one is missing"
	}
	if !a.IsValid() {
		return ""
	}
	if a.Type() != b.Type() {
		return fmt.Sprintf("%s: types %s and %s", path, a.Type(), b.Type())
	}
	switch a.Kind() {
	case reflect.Bool:
		if a.Bool() != b.Bool() {
			return fmt.Sprintf("%s: %v and %v", path, a.Bool(), b.Bool())
		}
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		if a.Int() != b.Int() {
			return fmt.Sprintf("%s: %d and %d", path, a.Int(), b.Int())
		}
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		if a.Uint() != b.Uint() {
			return fmt.Sprintf("%s: %d and %d", path, a.Uint(), b.Uint())
		}
	case reflect.Float32, reflect.Float64:
		if math.Float64bits(a.Float()) != math.Float64bits(b.Float()) {
			return fmt.Sprintf("%s: %v and %v", path, a.Float(), b.Float())
		}
	case reflect.String:
		if a.String() != b.String() {
			return fmt.Sprintf("%s: %q and %q", path, a.String(), b.String())
		}
	case reflect.Array:
		for i := range a.Len() {
			if d := diff(a.Index(i), b.Index(i), fmt.Sprintf("%s[%d]", path, i), seen); d != "" {
				return d
			}
		}
	case reflect.Slice:
		if _, ok := scratchFields[path]; ok {
			return ""
		}
		if a.Len() != b.Len() {
			return fmt.Sprintf("%s: lengths %d and %d", path, a.Len(), b.Len())
		}
		if a.Len() > 0 && a.Pointer() == b.Pointer() {
			return "" // the same elements
		}
		for i := range a.Len() {
			if d := diff(a.Index(i), b.Index(i), fmt.Sprintf("%s[%d]", path, i), seen); d != "" {
				return d
			}
		}
	case reflect.Map:
		return mapDiff(a, b, path, seen)
	case reflect.Pointer:
		if a.IsNil() || b.IsNil() {
			if a.IsNil() != b.IsNil() {
				return path + ": nil and not nil"
			}
			return ""
		}
		k := [2]uintptr{a.Pointer(), b.Pointer()}
		if k[0] == k[1] || seen[k] {
			return ""
		}
		seen[k] = true
		return diff(a.Elem(), b.Elem(), path, seen)
	case reflect.Interface:
		if a.IsNil() || b.IsNil() {
			if a.IsNil() != b.IsNil() {
				return path + ": nil and not nil"
			}
			return ""
		}
		return diff(a.Elem(), b.Elem(), path, seen)
	case reflect.Struct:
		for i := range a.NumField() {
			f := a.Type().Field(i)
			if f.Name == "kept" && f.Type.Name() == "keptState" {
				continue
			}
			if d := diff(a.Field(i), b.Field(i), path+"."+f.Name, seen); d != "" {
				return d
			}
		}
	case reflect.Func:
		if a.IsNil() != b.IsNil() {
			return path + ": nil and not nil"
		}
	}
	return ""
}

// mapDiff compares maps entry by entry, in the order of their keys'
// printed forms.
func mapDiff(a, b reflect.Value, path string, seen map[[2]uintptr]bool) string {
	if a.Len() != b.Len() {
		return fmt.Sprintf("%s: %d and %d entries", path, a.Len(), b.Len())
	}
	entries := func(m reflect.Value) ([]string, []reflect.Value) {
		var keys []string
		vals := map[string]reflect.Value{}
		for it := m.MapRange(); it.Next(); {
			k := fmt.Sprint(it.Key())
			keys = append(keys, k)
			vals[k] = it.Value()
		}
		slices.Sort(keys)
		out := make([]reflect.Value, len(keys))
		for i, k := range keys {
			out[i] = vals[k]
		}
		return keys, out
	}
	ka, va := entries(a)
	kb, vb := entries(b)
	if !slices.Equal(ka, kb) {
		return fmt.Sprintf("%s: keys %v and %v", path, ka, kb)
	}
	for i := range va {
		if d := diff(va[i], vb[i], path+"["+ka[i]+"]", seen); d != "" {
			return d
		}
	}
	return ""
}
