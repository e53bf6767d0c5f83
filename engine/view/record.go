package view

import (
	"image/color"
	"math"

	"clatter/engine"
	"clatter/engine/scene"
	"clatter/shapes"
)

// Part is a set of triangles of one colour, in its body's shape frame.
type Part struct {
	Tris   []Tri
	Colour color.RGBA
}

// Body is what is drawn of one body of the scene.
type Body struct {
	Name string
	// Moves is set for dynamic and driven bodies, whose poses are kept at
	// every sample; others keep their first pose.
	Moves bool
	Parts []Part
	// plane is set for a plane, whose patch is cut when the scene's
	// extent is known.
	plane  *shapes.Plane
	index  int         // in the scene's bodies
	centre shapes.Vec3 // the centre of mass in the shape's frame
}

// Recorder keeps a run's shapes and the poses of its bodies at each
// sample. Observe it at every sample of a run (report.Options.Observe);
// then write its files.
type Recorder struct {
	s      *scene.Scene
	Bodies []Body
	// Times are the sample times, s; Poses[k][i] is the pose of the shape
	// frame of body i at Times[k] (only moving bodies change).
	Times []float64
	Poses [][]shapes.Pose
	// Up is the direction opposite to gravity (+z without gravity).
	Up shapes.Vec3
	// Tile is the side of the squares of the first plane's checker, m
	// (0 without a plane).
	Tile float64
}

// NewRecorder returns a recorder for a run of s.
func NewRecorder(s *scene.Scene) *Recorder {
	up := shapes.Vec3{0, 0, 1}
	if g := s.World.Gravity; g.Len() > 0 {
		up = g.Mul(-1 / g.Len())
	}
	return &Recorder{s: s, Up: up}
}

// Observe records the state of the world at time t; ids are the bodies
// of the scene in file order, as scene.Build returns them.
func (r *Recorder) Observe(t float64, w *engine.World, ids []engine.BodyID) {
	if r.Bodies == nil {
		r.shapes(w, ids)
	}
	if n := len(r.Times); n > 0 && t <= r.Times[n-1] {
		return
	}
	poses := make([]shapes.Pose, len(r.Bodies))
	for i, b := range r.Bodies {
		if b.Moves || len(r.Poses) == 0 {
			poses[i] = w.ShapePose(ids[b.index])
		} else {
			poses[i] = r.Poses[0][i]
		}
	}
	r.Times = append(r.Times, t)
	r.Poses = append(r.Poses, poses)
}

// shapes tessellates every body once.
func (r *Recorder) shapes(w *engine.World, ids []engine.BodyID) {
	r.Bodies = []Body{}
	for i, sb := range r.s.Bodies {
		c := materialColour(r.s.MaterialIndex(sb.Material))
		if sb.Static { // driven bodies are static too: moved, not pushed
			// Fixtures, driven ones (tracks, bowls, tilt tables) too, stay
			// behind the parts they carry, which share their material.
			c = towardGrey(c, 0.5)
		}
		b := Body{Name: sb.Name, Moves: !sb.Static || sb.Driven, index: i,
			centre: w.ShapePose(ids[i]).ApplyInv(w.Position(ids[i]))}
		if p, ok := w.Shape(ids[i]).(shapes.Plane); ok {
			b.plane = &p
		} else if pt := sb.Part; pt != nil && pt.Solid {
			// A part as its mesh, which the engineer knows, although
			// contact uses its convex hull (in the same frame).
			tris := make([]Tri, len(pt.Mesh.Triangles))
			for k, t := range pt.Mesh.Triangles {
				tris[k] = Tri{pt.Mesh.Vertices[t[0]], pt.Mesh.Vertices[t[1]], pt.Mesh.Vertices[t[2]]}
			}
			b.Parts = []Part{{Tris: tris, Colour: c}}
		} else {
			b.Parts = []Part{{Tris: triangles(w.Shape(ids[i])), Colour: c}}
		}
		r.Bodies = append(r.Bodies, b)
	}
}

// finish cuts the planes to patches around everything else the run
// reached, in two shades of their colour.
func (r *Recorder) finish() {
	around := r.extent(false)
	for i := range r.Bodies {
		b := &r.Bodies[i]
		if b.plane == nil || b.Parts != nil || len(r.Poses) == 0 {
			continue
		}
		pose := r.Poses[0][i]
		inv := pose.Inverse()
		c := towardGrey(materialColour(r.s.MaterialIndex(r.s.Bodies[b.index].Material)), 0.85)
		dark := color.RGBA{uint8(0.85 * float64(c.R)), uint8(0.85 * float64(c.G)), uint8(0.85 * float64(c.B)), 0xff}
		patch, tile := planePatch(*b.plane, pose, around)
		if r.Tile == 0 {
			r.Tile = tile
		}
		for k, tiles := range patch {
			local := make([]Tri, len(tiles))
			for j, t := range tiles {
				local[j] = Tri{inv.Apply(t[0]), inv.Apply(t[1]), inv.Apply(t[2])}
			}
			col := c
			if k == 1 {
				col = dark
			}
			b.Parts = append(b.Parts, Part{Tris: local, Colour: col})
		}
	}
}

// extent is the world box of every body's triangles at every sample
// (with planes once they have patches, if planes is set); empty when
// there are none.
func (r *Recorder) extent(planes bool) shapes.AABB {
	box := shapes.EmptyAABB()
	for i, b := range r.Bodies {
		if b.plane != nil && !planes {
			continue
		}
		local := shapes.EmptyAABB()
		for _, p := range b.Parts {
			for _, t := range p.Tris {
				for _, v := range t {
					local = local.Extend(v)
				}
			}
		}
		if local.Min[0] > local.Max[0] || math.IsInf(local.Min[0], 0) {
			continue
		}
		for k := range r.Poses {
			if k > 0 && !b.Moves {
				break
			}
			box = box.Union(local.Transform(r.Poses[k][i]))
		}
	}
	return box
}
