package sweep

import (
	"math"
	"strings"
	"testing"

	"clatter/shapes"
	"clatter/shapes/resting"
)

func TestWilsonNewcombe(t *testing.T) {
	// R. G. Newcombe, "Two-sided confidence intervals for the single
	// proportion: comparison of seven methods", Statistics in Medicine 17,
	// 1998, Table I, method 3 (score interval without continuity
	// correction), 95 percent; values quoted from memory, to the 4 decimal
	// places the table gives.
	const tableTol = 0.5e-4 // the table's rounding
	for _, c := range []struct {
		k, n     int64
		low, top float64
	}{
		{81, 263, 0.2553, 0.3662},
		{15, 148, 0.0624, 0.1605},
		{0, 20, 0, 0.1611},
		{1, 29, 0.0061, 0.1718},
	} {
		lo, hi := Wilson(c.k, c.n, 0.95)
		if math.Abs(lo-c.low) > tableTol || math.Abs(hi-c.top) > tableTol {
			t.Errorf("Wilson(%d, %d) = [%.5f, %.5f], want [%.4f, %.4f]", c.k, c.n, lo, hi, c.low, c.top)
		}
	}
}

func TestWilsonDefinition(t *testing.T) {
	// The bounds are the roots of (p^ - p)^2 = z^2 p (1 - p) / n (Wilson
	// 1927): check the defining equation at each bound for many k and n.
	// z for 95 percent is 1.959964 (any normal table). 1e-12: rounding of
	// the closed form.
	const z, rootTol = 1.959963984540054, 1e-12
	for _, n := range []int64{1, 7, 50, 1000} {
		for k := int64(0); k <= n; k += max(1, n/7) {
			lo, hi := Wilson(k, n, 0.95)
			ph := float64(k) / float64(n)
			for _, p := range []float64{lo, hi} {
				if r := (ph-p)*(ph-p) - z*z*p*(1-p)/float64(n); math.Abs(r) > rootTol {
					t.Errorf("k %d n %d: bound %g leaves %g in the defining equation", k, n, p, r)
				}
			}
			if !(lo <= ph && ph <= hi) {
				t.Errorf("k %d n %d: [%g, %g] does not hold %g", k, n, lo, hi, ph)
			}
		}
	}
	if lo, hi := Wilson(0, 0, 0.95); lo != 0 || hi != 1 {
		t.Errorf("no trials: [%g, %g], want [0, 1]", lo, hi)
	}
}

func TestTrialSeeds(t *testing.T) {
	// Every (case, trial) of a study gets its own seed, and the seed does
	// not depend on anything else: brute force over a grid.
	seen := map[uint64][2]int64{}
	for c := int64(0); c < 50; c++ {
		for tr := int64(0); tr < 200; tr++ {
			s := TrialSeed(7, c, tr)
			if o, dup := seen[s]; dup {
				t.Fatalf("case %d trial %d has the seed of case %d trial %d", c, tr, o[0], o[1])
			}
			seen[s] = [2]int64{c, tr}
			if s != TrialSeed(7, c, tr) {
				t.Fatal("not a function of its arguments")
			}
		}
	}
	if TrialSeed(7, 1, 2) == TrialSeed(8, 1, 2) || TrialSeed(7, 1, 2) == TrialSeed(7, 2, 1) {
		t.Error("the seed ignores the sweep seed, or the order of case and trial")
	}
}

func TestShardSpans(t *testing.T) {
	// The shards of a study cover every trial exactly once, in blocks that
	// differ in size by at most one trial.
	for _, total := range []int64{1, 7, 100, 1001} {
		for _, n := range []int{1, 2, 3, 8, 13} {
			next, sizes := int64(0), map[int64]bool{}
			for k := 1; k <= n; k++ {
				lo, hi := Shard{Index: k, Count: n}.span(total)
				if lo != next || hi < lo {
					t.Fatalf("total %d shard %d/%d: [%d, %d), want from %d", total, k, n, lo, hi, next)
				}
				sizes[hi-lo] = true
				next = hi
			}
			if next != total || len(sizes) > 2 {
				t.Errorf("total %d in %d shards: ends at %d, sizes %v", total, n, next, sizes)
			}
		}
	}
}

func TestParseShard(t *testing.T) {
	for _, c := range []struct {
		in   string
		want Shard
		err  string
	}{
		{"2/8", Shard{2, 8}, ""},
		{" 1 / 1 ", Shard{1, 1}, ""},
		{"0/4", Shard{}, "K must be from 1 to N = 4"},
		{"5/4", Shard{}, "K must be from 1 to N = 4"},
		{"3", Shard{}, "write K/N"},
		{"a/b", Shard{}, "whole numbers"},
		{"1/0", Shard{}, "number of shards must be from 1"},
	} {
		got, err := ParseShard(c.in)
		if c.err != "" {
			if err == nil || !strings.Contains(err.Error(), c.err) {
				t.Errorf("ParseShard(%q): %v, want an error with %q", c.in, err, c.err)
			}
			continue
		}
		if err != nil || got != c.want {
			t.Errorf("ParseShard(%q) = %v, %v; want %v", c.in, got, err, c.want)
		}
	}
}

