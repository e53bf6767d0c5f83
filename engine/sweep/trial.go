package sweep

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"

	"clatter/engine"
	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// worker runs trials one after another, keeping the scene of its current
// case and the scratch space of a trial. It builds every trial in its one
// world (scene.BuildIn), which keeps its buffers and meshes from trial to
// trial and runs each trial exactly as a new world would.
type worker struct {
	st     *Study
	world  *engine.World
	c      int64 // case of cs, -1 before the first
	cs     *scene.Scene
	values []byte   // the case's value columns, "0.2,1,"
	names  []string // the moving bodies' names as CSV fields
	faces  [][]resting.Face
	bodies []scene.Body
	touch  []bool
	awake  []bool
	last   []shapes.Pose // each moving body's centre of mass and orientation before the step
	// slot maps a body id to its index in st.dyn (-1: not moving);
	// cross holds the trial's rows of crossings.csv (gates.go).
	slot  []int
	cross []byte
	// hullFaces holds the resting faces of hulls (casefaces.go).
	hullFaces map[faceKey][]resting.Face
}

func newWorker(st *Study) *worker { return &worker{st: st, c: -1, world: &engine.World{}} }

// result is a finished trial: its rows of trials.csv, and a row of
// failures.csv if the simulation failed.
type result struct {
	g         int64
	rows      []byte
	failure   []byte
	drop      []byte // the drops.csv row of a study with a [drop]
	crossings []byte // rows of crossings.csv, if any
}

// useCase reads the scene of case c unless it is the current one.
func (wk *worker) useCase(c int64) error {
	if c == wk.c {
		return nil
	}
	cs, err := wk.st.caseScene(c)
	if err != nil {
		return err
	}
	wk.c, wk.cs, wk.faces = c, cs, nil
	wk.names = wk.names[:0]
	for _, i := range wk.st.dyn {
		wk.names = append(wk.names, csvField(cs.Bodies[i].Name))
	}
	wk.values = wk.values[:0]
	for _, v := range wk.st.caseValues(c) {
		wk.values = appendNumber(wk.values, v)
		wk.values = append(wk.values, ',')
	}
	return nil
}

// appendCase appends a row's leading "case,<varied values>," fields, as
// cases.csv and gate-cases.csv begin.
func appendCase(b []byte, c int64, values []float64) []byte {
	b = strconv.AppendInt(b, c, 10)
	b = append(b, ',')
	for _, v := range values {
		b = appendNumber(b, v)
		b = append(b, ',')
	}
	return b
}

func appendNumber(b []byte, x float64) []byte {
	// Twelve significant digits, as every result file (report.Tidy).
	return strconv.AppendFloat(b, report.Tidy(x), 'g', 12, 64)
}

// ctxEvery is how many steps a trial takes between looks at its context:
// a fraction of a millisecond of work, so an interruption is prompt.
const ctxEvery = 256

// run runs trial g (global index case x trials + trial). It returns
// ctx.Err() if interrupted, leaving no result.
func (wk *worker) run(ctx context.Context, g int64) (result, error) {
	st := wk.st
	c, t := g/st.meta.Trials, g%st.meta.Trials
	if err := wk.useCase(c); err != nil {
		return result{}, err
	}
	seed := TrialSeed(st.meta.Seed, c, t)
	sc := *wk.cs
	wk.bodies = append(wk.bodies[:0], wk.cs.Bodies...)
	sc.Bodies = wk.bodies
	st.drawStart(trialRand(seed), &sc)
	cfg := sc.Config()
	cfg.NoEvents = sc.Drop == nil // a drop's report reads the impacts
	w := wk.world
	ids, err := sc.BuildIn(w, cfg)
	if err != nil {
		if oe := (*engine.OverlapError)(nil); errors.As(err, &oe) {
			return wk.startFailure(g, c, t, seed, &sc, oe), nil // startfail.go
		}
		return result{}, fmt.Errorf("case %d (%s), trial %d: %w", c, st.describe(c), t, err)
	}
	if wk.faces == nil {
		wk.faces = make([][]resting.Face, len(st.dyn))
		for k, i := range st.dyn {
			wk.faces[k] = wk.facesOf(&sc.Bodies[i], w, ids[i]) // casefaces.go
		}
	}
	n := len(st.dyn)
	wk.touch = resize(wk.touch, n)
	wk.awake = resize(wk.awake, n)
	if cap(wk.last) < n {
		wk.last = make([]shapes.Pose, n)
	}
	wk.last = wk.last[:n]
	for k := range wk.touch {
		wk.touch[k] = false
	}
	wk.startCrossings(ids)
	dt := sc.World.Step
	steps := sc.World.StepCount()
	var stepErr error
	drop := watchDrop(&sc, w, ids)
	for s := 0; s < steps; s++ {
		if s%ctxEvery == ctxEvery-1 && ctx.Err() != nil {
			return result{}, ctx.Err()
		}
		for k, i := range st.dyn {
			id := ids[i]
			wk.awake[k] = w.Awake(id)
			wk.last[k] = shapes.Pose{Position: w.Position(id), Orientation: w.Orientation(id)}
		}
		drop.before(w)
		if err := w.Step(dt); err != nil {
			stepErr = err
			break
		}
		drop.after(w)
		wk.crossings(c, t, w) // gates.go
		// A body asleep since before this step keeps what it touched then
		// (engine.World.Touching with NoEvents).
		for k, i := range st.dyn {
			if wk.awake[k] {
				wk.touch[k] = w.Touching(ids[i])
			}
		}
		if settled, _ := w.Settled(); settled && sc.World.UntilSettled {
			break
		}
	}
	res := wk.rows(g, c, t, seed, &sc, w, ids, stepErr)
	if drop.t != nil {
		res.drop = drop.row(c, t, wk.values, w, sc.Units, w.Touching(drop.t.Body()), stepErr != nil)
	}
	return res, nil
}

