package engine

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Drivers. A kinematic body with a Motion is placed at the motion's exact
// pose at the end of every step: at the start of the step its velocity and
// spin are set to the constant ones that carry it from where it is to the
// pose at t+dt, so contacts see the surface move exactly as the body will,
// and rounding never accumulates into a drift. A conveyor is a surface
// velocity of a static or kinematic body, given to its contact points
// (contact.Point.SurfaceVelocity) without moving the body.

// A Motion prescribes the pose of a kinematic body over time.
type Motion interface {
	// Pose returns the body's pose (its shape origin and orientation) at
	// time t; base is the body's pose when the motion was attached.
	Pose(t float64, base shapes.Pose) shapes.Pose
}

// ErrBadMotion is wrapped by every error that rejects a motion or a conveyor.
var ErrBadMotion = errors.New("bad motion")

// checker is implemented by the motions of this package.
type checker interface{ check() error }

// Oscillation is one sinusoidal term of a Vibration: a displacement along
// Axis of Amplitude sin(2 pi Frequency t + Phase), or with Rotary a turn
// of that many radians about Axis.
type Oscillation struct {
	Rotary    bool
	Axis      shapes.Vec3 // any length but zero
	Amplitude float64     // m, or rad if Rotary
	Frequency float64     // Hz
	Phase     float64     // rad
}

// Vibration is a sum of sinusoidal oscillations about the base pose: the
// linear terms add up to a displacement d(t), the rotary ones to a
// rotation vector r(t) (the axis times the angle), which turns the body
// about Center (a world point of the base pose). A point x of the body in
// its base pose is at Center + R(r) (x - Center) + d at time t. Summing
// rotation vectors is exact for rotary terms about one axis and, for small
// amplitudes, to second order in them for several axes.
//
// The inclined straight-line vibration of a linear feeder track is one
// linear term along the vibration direction; the helical vibration of a
// bowl feeder a vertical linear term plus a rotary term about the bowl's
// axis, in phase.
type Vibration struct {
	Center shapes.Vec3
	Terms  []Oscillation
}

func (v *Vibration) check() error {
	if !finiteVec(v.Center) {
		return fmt.Errorf("%w: vibration centre must be finite", ErrBadMotion)
	}
	for i, o := range v.Terms {
		if !finiteVec(o.Axis) || !(o.Axis.Len() > 0) {
			return fmt.Errorf("%w: vibration term %d: the axis must be finite and not zero, got %v", ErrBadMotion, i+1, o.Axis)
		}
		if !(o.Frequency >= 0) || math.IsInf(o.Frequency, 0) || math.IsNaN(o.Amplitude) || math.IsInf(o.Amplitude, 0) ||
			math.IsNaN(o.Phase) || math.IsInf(o.Phase, 0) {
			return fmt.Errorf("%w: vibration term %d: amplitude and phase must be finite, frequency finite and >= 0", ErrBadMotion, i+1)
		}
	}
	return nil
}

// Offset returns the displacement and the rotation vector at time t.
func (v *Vibration) Offset(t float64) (d, r shapes.Vec3) {
	for _, o := range v.Terms {
		s := o.Amplitude * math.Sin(2*math.Pi*o.Frequency*t+o.Phase)
		a := o.Axis.Normalize().Mul(s)
		if o.Rotary {
			r = r.Add(a)
		} else {
			d = d.Add(a)
		}
	}
	return d, r
}

// Pose implements Motion.
func (v *Vibration) Pose(t float64, base shapes.Pose) shapes.Pose {
	d, r := v.Offset(t)
	return turnAbout(base, v.Center, quatFromRotationVector(r), d)
}

// turnAbout turns pose p by rotation q about world point c, then moves it by d.
func turnAbout(p shapes.Pose, c shapes.Vec3, q shapes.Quat, d shapes.Vec3) shapes.Pose {
	return shapes.Pose{
		Position:    c.Add(q.Rotate(p.Position.Sub(c))).Add(d),
		Orientation: q.Mul(p.Orientation).Normalize(),
	}
}

func quatFromRotationVector(r shapes.Vec3) shapes.Quat {
	a := r.Len()
	if a == 0 {
		return mgl64.QuatIdent()
	}
	s, c := math.Sincos(a / 2)
	return shapes.Quat{W: c, V: r.Mul(s / a)}
}

// Tilt turns a body about the axis Axis through the world point Point at
// Rate (rad/s, right-handed about Axis) from time Start on; with Angle
// nonzero it stops once it has turned by |Angle| and holds there (a tilt
// table set to an angle).
type Tilt struct {
	Axis, Point shapes.Vec3
	Rate        float64
	Start       float64
	Angle       float64
}