func TestShardFromEnv(t *testing.T) {
	// As each engine sets them: a Kubernetes Indexed Job gives
	// JOB_COMPLETION_INDEX from 0 to completions-1; a Slurm array
	// --array=A-B gives SLURM_ARRAY_TASK_ID in A..B, with _MIN = A,
	// _COUNT and _STEP.
	for _, c := range []struct {
		name  string
		env   map[string]string
		count int
		want  Shard
		err   string
	}{
		{"none", nil, 0, Shard{}, ""},
		{"kubernetes", map[string]string{EnvJobIndex: "0", EnvShardCount: "4"}, 0, Shard{1, 4}, ""},
		{"kubernetes last", map[string]string{EnvJobIndex: "3", EnvShardCount: "4"}, 0, Shard{4, 4}, ""},
		{"kubernetes count flag", map[string]string{EnvJobIndex: "2"}, 5, Shard{3, 5}, ""},
		{"kubernetes without count", map[string]string{EnvJobIndex: "2"}, 0, Shard{}, EnvShardCount},
		{"kubernetes index past count", map[string]string{EnvJobIndex: "4", EnvShardCount: "4"}, 0, Shard{}, "K must be from 1 to N = 4"},
		{"slurm from 1", map[string]string{EnvSlurmID: "1", EnvSlurmCount: "8", EnvSlurmMin: "1", EnvSlurmStep: "1"}, 0, Shard{1, 8}, ""},
		{"slurm from 0", map[string]string{EnvSlurmID: "7", EnvSlurmCount: "8", EnvSlurmMin: "0", EnvSlurmStep: "1"}, 0, Shard{8, 8}, ""},
		{"slurm with a step", map[string]string{EnvSlurmID: "6", EnvSlurmCount: "4", EnvSlurmMin: "0", EnvSlurmStep: "2"}, 0, Shard{4, 4}, ""},
		{"slurm uneven", map[string]string{EnvSlurmID: "3", EnvSlurmCount: "4", EnvSlurmMin: "0", EnvSlurmStep: "2"}, 0, Shard{}, "not evenly spaced"},
		{"slurm without count", map[string]string{EnvSlurmID: "3"}, 0, Shard{}, EnvSlurmCount},
		{"not a number", map[string]string{EnvJobIndex: "x"}, 0, Shard{}, "not a whole number"},
	} {
		got, src, err := ShardFromEnv(func(k string) string { return c.env[k] }, c.count)
		if c.err != "" {
			if err == nil || !strings.Contains(err.Error(), c.err) {
				t.Errorf("%s: %v, want an error with %q", c.name, err, c.err)
			}
			continue
		}
		if err != nil || got != c.want || (c.env != nil) != (src != "") {
			t.Errorf("%s: %v from %q, %v; want %v", c.name, got, src, err, c.want)
		}
	}
}

func TestGroupFaces(t *testing.T) {
	// A box's opposite faces are equal by symmetry (faces +x, -x, +y, -y,
	// +z, -z); a cube's six are one group; a cylinder's two caps are one
	// group apart from its curved side.
	for _, c := range []struct {
		name  string
		shape shapes.Shape
		want  []int
	}{
		{"box", shapes.Box{Half: shapes.Vec3{0.005, 0.01, 0.02}}, []int{0, 0, 2, 2, 4, 4}},
		{"cube", shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}, []int{0, 0, 0, 0, 0, 0}},
	} {
		faces, err := resting.OfShape(c.shape, shapes.Vec3{})
		if err != nil {
			t.Fatal(err)
		}
		got := groupFaces(faces)
		if len(got) != len(c.want) {
			t.Fatalf("%s: groups %v, want %v", c.name, got, c.want)
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("%s: groups %v, want %v", c.name, got, c.want)
				break
			}
		}
	}
	cyl, err := resting.OfShape(shapes.Cylinder{Radius: 0.01, HalfLength: 0.02}, shapes.Vec3{})
	if err != nil {
		t.Fatal(err)
	}
	g := groupFaces(cyl)
	var caps []int
	for i, f := range cyl {
		if !f.Curved() {
			caps = append(caps, i)
		} else if g[i] != i {
			t.Errorf("the curved side is grouped with face %d", g[i])
		}
	}
	if len(caps) != 2 || g[caps[0]] != g[caps[1]] {
		t.Errorf("cylinder faces %+v grouped %v: the caps should be one group", cyl, g)
	}
	// An off-centre centre of mass breaks the symmetry of the caps.
	off, err := resting.OfShape(shapes.Cylinder{Radius: 0.01, HalfLength: 0.02}, shapes.Vec3{0, 0, 0.005})
	if err != nil {
		t.Fatal(err)
	}
	g = groupFaces(off)
	if len(caps) == 2 && g[caps[0]] == g[caps[1]] {
		t.Errorf("caps at different heights from the centre of mass grouped: %v", g)
	}
}
