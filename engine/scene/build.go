package scene

import (
	"fmt"

	"clatter/engine"
	"clatter/shapes"
)

// Config returns the engine settings of the scene's [world].
func (s *Scene) Config() engine.Config {
	cfg := engine.DefaultConfig()
	cfg.Gravity = s.World.Gravity
	cfg.RestSpeed = s.World.RestSpeed
	cfg.RestSpin = s.World.RestSpin
	cfg.RestTime = s.World.RestTime
	return cfg
}

// Build makes a world of the scene with its own settings; ids[i] is the
// id of s.Bodies[i], and s.Joints[i] is the world's joint engine.JointID(i).
func (s *Scene) Build() (*engine.World, []engine.BodyID, error) {
	return s.BuildWith(s.Config())
}

// BuildWith makes a world of the scene with the given engine settings (for
// example Config with NoEvents set, for headless trials).
func (s *Scene) BuildWith(cfg engine.Config) (*engine.World, []engine.BodyID, error) {
	w := &engine.World{}
	ids, err := s.BuildIn(w, cfg) // reuse.go
	if err != nil {
		return nil, nil, err
	}
	return w, ids, nil
}

// build puts the scene into the empty world w.
func (s *Scene) build(w *engine.World) ([]engine.BodyID, error) {
	bd := &builder{s: s, w: w, mats: map[string]int{}}
	for _, step := range []func() error{bd.materials, bd.pairs, bd.bodies, s.stiffnessError, bd.joints, bd.drives, bd.kicks, bd.gates} {
		if err := step(); err != nil {
			return nil, err
		}
	}
	if err := s.checkOverlaps(w, bd.ids); err != nil {
		return nil, err
	}
	return bd.ids, nil
}

// builder puts a scene's parts into a world, in order.
type builder struct {
	s    *Scene
	w    *engine.World
	mats map[string]int // material indices by name
	ids  []engine.BodyID
}

// fail is a build error at a line of the scene.
func (s *Scene) fail(line int, format string, args ...any) error {
	return Errors{{File: s.File, Line: line, Msg: fmt.Sprintf(format, args...)}}
}

func (bd *builder) materials() error {
	for _, m := range bd.s.Materials {
		i, err := bd.w.AddMaterial(engine.Material{Name: m.Name, Friction: m.Friction, StaticFriction: m.StaticFriction, Restitution: m.Restitution,
			Stiffness: m.Stiffness.engine()}) // stiffness.go
		if err != nil {
			return bd.s.fail(m.Line, "%v", err)
		}
		bd.mats[m.Name] = i
	}
	return nil
}

// material returns the index of a material by name.
func (bd *builder) material(name string) int {
	if i, ok := bd.mats[name]; ok {
		return i
	}
	return 0 // the engine's default material
}

func (bd *builder) pairs() error {
	for _, p := range bd.s.Pairs {
		a, b := bd.material(p.A), bd.material(p.B)
		c := bd.w.Pair(a, b)
		if p.Friction != nil {
			c.Friction = *p.Friction
			if p.StaticFriction == nil && c.StaticFriction < c.Friction {
				c.StaticFriction = c.Friction
			}
		}
		if p.StaticFriction != nil {
			c.StaticFriction = *p.StaticFriction
		}
		if p.Restitution != nil {
			c.Restitution = *p.Restitution
		}
		if p.Stiffness.Given() {
			c.Stiffness = p.Stiffness.engine() // stiffness.go
		}
		if c.StaticFriction < c.Friction {
			return bd.s.fail(p.Line, "[[pair]] %s/%s: static_friction %g must be at least friction %g", p.A, p.B, c.StaticFriction, c.Friction)
		}
		if err := bd.w.SetPair(a, b, c); err != nil {
			return bd.s.fail(p.Line, "[[pair]] %s/%s: %v", p.A, p.B, err)
		}
	}
	return nil
}

func (bd *builder) bodies() error {
	bd.ids = make([]engine.BodyID, len(bd.s.Bodies))
	for i := range bd.s.Bodies {
		b := &bd.s.Bodies[i]
		def := engine.BodyDef{
			Name:        b.Name,
			Kind:        engine.Dynamic,
			Shape:       b.Shape,
			Material:    bd.material(b.Material),
			Position:    b.Position,
			Orientation: b.Orientation,
			Velocity:    b.Velocity,
			Spin:        b.Spin,
		}
		switch {
		case b.Driven:
			def.Kind = engine.Kinematic
		case b.Static:
			def.Kind = engine.Static
		default:
			props := b.Props
			def.Props = &props
		}
		id, err := bd.w.AddBody(def)
		if err != nil {
			return bd.s.fail(b.Line, "body %q: %v", b.Name, err)
		}
		bd.ids[i] = id
	}
	return nil
}

// stiffnessError refuses materials whose contact laws do not meet
// (stiffness.go).
func (s *Scene) stiffnessError() error {
	if line, msg := s.stiffnessConflict(); msg != "" {
		return s.fail(line, "%s", msg)
	}
	return nil
}

// id returns the world's id of a body by name.
func (bd *builder) id(name string) engine.BodyID { return bd.ids[bd.s.BodyIndex(name)] }

func (bd *builder) joints() error {
	for _, j := range bd.s.Joints {
		def := j.Def
		def.A, def.B = bd.id(j.A), engine.Ground
		if j.B != "" {
			def.B = bd.id(j.B)
		}
		id, err := bd.w.AddJoint(def)
		if err != nil {
			return bd.s.fail(j.Line, "%v", err)
		}
		for _, c := range j.Program {
			if err := bd.w.ScheduleMotor(id, c.Time, c.Motor); err != nil {
				return bd.s.fail(j.Line, "%v", err)
			}
		}
	}
	return nil
}

func (bd *builder) drives() error {
	for _, d := range bd.s.Drives {
		id := bd.id(d.Body)
		if d.Motion != nil {
			if err := bd.w.SetMotion(id, d.Motion); err != nil {
				return bd.s.fail(d.Line, "drive of %q: %v", d.Body, err)
			}
		}
		if d.Conveyor != (shapes.Vec3{}) {
			if err := bd.w.SetConveyor(id, d.Conveyor); err != nil {
				return bd.s.fail(d.Line, "drive of %q: %v", d.Body, err)
			}
		}
	}
	return nil
}

func (bd *builder) kicks() error {
	for _, k := range bd.s.Kicks {
		if err := bd.w.Kick(bd.id(k.Body), k.Time, k.Impulse, k.At, k.AtCenter); err != nil {
			return bd.s.fail(k.Line, "%v", err)
		}
	}
	return nil
}

func (bd *builder) gates() error {
	for _, g := range bd.s.Gates {
		if _, err := bd.w.AddGate(engine.Gate{Name: g.Name, At: g.At, Normal: g.Normal, Radius: g.Radius}); err != nil {
			return bd.s.fail(g.Line, "%v", err)
		}
	}
	return nil
}

func (s *Scene) lineOf(key ...string) int { return s.lines.line(key) }
