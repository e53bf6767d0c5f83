package contact

import "testing"

func TestLiveStateDue(t *testing.T) {
	// The bookkeeping alone: a point is due while one of its bodies has
	// moved since its last update, and changes below the tolerance count
	// once their sum exceeds it.
	const tol = 1.0
	var l liveState
	l.reset(3, 2, tol, false) // slots 0 (fixed), 1, 2; points 0 and 1
	for i, a := range [][2]int32{{0, 1}, {1, 2}} {
		if !l.due(i, a[0], a[1]) {
			t.Fatalf("point %d is not due in the first sweep", i)
		}
	}
	l.note(0, 1, 2*tol, l.tick(0)) // point 0 moves body 1
	l.note(1, 2, 0, l.tick(1))     // point 1 changes nothing
	cases := []struct {
		name string
		i    int
		a, b int32
		want bool
	}{
		{"own change only", 0, 0, 1, false},
		{"neighbour moved body 1 after it", 1, 1, 2, false}, // point 1 came after point 0's change
	}
	for _, c := range cases {
		if got := l.due(c.i, c.a, c.b); got != c.want {
			t.Errorf("%s: due = %v, want %v", c.name, got, c.want)
		}
	}
	// Point 1 now changes body 1 by less than tol twice: the second time
	// the sum exceeds tol and point 0 becomes due.
	l.note(1, 2, 0.6*tol, l.tick(1))
	if l.due(0, 0, 1) {
		t.Error("a change below the tolerance made point 0 due")
	}
	l.note(1, 2, 0.6*tol, l.tick(1))
	if !l.due(0, 0, 1) {
		t.Error("changes summing above the tolerance left point 0 skipped")
	}
	// Point 0 moves body 1 again: point 1, on bodies 1 and 2, is due
	// through its first body.
	l.note(0, 1, 2*tol, l.tick(0))
	if !l.due(1, 1, 2) {
		t.Error("point 1 skipped although its first body moved")
	}
}

func TestLiveStacksStatics(t *testing.T) {
	// Columns of unit cubes on the ground, from rest and without warm
	// start, solved by the sweeps alone: with MaxBlock below the columns'
	// points the sweeps skip rows whose bodies did not move (live.go); with
	// MaxBlock 1 they sweep every row. Either way each level's contacts
	// must carry the weight above them, (levels - l) m g dt (statics of a
	// stack; any mechanics text).
	//
	// 2e-3 of the load: the sweeps stop once no row changes by more than
	// Convergence (1e-4) of its impulse in a sweep, and Gauss-Seidel on a
	// column of n boxes shrinks its error by a factor of about 1 - 1/n^2
	// a sweep (measured), so the error left is up to n^2 times that.
	const relTol = 2e-3
	const dt, h = 1e-3, 0.1
	levels := []int{3, 5, 8}
	for _, maxBlock := range []int{1, 4} {
		set := DefaultSettings()
		set.MaxBlock = maxBlock
		set.VelocityIterations = 2000
		bodies, pts := columns(levels, h)
		addGravity(bodies, dt)
		rep, err := NewSolver(set).Solve(dt, bodies, pts, nil)
		if err != nil {
			t.Fatal(err)
		}
		if rep.Iterations == set.VelocityIterations {
			t.Errorf("MaxBlock %d: the sweeps did not converge in %d", maxBlock, rep.Iterations)
		}
		k := 0
		for c, n := range levels {
			for l := 0; l < n; l++ {
				sum := 0.0
				for j := 0; j < 4; j++ {
					sum += pts[k].NormalImpulse
					k++
				}
				want := float64(n-l) * gStd * dt
				if e := relErr(sum, want); e > relTol {
					t.Errorf("MaxBlock %d: column %d level %d: normal impulse %.9g N s, want %.9g (error %.2g)", maxBlock, c, l, sum, want, e)
				}
			}
		}
		t.Logf("MaxBlock %d: %d sweeps", maxBlock, rep.Iterations)
	}
}

// columns is stack with one column of each height in levels, side by
// side: one island each.
func columns(levels []int, h float64) ([]Body, []Point) {
	bodies := []Body{staticBody(vec{})}
	var pts []Point
	for c, n := range levels {
		bs, ps := stack(1, n, h, 0.5)
		off := int32(len(bodies) - 1)
		for _, b := range bs[1:] {
			b.Position[0] += float64(c) * 3 * h
			bodies = append(bodies, b)
		}
		for _, p := range ps {
			if p.A != 0 {
				p.A += off
			}
			p.B += off
			p.Position[0] += float64(c) * 3 * h
			p.Key |= uint64(c) << 40
			pts = append(pts, p)
		}
	}
	return bodies, pts
}

func TestLiveSettle(t *testing.T) {
	// The stopping rule with a loose bound: the sweeps stop converged only
	// after a sweep under the bound Tolerance, and a body whose skipped
	// changes add up to more than Tolerance is due again in that sweep.
	const tol = 1.0
	var l liveState
	l.reset(3, 2, tol, true) // slots 0 (fixed), 1, 2; points 0 (on 0, 1) and 1 (on 1, 2)
	l.note(0, 1, 10*tol, l.tick(0))
	l.note(1, 2, 10*tol, l.tick(1))
	if l.settle(500*tol, tol) {
		t.Fatal("settle stopped with an excess above the tolerance")
	}
	if want := liveFraction * 500 * tol; l.bound != want {
		t.Fatalf("bound after an excess of 500 tol: %v, want %v", l.bound, want)
	}
	// Point 0 changes body 1 by 0.8 tol: below the loose bound (5 tol),
	// it does not count, and point 1 stays skipped.
	l.note(0, 1, 0.8*tol, l.tick(0))
	if l.due(1, 1, 2) {
		t.Fatal("a change below the loose bound made point 1 due")
	}
	// Another 0.8 tol, and a sweep meeting the tolerance under the loose
	// bound: not yet converged, and body 1, 1.6 tol off, counts as moved
	// under the bound Tolerance, so point 1 is due again.
	l.note(0, 1, 0.8*tol, l.tick(0))
	if l.settle(0.5*tol, tol) {
		t.Fatal("settle stopped after a sweep under a bound looser than the tolerance")
	}
	if l.bound != tol {
		t.Fatalf("bound after meeting the tolerance: %v, want %v", l.bound, tol)
	}
	if !l.due(1, 1, 2) {
		t.Error("body 1 drifted 1.6 tol under the loose bound, yet point 1 is not due under the tight one")
	}
	if !l.settle(0.5*tol, tol) {
		t.Error("settle did not stop after a sweep within the tolerance under the bound tolerance")
	}
	// Without skipped rows the bound never loosens.
	l.reset(3, 2, tol, false)
	if l.settle(500*tol, tol) || l.bound != tol {
		t.Errorf("bound without skipped rows: %v, want %v", l.bound, tol)
	}
}
