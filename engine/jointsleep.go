package engine

import "clatter/shapes"

// wakeJointed wakes the bodies jointed to a body that has just woken.
func (w *World) wakeJointed(id BodyID) {
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		switch {
		case jt.a == id && jt.b != Ground:
			w.wake(jt.b)
		case jt.b == id:
			w.wake(jt.a)
		}
	}
}

// unionJoints puts jointed dynamic bodies into one island.
func (w *World) unionJoints() {
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		if jt.b != Ground && w.b.kind[jt.a] == Dynamic && w.b.kind[jt.b] == Dynamic {
			w.union(int32(jt.a), int32(jt.b))
		}
	}
}

// jointsKeepAwake keeps awake the islands jointed to a moving kinematic
// body or driven by a running motor.
func (w *World) jointsKeepAwake() {
	c := &w.collision
	moving := func(id BodyID) bool {
		return id != Ground && w.b.kind[id] == Kinematic && (w.b.vel[id] != (shapes.Vec3{}) || w.b.spin[id] != (shapes.Vec3{}))
	}
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		if m := jt.def.Motor; m.Mode == MotorSpeed && m.Speed != 0 {
			// A running motor keeps its bodies awake, stalled or not.
			for _, id := range [2]BodyID{jt.a, jt.b} {
				if id != Ground && w.b.kind[id] == Dynamic {
					c.islandRest[w.find(int32(id))] = 0
				}
			}
		}
		if moving(jt.b) && w.b.kind[jt.a] == Dynamic {
			c.islandRest[w.find(int32(jt.a))] = 0
		}
		if moving(jt.a) && jt.b != Ground && w.b.kind[jt.b] == Dynamic {
			c.islandRest[w.find(int32(jt.b))] = 0
		}
	}
}
