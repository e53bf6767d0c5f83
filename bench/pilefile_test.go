package bench

import (
	"flag"
	"math"
	"os"
	"slices"
	"testing"
)

var writePiles = flag.Bool("writepiles", false, "build the stored piles of Pile1000 and Pile200 with this engine and write them to testdata")

// TestWritePiles writes the stored piles (see pilefile.go); it runs only
// with -writepiles and takes a minute or more.
func TestWritePiles(t *testing.T) {
	if !*writePiles {
		t.Skip("writes the stored piles only with -writepiles")
	}
	for _, n := range []int{200, 1000} {
		data := encodePile(pileState(buildPile(t, n)))
		if err := os.WriteFile(pileFile(n), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func TestPileFileRoundTrip(t *testing.T) {
	// A pile read back is bit for bit the pile written: the stored state
	// is the one the generator's world had, not a rounding of it.
	ps := []pilePart{
		{pos: [3]float64{0.1, -0.2, 1e-300}},
		{vel: [3]float64{math.Copysign(0, -1), 5e-324, 1.0 / 3}},
	}
	ps[0].rot.W, ps[0].rot.V = 0.6, [3]float64{0, 0.8, 0}
	ps[1].rot.W, ps[1].spin = 1, [3]float64{2, 3, 4}
	got, err := decodePile(encodePile(ps))
	if err != nil {
		t.Fatal(err)
	}
	if !slices.EqualFunc(got, ps, sameBits) {
		t.Errorf("read back %v, wrote %v", got, ps)
	}
	for _, bad := range [][]byte{nil, []byte("CLPILE01"), encodePile(ps)[:30], append(encodePile(ps), 0)} {
		if _, err := decodePile(bad); err == nil {
			t.Errorf("decodePile(%d bytes) gave no error", len(bad))
		}
	}
}

func TestStoredPilesLoad(t *testing.T) {
	// Each benchmark's file holds its number of parts, all inside the
	// 0.5 m bin of binWorld and above its floor.
	for _, n := range []int{200, 1000} {
		ps, err := readPile(n)
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range ps {
			if p.pos[0] < -0.25 || p.pos[0] > 0.25 || p.pos[1] < -0.25 || p.pos[1] > 0.25 || p.pos[2] < 0 {
				t.Errorf("%s: part %d at %v, outside the bin", pileFile(n), i, p.pos)
			}
		}
	}
}

// sameBits reports whether a and b hold the same bits, so that a negative
// zero read back as a positive one (equal as numbers) is a difference.
func sameBits(a, b pilePart) bool {
	x, y := a.values(), b.values()
	for i := range x {
		if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
			return false
		}
	}
	return true
}
