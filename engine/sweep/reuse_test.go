package sweep

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"testing"

	"clatter/engine"
	"clatter/engine/scene"
	"clatter/shapes/resting"
)

// reuseStudies are studies whose trials a worker runs in its one world:
// an STL part over four cases of friction (bracket), compliant cushions
// with a drop's impact events (cushioned-ten-drops), and a hinged flap
// swung by a motor and a driven kicker, given a sweep of the part's
// velocity here.
var reuseStudies = []struct {
	file, sweep string
	trials      []int64 // global trial indices to run
}{
	{"../../testdata/sweeps/bracket.toml", "", []int64{0, 1, 2, 200, 201, 400, 600, 799}},
	{"../../testdata/packaging/cushioned-ten-drops.toml", "", []int64{0, 3, 7, 9}},
	{"../../testdata/mechanisms/flap-kicker.toml", `
[sweep]
trials = 3
seed = 11
[sweep.randomize]
velocity = { first = [40, 40, 0] }
`, []int64{0, 1, 2}},
}

// TestWorkerReuseSameAsNew runs trials of each study with a new worker for
// each (a new world) and with one worker that runs them in other orders
// (one world reset between trials, cases changing), and checks that every
// trial's rows are the same bytes and its final state the same bits: the
// position, orientation, velocity and spin of every body, the impact
// speeds, the time, the steps and when it settled.
func TestWorkerReuseSameAsNew(t *testing.T) {
	ctx := context.Background()
	for _, s := range reuseStudies {
		t.Run(filepath.Base(s.file), func(t *testing.T) {
			src, err := os.ReadFile(s.file)
			if err != nil {
				t.Fatal(err)
			}
			st, err := New(append(src, s.sweep...), s.file, scene.Options{Dir: filepath.Dir(s.file)})
			if err != nil {
				t.Fatal(err)
			}
			want := map[int64]string{}
			for _, g := range s.trials {
				wk := newWorker(st)
				want[g] = trialPrint(t, wk, ctx, g)
			}
			backward := slices.Clone(s.trials)
			slices.Reverse(backward)
			shuffled := slices.Clone(s.trials)
			rand.New(rand.NewPCG(3, 4)).Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
			wk := newWorker(st)
			for _, g := range append(backward, shuffled...) {
				if got := trialPrint(t, wk, ctx, g); got != want[g] {
					t.Errorf("trial %d in a reused world:\n%s\nin a new world:\n%s", g, got, want[g])
				}
			}
		})
	}
}

// trialPrint runs trial g and describes its rows and final state, floats
// by their bits.
func trialPrint(t *testing.T, wk *worker, ctx context.Context, g int64) string {
	t.Helper()
	r, err := wk.run(ctx, g)
	if err != nil {
		t.Fatal(err)
	}
	w := wk.world
	settled, at := w.Settled()
	out := fmt.Sprintf("%s%s%s%s time %x steps %d settled %v at %x\n", r.rows, r.failure, r.drop, r.crossings,
		math.Float64bits(w.Time()), w.Steps(), settled, math.Float64bits(at))
	for id := range w.NumBodies() {
		b := engine.BodyID(id)
		p, q, v, s := w.Position(b), w.Orientation(b), w.Velocity(b), w.Spin(b)
		out += fmt.Sprintf("%s awake %v hit %x:", w.Name(b), w.Awake(b), math.Float64bits(w.MaxImpactSpeed(b)))
		for _, x := range []float64{p[0], p[1], p[2], q.W, q.V[0], q.V[1], q.V[2], v[0], v[1], v[2], s[0], s[1], s[2]} {
			out += fmt.Sprintf(" %x", math.Float64bits(x))
		}
		out += "\n"
	}
	return out
}

// TestCaseFacesSameForEveryTrial checks that a worker's resting faces of a
// case do not depend on which trial of the case it runs first (each
// trial's pose gives the centre of mass back with roundings of its own),
// and that the cases of a study, which share the part's hull, share them:
// the faces are those of the hull about the scene's centre of mass
// (resting.OfShape, whose own tests check them against closed forms).
func TestCaseFacesSameForEveryTrial(t *testing.T) {
	const file = "../../testdata/sweeps/bracket.toml"
	src, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	st, err := New(src, file, scene.Options{Dir: filepath.Dir(file)})
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	var got [][]resting.Face
	for _, first := range []int64{0, 7, 200 + 3} { // trials of case 0, and of case 1 first
		wk := newWorker(st)
		if _, err := wk.run(ctx, first); err != nil {
			t.Fatal(err)
		}
		if _, err := wk.run(ctx, 1); err != nil {
			t.Fatal(err)
		}
		got = append(got, wk.faces[0])
	}
	b := st.Scene.Bodies[st.dyn[0]]
	want, err := resting.OfShape(b.Shape, b.Props.Center)
	if err != nil {
		t.Fatal(err)
	}
	for k, f := range got {
		if !reflect.DeepEqual(f, want) {
			t.Errorf("worker %d: the faces differ from the hull's about the scene's centre of mass", k)
		}
	}
}
