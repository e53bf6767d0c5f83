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
	fail := func(line int, format string, args ...any) error {
		return Errors{{File: s.File, Line: line, Msg: fmt.Sprintf(format, args...)}}
	}
	w, err := engine.NewWorld(cfg)
	if err != nil {
		return nil, nil, fail(s.lineOf("world"), "[world]: %v", err)
	}
	mats := map[string]int{}
	for _, m := range s.Materials {
		i, err := w.AddMaterial(engine.Material{Name: m.Name, Friction: m.Friction, StaticFriction: m.StaticFriction, Restitution: m.Restitution,
			Stiffness: m.Stiffness.engine()}) // stiffness.go
		if err != nil {
			return nil, nil, fail(m.Line, "%v", err)
		}
		mats[m.Name] = i
	}
	index := func(name string) int {
		if i, ok := mats[name]; ok {
			return i
		}
		return 0 // the engine's default material
	}
	for _, p := range s.Pairs {
		a, b := index(p.A), index(p.B)
		c := w.Pair(a, b)
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
			return nil, nil, fail(p.Line, "[[pair]] %s/%s: static_friction %g must be at least friction %g", p.A, p.B, c.StaticFriction, c.Friction)
		}
		if err := w.SetPair(a, b, c); err != nil {
			return nil, nil, fail(p.Line, "[[pair]] %s/%s: %v", p.A, p.B, err)
		}
	}
	ids := make([]engine.BodyID, len(s.Bodies))
	for i := range s.Bodies {
		b := &s.Bodies[i]
		def := engine.BodyDef{
			Name:        b.Name,
			Kind:        engine.Dynamic,
			Shape:       b.Shape,
			Material:    index(b.Material),
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
		id, err := w.AddBody(def)
		if err != nil {
			return nil, nil, fail(b.Line, "body %q: %v", b.Name, err)
		}
		ids[i] = id
	}
	if line, msg := s.stiffnessConflict(); msg != "" { // stiffness.go
		return nil, nil, fail(line, "%s", msg)
	}
	for _, j := range s.Joints {
		def := j.Def
		def.A, def.B = ids[s.BodyIndex(j.A)], engine.Ground
		if j.B != "" {
			def.B = ids[s.BodyIndex(j.B)]
		}
		id, err := w.AddJoint(def)
		if err != nil {
			return nil, nil, fail(j.Line, "%v", err)
		}
		for _, c := range j.Program {
			if err := w.ScheduleMotor(id, c.Time, c.Motor); err != nil {
				return nil, nil, fail(j.Line, "%v", err)
			}
		}
	}
	for _, d := range s.Drives {
		id := ids[s.BodyIndex(d.Body)]
		if d.Motion != nil {
			if err := w.SetMotion(id, d.Motion); err != nil {
				return nil, nil, fail(d.Line, "drive of %q: %v", d.Body, err)
			}
		}
		if d.Conveyor != (shapes.Vec3{}) {
			if err := w.SetConveyor(id, d.Conveyor); err != nil {
				return nil, nil, fail(d.Line, "drive of %q: %v", d.Body, err)
			}
		}
	}
	for _, k := range s.Kicks {
		id := ids[s.BodyIndex(k.Body)]
		if err := w.Kick(id, k.Time, k.Impulse, k.At, k.AtCenter); err != nil {
			return nil, nil, fail(k.Line, "%v", err)
		}
	}
	for _, g := range s.Gates {
		if _, err := w.AddGate(engine.Gate{Name: g.Name, At: g.At, Normal: g.Normal, Radius: g.Radius}); err != nil {
			return nil, nil, fail(g.Line, "%v", err)
		}
	}
	if err := s.checkOverlaps(w, ids); err != nil {
		return nil, nil, err
	}
	return w, ids, nil
}

func (s *Scene) lineOf(key ...string) int { return s.lines.line(key) }