func (tl *Tilt) check() error {
	if !finiteVec(tl.Axis) || !(tl.Axis.Len() > 0) || !finiteVec(tl.Point) {
		return fmt.Errorf("%w: tilt: the axis must be finite and not zero and the point finite", ErrBadMotion)
	}
	for _, v := range []float64{tl.Rate, tl.Start, tl.Angle} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: tilt: rate, start and angle must be finite numbers", ErrBadMotion)
		}
	}
	if tl.Rate == 0 {
		return fmt.Errorf("%w: tilt: the rate must not be zero (a table set to an angle turns there at its rate)", ErrBadMotion)
	}
	return nil
}

// At returns the angle turned by time t.
func (tl *Tilt) At(t float64) float64 {
	a := tl.Rate * max(t-tl.Start, 0)
	if lim := math.Abs(tl.Angle); lim > 0 && math.Abs(a) > lim {
		a = math.Copysign(lim, a)
	}
	return a
}

// Pose implements Motion.
func (tl *Tilt) Pose(t float64, base shapes.Pose) shapes.Pose {
	return turnAbout(base, tl.Point, mgl64.QuatRotate(tl.At(t), tl.Axis.Normalize()), shapes.Vec3{})
}

// PoseTable is a body's pose over time from a table: positions are
// interpolated linearly, orientations by spherical linear interpolation
// (Shoemake, "Animating rotation with quaternion curves", SIGGRAPH 1985)
// along the shorter arc, so consecutive orientations should differ by less
// than half a turn. Before the first time the body holds the first pose,
// after the last the last, unless Repeat plays the table again and again
// with period Times[last] - Times[0] (the last pose should then equal the
// first). The poses are the body's own, unless Relative: then each is a
// move from the base pose, the body's shape origin shifted by the pose's
// position and its axes turned by the pose's orientation (world frame), so
// that a table whose first row is zero starts the body where it stands.
type PoseTable struct {
	Times    []float64
	Poses    []shapes.Pose
	Repeat   bool
	Relative bool
}

func (p *PoseTable) check() error {
	if len(p.Times) == 0 || len(p.Times) != len(p.Poses) {
		return fmt.Errorf("%w: pose table: needs at least one row and as many times as poses, got %d and %d", ErrBadMotion, len(p.Times), len(p.Poses))
	}
	for i, t := range p.Times {
		if math.IsNaN(t) || math.IsInf(t, 0) || (i > 0 && !(t > p.Times[i-1])) {
			return fmt.Errorf("%w: pose table row %d: times must be finite and increasing, got %g after %g", ErrBadMotion, i+1, t, p.Times[max(i-1, 0)])
		}
		q := p.Poses[i].Orientation
		if !finiteVec(p.Poses[i].Position) || !(q.Len() > 0) || math.IsInf(q.Len(), 0) {
			return fmt.Errorf("%w: pose table row %d: position must be finite and the orientation a nonzero quaternion", ErrBadMotion, i+1)
		}
	}
	if p.Repeat && len(p.Times) < 2 {
		return fmt.Errorf("%w: pose table: a repeating table needs at least two rows", ErrBadMotion)
	}
	return nil
}

// Pose implements Motion.
func (p *PoseTable) Pose(t float64, base shapes.Pose) shapes.Pose {
	q := p.at(t)
	if p.Relative {
		q = shapes.Pose{Position: base.Position.Add(q.Position), Orientation: q.Orientation.Mul(base.Orientation).Normalize()}
	}
	return q
}

// at interpolates the table at time t.
func (p *PoseTable) at(t float64) shapes.Pose {
	n := len(p.Times)
	t0, t1 := p.Times[0], p.Times[n-1]
	if p.Repeat && t1 > t0 {
		t = t0 + math.Mod(t-t0, t1-t0)
		if t < t0 {
			t += t1 - t0
		}
	}
	if t <= t0 {
		return shapes.Pose{Position: p.Poses[0].Position, Orientation: p.Poses[0].Orientation.Normalize()}
	}
	if t >= t1 {
		return shapes.Pose{Position: p.Poses[n-1].Position, Orientation: p.Poses[n-1].Orientation.Normalize()}
	}
	i := sort.SearchFloat64s(p.Times, t) // Times[i-1] < t <= Times[i]
	a, b := p.Poses[i-1], p.Poses[i]
	f := (t - p.Times[i-1]) / (p.Times[i] - p.Times[i-1])
	return shapes.Pose{
		Position:    a.Position.Add(b.Position.Sub(a.Position).Mul(f)),
		Orientation: mgl64.QuatSlerp(a.Orientation, b.Orientation, f).Normalize(),
	}
}

