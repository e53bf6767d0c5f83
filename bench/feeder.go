package bench

import (
	"path/filepath"
	"runtime"
	"testing"

	"clatter/engine/scene"
)

func init() {
	Register(Benchmark{Name: "BowlFeeder50", Fn: BowlFeeder50})
}

// BowlFeeder50 is one step (0.5 ms) of the bowl feeder example,
// testdata/feeder/bowl.toml: 50 blocks in a vibrating bowl kept as 618
// triangles, from 1 s after they were poured in (they lie on the floor
// and climb the track). The feeder target: at least as fast as real
// time, so the metric sim-s/s (simulated seconds per second of run time)
// should reach 1.
func BowlFeeder50(b *testing.B) {
	_, here, _, _ := runtime.Caller(0)
	s, err := scene.Load(filepath.Join(filepath.Dir(here), "..", "testdata", "feeder", "bowl.toml"))
	if err != nil {
		b.Fatal(err)
	}
	cfg := s.Config()
	cfg.NoEvents = true
	w, _, err := s.BuildWith(cfg)
	if err != nil {
		b.Fatal(err)
	}
	dt := s.World.Step
	for w.Time() < 1 {
		if err := w.Step(dt); err != nil {
			b.Fatal(err)
		}
		w.Crossings()
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := w.Step(dt); err != nil {
			b.Fatal(err)
		}
		w.Crossings()
	}
	b.ReportMetric(dt*float64(b.N)/b.Elapsed().Seconds(), "sim-s/s")
}
