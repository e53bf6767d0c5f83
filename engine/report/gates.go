package report

import (
	"bufio"
	"strconv"

	"clatter/engine/scene"
	"clatter/shapes/resting"
)

// GatesFile is the file of gate crossings Run writes when the scene has gates.
const GatesFile = "gates.csv"

// GatesHeader is the first line of gates.csv: each crossing's time, gate,
// body, the face facing gravity as it crossed, and its centre of mass and
// velocity there.
const GatesHeader = "time,gate,body,face_down,x,y,z,vx,vy,vz"

// Gate is one gate's count in summary.json.
type Gate struct {
	Name  string `json:"name"`
	Count int64  `json:"count"`
	// Rate is crossings per minute of simulated time.
	Rate float64 `json:"rate"`
	// Faces counts the crossings by face_down (the face number as text,
	// "none" for a round body).
	Faces map[string]int64 `json:"faces"`
}

// gateCounter writes gates.csv and counts the crossings of a run.
type gateCounter struct {
	out    *bufio.Writer // nil: count only
	counts []int64
	faces  []map[string]int64
}

func newGateCounter(n int) *gateCounter {
	g := &gateCounter{counts: make([]int64, n), faces: make([]map[string]int64, n)}
	for i := range g.faces {
		g.faces[i] = map[string]int64{}
	}
	return g
}

// FaceKey is how a face_down is written as a key: its number, or "none".
func FaceKey(face int) string {
	if face < 0 {
		return "none"
	}
	return strconv.Itoa(face)
}

// crossings takes the world's crossings of the last step.
func (r *runner) crossings() {
	gc := r.gates
	if gc == nil {
		return
	}
	for _, c := range r.w.Crossings() {
		i := r.index[c.Body]
		face := FaceDown(r.facesOf(i), c.Orientation, r.w.Config().Gravity)
		gc.counts[c.Gate]++
		gc.faces[c.Gate][FaceKey(face)]++
		if gc.out == nil {
			continue
		}
		p := r.u.VecFromSI(c.Position, scene.Length)
		v := r.u.VecFromSI(c.Velocity, scene.Speed)
		b := r.row[:0]
		b = strconv.AppendFloat(b, clean(c.Time), 'g', sigDigits, 64)
		b = append(b, ',')
		b = appendCSVField(b, r.s.Gates[c.Gate].Name)
		b = append(b, ',')
		b = appendCSVField(b, r.s.Bodies[i].Name)
		b = append(b, ',')
		if face >= 0 {
			b = strconv.AppendInt(b, int64(face), 10)
		}
		for _, x := range [...]float64{p[0], p[1], p[2], v[0], v[1], v[2]} {
			b = append(b, ',')
			b = strconv.AppendFloat(b, x, 'g', sigDigits, 64)
		}
		b = append(b, '\n')
		gc.out.Write(b)
		r.row = b
	}
}

// gateSummary returns the gates' counts for summary.json, over a run of
// the given simulated time.
func (r *runner) gateSummary(time float64) []Gate {
	if r.gates == nil {
		return nil
	}
	out := make([]Gate, len(r.s.Gates))
	for g, sg := range r.s.Gates {
		rate := 0.0
		if time > 0 {
			rate = float64(r.gates.counts[g]) / time * 60
		}
		out[g] = Gate{Name: sg.Name, Count: r.gates.counts[g], Rate: clean(rate), Faces: r.gates.faces[g]}
	}
	return out
}

// facesOf returns the resting analysis of scene body i, computed once.
func (r *runner) facesOf(i int) []resting.Face {
	faces, ok := r.faces[i]
	if !ok {
		faces = Faces(r.w, r.ids[i])
		r.faces[i] = faces
	}
	return faces
}