func resize(b []bool, n int) []bool {
	if cap(b) < n {
		return make([]bool, n)
	}
	return b[:n]
}

// rows writes the trial's rows: one per moving body, in scene order.
func (wk *worker) rows(g, c, t int64, seed uint64, sc *scene.Scene, w *engine.World, ids []engine.BodyID, stepErr error) result {
	st := wk.st
	u := sc.Units
	settled, at := w.Settled()
	if stepErr != nil {
		settled = false
	}
	var b []byte
	for k, i := range st.dyn {
		id := ids[i]
		pos, rot := w.Position(id), w.Orientation(id)
		face := -1
		if stepErr != nil {
			// The last good state: the failed step left the body's state
			// unusable.
			pos, rot = wk.last[k].Position, wk.last[k].Orientation
		} else {
			face = report.RestingFace(w, id, wk.faces[k], wk.touch[k])
		}
		b = strconv.AppendInt(b, c, 10)
		b = append(b, ',')
		b = strconv.AppendInt(b, t, 10)
		b = append(b, ',')
		b = strconv.AppendUint(b, seed, 10)
		b = append(b, ',')
		b = append(b, wk.values...)
		b = append(b, wk.names[k]...)
		b = append(b, ',')
		if face >= 0 {
			b = strconv.AppendInt(b, int64(face), 10)
		}
		b = append(b, ',')
		b = strconv.AppendBool(b, settled)
		b = append(b, ',')
		if settled {
			b = appendNumber(b, at)
		}
		p := u.VecFromSI(pos, scene.Length)
		for _, x := range [...]float64{p[0], p[1], p[2], rot.W, rot.V[0], rot.V[1], rot.V[2], u.FromSI(w.MaxImpactSpeed(id), scene.Speed)} {
			b = append(b, ',')
			b = appendNumber(b, x)
		}
		b = append(b, ',')
		if down := report.FaceDown(wk.faces[k], rot, sc.World.Gravity); down >= 0 {
			b = strconv.AppendInt(b, int64(down), 10)
		}
		b = append(b, '\n')
	}
	r := result{g: g, rows: b}
	if len(wk.cross) > 0 {
		r.crossings = append([]byte(nil), wk.cross...)
	}
	if stepErr != nil {
		f := strconv.AppendInt(nil, c, 10)
		f = append(f, ',')
		f = strconv.AppendInt(f, t, 10)
		f = append(f, ',')
		f = strconv.AppendUint(f, seed, 10)
		f = append(f, ',')
		f = append(f, csvField(stepErr.Error())...)
		r.failure = append(f, '\n')
	}
	return r
}

// drawStart makes a trial's random draws, body by body in scene order and
// for each body always in the same order (orientation, position, height,
// velocity, spin), and sets the starting state of sc's bodies.
func (st *Study) drawStart(rng *rand.Rand, sc *scene.Scene) {
	up := shapes.Vec3{0, 0, 1}
	if g := sc.World.Gravity.Len(); g > 0 {
		up = sc.World.Gravity.Mul(-1 / g)
	}
	sym := func(a float64) float64 { return (2*rng.Float64() - 1) * a }
	for i := range sc.Bodies {
		d := &st.draws[i]
		b := &sc.Bodies[i]
		if d.orient {
			b.Orientation = scene.RandomOrientation(rng)
		}
		if d.jitter != (shapes.Vec3{}) {
			b.Position = b.Position.Add(shapes.Vec3{sym(d.jitter[0]), sym(d.jitter[1]), sym(d.jitter[2])})
		}
		if h := d.height; h != nil {
			z := h.Low + rng.Float64()*(h.High-h.Low)
			b.Position = b.Position.Add(up.Mul(z - up.Dot(b.Position)))
		}
		if d.velocity != (shapes.Vec3{}) {
			b.Velocity = b.Velocity.Add(shapes.Vec3{sym(d.velocity[0]), sym(d.velocity[1]), sym(d.velocity[2])})
		}
		if sp := d.spin; sp != nil {
			b.Spin = b.Spin.Add(randomAxis(rng).Mul(sp.Low + rng.Float64()*(sp.High-sp.Low)))
		}
	}
}

// randomAxis is a direction uniform on the unit sphere: its z is uniform
// in [-1, 1] (Archimedes' hat-box theorem) and its azimuth in [0, 2 pi).
func randomAxis(rng *rand.Rand) shapes.Vec3 {
	z := 2*rng.Float64() - 1
	phi := 2 * math.Pi * rng.Float64()
	r := math.Sqrt(math.Max(0, 1-z*z))
	return shapes.Vec3{r * math.Cos(phi), r * math.Sin(phi), z}
}