// ReadPoseTable reads a pose table from CSV: a header naming the columns
// time, x, y, z and optionally qw, qx, qy, qz (any order, any case; other
// columns are errors), then one row per time. Times are in seconds;
// positions are multiplied by lengthScale to get metres (0.001 for a
// table in mm). A missing orientation is the identity. name labels errors
// ("feeder.csv:12: ...").
func ReadPoseTable(r io.Reader, name string, lengthScale float64) (*PoseTable, error) {
	if !(lengthScale > 0) || math.IsInf(lengthScale, 0) {
		return nil, fmt.Errorf("%s: length scale must be positive, got %g", name, lengthScale)
	}
	cr := csv.NewReader(r)
	cr.TrimLeadingSpace = true
	cr.Comment = '#'
	header, err := cr.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("%s: empty file; want a header time,x,y,z[,qw,qx,qy,qz] and rows", name)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	names := []string{"time", "x", "y", "z", "qw", "qx", "qy", "qz"}
	col := [8]int{-1, -1, -1, -1, -1, -1, -1, -1}
	for i, h := range header {
		h = strings.ToLower(strings.TrimSpace(h))
		k := -1
		for j, nm := range names {
			if h == nm {
				k = j
			}
		}
		if k < 0 {
			return nil, fmt.Errorf("%s:1: unknown column %q; the columns are time, x, y, z and optionally qw, qx, qy, qz", name, header[i])
		}
		if col[k] >= 0 {
			return nil, fmt.Errorf("%s:1: column %q given twice", name, h)
		}
		col[k] = i
	}
	for k := 0; k < 4; k++ {
		if col[k] < 0 {
			return nil, fmt.Errorf("%s:1: missing column %q (need time, x, y, z)", name, names[k])
		}
	}
	nq := 0
	for k := 4; k < 8; k++ {
		if col[k] >= 0 {
			nq++
		}
	}
	if nq != 0 && nq != 4 {
		return nil, fmt.Errorf("%s:1: give all of qw, qx, qy, qz or none", name)
	}
	cr.FieldsPerRecord = len(header)
	p := &PoseTable{}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		line, _ := cr.FieldPos(0)
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, fmt.Errorf("%s:%d: %v", name, pe.Line, pe.Err)
			}
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		var v [8]float64
		v[4] = 1
		for k, c := range col {
			if c < 0 {
				continue
			}
			x, err := strconv.ParseFloat(strings.TrimSpace(rec[c]), 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, fmt.Errorf("%s:%d: %s: want a finite number, got %q", name, line, names[k], rec[c])
			}
			v[k] = x
		}
		if n := len(p.Times); n > 0 && !(v[0] > p.Times[n-1]) {
			return nil, fmt.Errorf("%s:%d: time %g does not follow %g; times must increase", name, line, v[0], p.Times[n-1])
		}
		q := shapes.Quat{W: v[4], V: shapes.Vec3{v[5], v[6], v[7]}}
		if !(q.Len() > 1e-9) {
			return nil, fmt.Errorf("%s:%d: the orientation quaternion is zero", name, line)
		}
		p.Times = append(p.Times, v[0])
		p.Poses = append(p.Poses, shapes.Pose{Position: shapes.Vec3{v[1], v[2], v[3]}.Mul(lengthScale), Orientation: q.Normalize()})
	}
	if len(p.Times) == 0 {
		return nil, fmt.Errorf("%s: no rows after the header", name)
	}
	return p, nil
}

// motionState is a kinematic body's motion and its pose when attached.
type motionState struct {
	body BodyID
	m    Motion
	base shapes.Pose
}

