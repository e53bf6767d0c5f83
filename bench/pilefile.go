package bench

import (
	"embed"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"clatter/engine"
	"clatter/shapes"
)

// The piles of Pile1000 and Pile200 are stored, not built when the
// benchmark runs: building one takes 1500 steps (25 s for 1000 bodies),
// and a pile built by the engine under test changes with every change of
// its physics, so the figure would measure a different pile each time.
// The files hold the state of the pile buildPile left (at 5159a49) and are
// written again by
//
//	go test ./bench -run TestWritePiles -writepiles
//
// A file is pileMagic, the number of parts as a little-endian uint32, and
// then for each part in the order of buildPile thirteen little-endian
// float64: centre of mass (3), orientation (w, x, y, z), velocity (3) and
// spin (3, world frame); the bin's floor and walls are not stored.
//
//go:embed testdata/pile1000.bin testdata/pile200.bin
var pileFiles embed.FS

const pileMagic = "CLPILE01"

// pileSettle is the number of 1 ms steps a loaded pile runs before it is
// timed. The pile starts with no manifolds, pairs or impulses kept from
// earlier steps: its first steps run every query in full and solve from
// cold, and since every resting pair then made its first full query at the
// same step, the still pairs all query again together 128 steps later and
// 256 steps after that (collide/persist.go, persistAgeStill), some 45 full
// queries a step for some 50 steps each time, against some 15 a step
// between. The timed steps start after the first of those rounds and end
// before the second for up to 100 of them, where the pile's queries and
// solves run at the rate of the long run.
const pileSettle = 250

// pilePart is one part's state in a pile file.
type pilePart struct {
	pos       shapes.Vec3
	rot       shapes.Quat
	vel, spin shapes.Vec3
}

// pileFile is the name of the stored pile of n parts.
func pileFile(n int) string { return fmt.Sprintf("testdata/pile%d.bin", n) }

// storedPile returns the bin of buildPile with the stored pile of n parts
// in it, stepped pileSettle steps.
func storedPile(b testing.TB, n int) *engine.World {
	ps, err := readPile(n)
	if err != nil {
		b.Fatal(err)
	}
	w, mat, add := binWorld(b, 0.25, 0.25)
	parts := pileParts(rand.New(rand.NewPCG(1000, 1)))
	for i, p := range ps {
		add(engine.BodyDef{Name: "part", Shape: mixedPart(i, parts), Density: 1050, Material: mat,
			Position: p.pos, Orientation: p.rot, Velocity: p.vel, Spin: p.spin})
	}
	for i := 0; i < pileSettle; i++ {
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	return w
}

// readPile reads the stored pile of n parts, an error naming its file if
// it cannot be read or holds another number of parts.
func readPile(n int) ([]pilePart, error) {
	data, err := pileFiles.ReadFile(pileFile(n))
	if err != nil {
		return nil, err
	}
	ps, err := decodePile(data)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", pileFile(n), err)
	}
	if len(ps) != n {
		return nil, fmt.Errorf("%s: %d parts, want %d", pileFile(n), len(ps), n)
	}
	return ps, nil
}

// pileState returns the state of the dynamic bodies of w, in order.
func pileState(w *engine.World) []pilePart {
	var ps []pilePart
	for i := 0; i < w.NumBodies(); i++ {
		id := engine.BodyID(i)
		if w.KindOf(id) != engine.Dynamic {
			continue
		}
		ps = append(ps, pilePart{w.Position(id), w.Orientation(id), w.Velocity(id), w.Spin(id)})
	}
	return ps
}

// encodePile writes ps in the pile file format.
func encodePile(ps []pilePart) []byte {
	out := binary.LittleEndian.AppendUint32([]byte(pileMagic), uint32(len(ps)))
	for _, p := range ps {
		for _, v := range p.values() {
			out = binary.LittleEndian.AppendUint64(out, math.Float64bits(v))
		}
	}
	return out
}

// decodePile reads a pile file.
func decodePile(data []byte) ([]pilePart, error) {
	if len(data) < len(pileMagic)+4 || string(data[:len(pileMagic)]) != pileMagic {
		return nil, errors.New("not a pile file (no " + pileMagic + " header)")
	}
	data = data[len(pileMagic):]
	n := int(binary.LittleEndian.Uint32(data))
	data = data[4:]
	const size = 13 * 8
	if len(data) != n*size {
		return nil, fmt.Errorf("%d bytes of parts, want %d for %d parts", len(data), n*size, n)
	}
	ps := make([]pilePart, n)
	for i := range ps {
		var v [13]float64
		for k := range v {
			v[k] = math.Float64frombits(binary.LittleEndian.Uint64(data[(i*13+k)*8:]))
		}
		ps[i] = pilePart{
			pos:  shapes.Vec3{v[0], v[1], v[2]},
			rot:  shapes.Quat{W: v[3], V: shapes.Vec3{v[4], v[5], v[6]}},
			vel:  shapes.Vec3{v[7], v[8], v[9]},
			spin: shapes.Vec3{v[10], v[11], v[12]},
		}
	}
	return ps, nil
}

// values lists p's thirteen numbers in file order.
func (p pilePart) values() [13]float64 {
	return [13]float64{p.pos[0], p.pos[1], p.pos[2], p.rot.W, p.rot.V[0], p.rot.V[1], p.rot.V[2],
		p.vel[0], p.vel[1], p.vel[2], p.spin[0], p.spin[1], p.spin[2]}
}
