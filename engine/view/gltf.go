package view

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"os"

	"github.com/qmuntal/gltf"
	"github.com/qmuntal/gltf/modeler"

	"clatter/shapes"
)

// AnimationFile is the name of the animation a run writes.
const AnimationFile = "animation.glb"

// GLB returns the recording as a glTF 2.0 binary file (Khronos Group,
// "glTF 2.0 Specification", 2021): a node per body under a root node that
// turns the scene's up direction to glTF's +Y, a mesh per body with a
// material per colour, and for the moving bodies translation and rotation
// keyframes at the sample times, linearly interpolated. Lengths are in
// metres and times in seconds, as the specification requires.
func (r *Recorder) GLB() ([]byte, error) {
	if len(r.Poses) == 0 {
		return nil, fmt.Errorf("nothing was recorded")
	}
	r.finish()
	doc := gltf.NewDocument()
	doc.Asset.Generator = "clatter"
	up := upToY(r.Up)
	root := &gltf.Node{Name: "scene", Rotation: [4]float64{up.V[0], up.V[1], up.V[2], up.W}, Scale: [3]float64{1, 1, 1}}
	doc.Nodes = append(doc.Nodes, root)
	doc.Scenes[0].Nodes = []int{0}
	materials := map[color.RGBA]int{}
	nodes := make([]int, len(r.Bodies))
	for i, b := range r.Bodies {
		p := r.Poses[0][i]
		node := &gltf.Node{Name: b.Name, Scale: [3]float64{1, 1, 1},
			Translation: [3]float64(p.Position),
			Rotation:    [4]float64{p.Orientation.V[0], p.Orientation.V[1], p.Orientation.V[2], p.Orientation.W}}
		if b.plane != nil {
			// Marks the finite patch that stands for an unbounded plane.
			node.Extras = map[string]any{"patch": true}
		}
		if m := r.mesh(doc, b, materials); m >= 0 {
			node.Mesh = gltf.Index(m)
		}
		nodes[i] = len(doc.Nodes)
		root.Children = append(root.Children, nodes[i])
		doc.Nodes = append(doc.Nodes, node)
	}
	r.animate(doc, nodes)
	var buf bytes.Buffer
	if err := gltf.NewEncoder(&buf).Encode(doc); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// WriteGLB writes the recording as a glTF binary file.
func (r *Recorder) WriteGLB(path string) error {
	b, err := r.GLB()
	if err != nil {
		return err
	}
	return os.WriteFile(path, b, 0o644)
}

// mesh adds a body's mesh, a primitive per part with flat normals, and
// returns its index (-1 for a body without triangles).
func (r *Recorder) mesh(doc *gltf.Document, b Body, materials map[color.RGBA]int) int {
	m := &gltf.Mesh{Name: b.Name}
	for _, p := range b.Parts {
		var pos, nrm [][3]float32
		for _, t := range p.Tris {
			n := t.normal()
			if n == (shapes.Vec3{}) {
				continue // zero area: nothing to draw, and no normal
			}
			for _, v := range t {
				pos = append(pos, vec32(v))
				nrm = append(nrm, vec32(n))
			}
		}
		if len(pos) == 0 {
			continue
		}
		mat, ok := materials[p.Colour]
		if !ok {
			mat = len(doc.Materials)
			materials[p.Colour] = mat
			c := p.Colour
			metal, rough := 0.0, 0.8
			doc.Materials = append(doc.Materials, &gltf.Material{
				Name: fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B),
				PBRMetallicRoughness: &gltf.PBRMetallicRoughness{
					BaseColorFactor: &[4]float64{linear(c.R), linear(c.G), linear(c.B), 1},
					MetallicFactor:  &metal, RoughnessFactor: &rough,
				},
				// Static meshes may be open (trays, chutes): show both sides.
				DoubleSided: true,
			})
		}
		m.Primitives = append(m.Primitives, &gltf.Primitive{
			Attributes: gltf.PrimitiveAttributes{
				gltf.POSITION: modeler.WritePosition(doc, pos),
				gltf.NORMAL:   modeler.WriteNormal(doc, nrm),
			},
			Material: gltf.Index(mat),
		})
	}
	if len(m.Primitives) == 0 {
		return -1
	}
	doc.Meshes = append(doc.Meshes, m)
	return len(doc.Meshes) - 1
}

// animate adds the keyframes of the moving bodies: one animation, its
// samplers sharing the accessor of the sample times.
func (r *Recorder) animate(doc *gltf.Document, nodes []int) {
	// Keyframe times must increase strictly once stored as float32.
	var times []float32
	var keep []int
	for k, t := range r.Times {
		f := float32(t)
		if n := len(times); n > 0 && f <= times[n-1] {
			continue
		}
		times = append(times, f)
		keep = append(keep, k)
	}
	if len(times) < 2 {
		return
	}
	anim := &gltf.Animation{Name: "motion"}
	var input int
	for i, b := range r.Bodies {
		if !b.Moves {
			continue
		}
		if anim.Samplers == nil {
			input = modeler.WriteAccessor(doc, gltf.TargetNone, times)
			acc := doc.Accessors[input]
			acc.Min, acc.Max = []float64{float64(times[0])}, []float64{float64(times[len(times)-1])}
		}
		trans := make([][3]float32, len(keep))
		rot := make([][4]float32, len(keep))
		prev := shapes.Quat{W: 1}
		for j, k := range keep {
			p := r.Poses[k][i]
			trans[j] = vec32(p.Position)
			q := p.Orientation.Normalize()
			// Keep each rotation in the half-space of the one before, so
			// that interpolation turns the short way.
			if j > 0 && q.Dot(prev) < 0 {
				q = q.Scale(-1)
			}
			prev = q
			rot[j] = [4]float32{float32(q.V[0]), float32(q.V[1]), float32(q.V[2]), float32(q.W)}
		}
		for _, ch := range []struct {
			path gltf.TRSProperty
			data any
		}{{gltf.TRSTranslation, trans}, {gltf.TRSRotation, rot}} {
			out := modeler.WriteAccessor(doc, gltf.TargetNone, ch.data)
			anim.Samplers = append(anim.Samplers, &gltf.AnimationSampler{Input: input, Output: out, Interpolation: gltf.InterpolationLinear})
			anim.Channels = append(anim.Channels, &gltf.AnimationChannel{
				Sampler: len(anim.Samplers) - 1,
				Target:  gltf.AnimationChannelTarget{Node: gltf.Index(nodes[i]), Path: ch.path},
			})
		}
	}
	if anim.Samplers != nil {
		doc.Animations = append(doc.Animations, anim)
	}
}

// upToY is the shortest rotation that turns up to +Y.
func upToY(up shapes.Vec3) shapes.Quat {
	y := shapes.Vec3{0, 1, 0}
	d := up.Dot(y)
	if d < -1+1e-12 {
		return shapes.Quat{W: 0, V: shapes.Vec3{1, 0, 0}} // half a turn about x
	}
	axis := up.Cross(y)
	q := shapes.Quat{W: 1 + d, V: axis}
	return q.Normalize()
}

func vec32(v shapes.Vec3) [3]float32 {
	return [3]float32{float32(v[0]), float32(v[1]), float32(v[2])}
}

// linear converts an 8-bit sRGB component to the linear value glTF's
// baseColorFactor holds (IEC 61966-2-1 transfer function).
func linear(c uint8) float64 {
	s := float64(c) / 255
	if s <= 0.04045 {
		return s / 12.92
	}
	return math.Pow((s+0.055)/1.055, 2.4)
}