// SetMotion makes a kinematic body follow m from now on (nil removes its
// motion and stops it). The body is moved to the motion's pose at the
// current time.
func (w *World) SetMotion(id BodyID, m Motion) error {
	if id < 0 || int(id) >= len(w.b.kind) {
		return fmt.Errorf("%w: no body %d", ErrBadMotion, id)
	}
	if w.b.kind[id] != Kinematic {
		return fmt.Errorf("%w: body %q is %s; only kinematic bodies follow a motion", ErrBadMotion, w.b.name[id], w.b.kind[id])
	}
	if c, ok := m.(checker); ok {
		if err := c.check(); err != nil {
			return fmt.Errorf("body %q: %w", w.b.name[id], err)
		}
	}
	ms := &w.mech.motions
	k := -1
	for i := range *ms {
		if (*ms)[i].body == id {
			k = i
		}
	}
	if m == nil {
		if k >= 0 {
			*ms = append((*ms)[:k], (*ms)[k+1:]...)
		}
		w.b.vel[id], w.b.spin[id] = shapes.Vec3{}, shapes.Vec3{}
		w.updatePowered()
		return nil
	}
	base := shapes.Pose{Position: w.b.pos[id], Orientation: w.b.rot[id]}
	if k >= 0 {
		(*ms)[k].m, (*ms)[k].base = m, base
	} else {
		*ms = append(*ms, motionState{body: id, m: m, base: base})
	}
	p := m.Pose(w.time, base)
	if !finiteVec(p.Position) || !(p.Orientation.Len() > 0) {
		return fmt.Errorf("%w: body %q: the motion's pose at t = %g s is not finite", ErrBadMotion, w.b.name[id], w.time)
	}
	w.b.pos[id], w.b.rot[id] = p.Position, p.Orientation.Normalize()
	w.active.poseAll = true // (active.go)
	w.b.bounds[id] = w.worldBounds(id, 0)
	_ = w.collision.bp.Move(int32(id), w.b.bounds[id])
	w.updatePowered()
	return nil
}

// SetConveyor gives a static or kinematic body a surface velocity (m/s, in
// the body's own axes, so it turns with the body): friction drags what
// touches the body toward moving at that velocity relative to it, as on a
// belt, while the body itself stays put. Only the part of the velocity in
// each contact's tangent plane counts, on every face of the body; give side
// rails bodies of their own. Zero removes it.
func (w *World) SetConveyor(id BodyID, v shapes.Vec3) error {
	if id < 0 || int(id) >= len(w.b.kind) {
		return fmt.Errorf("%w: no body %d", ErrBadMotion, id)
	}
	if w.b.kind[id] == Dynamic {
		return fmt.Errorf("%w: body %q is dynamic; a conveyor surface belongs to a static or kinematic body", ErrBadMotion, w.b.name[id])
	}
	if !finiteVec(v) {
		return fmt.Errorf("%w: body %q: conveyor velocity must be finite, got %v", ErrBadMotion, w.b.name[id], v)
	}
	m := &w.mech
	for len(m.belt) <= int(id) {
		m.belt = append(m.belt, shapes.Vec3{})
	}
	was := m.belt[id] != (shapes.Vec3{})
	m.belt[id] = v
	switch now := v != (shapes.Vec3{}); {
	case now && !was:
		m.belts++
	case was && !now:
		m.belts--
	}
	w.updatePowered()
	for i, k := range w.b.kind {
		if k == Dynamic {
			w.wake(BodyID(i)) // what rests on it must feel it
		}
	}
	return nil
}

// Conveyor returns a body's conveyor surface velocity (body frame).
func (w *World) Conveyor(id BodyID) shapes.Vec3 {
	if int(id) < len(w.mech.belt) {
		return w.mech.belt[id]
	}
	return shapes.Vec3{}
}

// surfaceVelocity is the contact.Point.SurfaceVelocity of a contact
// between a and b: the velocity that friction drives b's material velocity
// minus a's toward, u_a - u_b with the conveyors' world velocities u.
func (w *World) surfaceVelocity(a, b BodyID) shapes.Vec3 {
	m := &w.mech
	var u shapes.Vec3
	if m.belts == 0 {
		return u
	}
	if int(a) < len(m.belt) && m.belt[a] != (shapes.Vec3{}) {
		u = w.b.rot[a].Rotate(m.belt[a])
	}
	if int(b) < len(m.belt) && m.belt[b] != (shapes.Vec3{}) {
		u = u.Sub(w.b.rot[b].Rotate(m.belt[b]))
	}
	return u
}

// drive sets the velocity and spin of every driven body to those that take
// it from its pose now to its motion's pose at the end of the step.
func (w *World) drive(dt float64) {
	t := w.time + dt
	for i := range w.mech.motions {
		ms := &w.mech.motions[i]
		id := ms.body
		p := ms.m.Pose(t, ms.base)
		w.b.vel[id] = p.Position.Sub(w.b.pos[id]).Mul(1 / dt)
		w.b.spin[id] = rotationVector(p.Orientation.Normalize().Mul(w.b.rot[id].Conjugate())).Mul(1 / dt)
	}
}
