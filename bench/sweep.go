package bench

import (
	"bytes"
	"context"
	"encoding/binary"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
	"testing/fstest"

	"clatter/engine/scene"
	"clatter/engine/sweep"
	"clatter/shapes"
)

func init() {
	Register(
		Benchmark{Name: "SweepDrop1", Fn: SweepDrop1, Workers: 1},
		Benchmark{Name: "SweepDrop2", Fn: SweepDrop2, Baseline: "SweepDrop1", Workers: 2},
	)
}

// SweepDrop1 and SweepDrop2 run a drop study of b.N trials on 1 and 2
// workers: a 40-vertex part (an STL mesh of a seeded point cloud, 3 cm
// across) dropped 0.2 m at uniformly random orientations onto a floor,
// stepped at 1 ms until settled, its rows appended to trials.csv. One op
// is one trial, run as the study runs it: each worker builds its trials
// in its one world (scene.BuildIn: World.Reset keeps the world's buffers,
// broad and narrow phase and solver), and the part's hull is built once
// when the study is read. trials/s is reported, and the process's CPU
// time per trial (user and system, all threads, GC included) as
// cpu-ns/trial. On a shared
// machine the wall-time ratio of the two says more about the load than
// about the pool; the CPU per trial says what the pool costs: with a core
// for each worker, 2 workers run 2 x cpu1/cpu2 times as fast as one.
func SweepDrop1(b *testing.B) { sweepDrop(b, 1) }

// SweepDrop2 is SweepDrop1 on 2 workers.
func SweepDrop2(b *testing.B) { sweepDrop(b, 2) }

func sweepDrop(b *testing.B, workers int) {
	part := randomPart(rand.New(rand.NewPCG(7, 7)), 40)
	src := fmt.Sprintf(`[world]
step = 0.001
duration = 5.0
[material.abs]
friction = 0.4
restitution = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "part"
shape = { mesh = "part.stl" }
material = "abs"
density = 1050
position = [0, 0, 0.2]
[sweep]
trials = %d
seed = 7
[sweep.randomize]
orientation = ["part"]
`, b.N)
	fsys := fstest.MapFS{"part.stl": {Data: binarySTL(part)}}
	st, err := sweep.New([]byte(src), "drop.toml", scene.Options{Dir: ".", FS: fsys})
	if err != nil {
		b.Fatal(err)
	}
	if n := len(st.Scene.Bodies[1].Part.Hull.Vertices); n != 40 {
		b.Fatalf("the part's hull has %d vertices, want 40", n)
	}
	dir := b.TempDir()
	b.ReportAllocs()
	b.ResetTimer()
	cpu0, cpuOK := processCPU()
	info, err := st.Run(context.Background(), sweep.Options{Dir: dir, Workers: workers, Version: "bench"})
	if err != nil {
		b.Fatal(err)
	}
	cpu1, _ := processCPU()
	b.StopTimer()
	if cpuOK {
		b.ReportMetric(float64(cpu1-cpu0)/float64(b.N), "cpu-ns/trial")
	}
	if info.Ran != int64(b.N) {
		b.Fatalf("ran %d trials, want %d", info.Ran, b.N)
	}
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "trials/s")
}

// binarySTL writes a hull's faces, fanned into triangles, as binary STL.
func binarySTL(h *shapes.Hull) []byte {
	tris := h.Triangles()
	var buf bytes.Buffer
	buf.Write(make([]byte, 80))
	binary.Write(&buf, binary.LittleEndian, uint32(len(tris)))
	f32 := func(v shapes.Vec3) {
		for _, x := range v {
			binary.Write(&buf, binary.LittleEndian, math.Float32bits(float32(x)))
		}
	}
	for _, t := range tris {
		a, b, c := h.Vertices[t[0]], h.Vertices[t[1]], h.Vertices[t[2]]
		f32(b.Sub(a).Cross(c.Sub(a)).Normalize())
		f32(a)
		f32(b)
		f32(c)
		buf.Write([]byte{0, 0})
	}
	return buf.Bytes()
}
