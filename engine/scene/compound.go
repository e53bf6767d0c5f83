package scene

import (
	"fmt"
	"strconv"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// maxPieces bounds a compound: more pieces than this is a mesh's work.
const maxPieces = 256

// pieces reads shape = { pieces = [ {box = ..., at = ..., orientation = ...}, ... ] }:
// a rigid union of convex pieces (boxes, cylinders, spheres, capsules,
// meshes' hulls), each placed in the body's own axes.
func (r *reader) pieces(sec section, b *Body) {
	pre := r.bodyPre(b)
	path := sub(sec.path, "pieces")
	list, ok := arrayOfTables(sec.m["pieces"])
	if !ok || len(list) == 0 {
		r.errAt(path, "%sshape pieces must be a list of tables, e.g. pieces = [ { box = [40, 10, 10] }, { box = [10, 10, 30], at = [15, 0, 20] } ]", pre)
		return
	}
	if len(list) > maxPieces {
		r.errAt(path, "%sshape has %d pieces, more than %d; make the part a mesh and keep it as its hull", pre, len(list), maxPieces)
		return
	}
	c := &shapes.Compound{}
	good := true
	for i, m := range list {
		p, ok := r.piece(sub(path, strconv.Itoa(i)), m, b, i)
		good = good && ok
		c.Pieces = append(c.Pieces, p)
	}
	if good {
		b.Shape = c
	}
}

// piece reads one piece of a compound.
func (r *reader) piece(path []string, m map[string]any, b *Body, i int) (shapes.Piece, bool) {
	pre := fmt.Sprintf("%spiece %d: ", r.bodyPre(b), i+1)
	shapeOnly := map[string]any{}
	for k, v := range m {
		if k != "at" && k != "orientation" {
			shapeOnly[k] = v
		}
	}
	if _, nested := m["pieces"]; nested {
		r.errAt(path, "%sa piece cannot itself have pieces; list every piece in the body's pieces", pre)
		return shapes.Piece{}, false
	}
	// A piece's own keys, so that a misspelt "at" is named as such; a
	// plane is left to the shape reader, which says why it cannot be one.
	keyed := map[string]any{}
	for k, v := range m {
		if k != "plane" {
			keyed[k] = v
		}
	}
	name := fmt.Sprintf("piece %d of body %q", i+1, b.Name)
	if r.keys(section{m: keyed, path: path, name: name, pre: pre}, "box", "cylinder", "sphere", "capsule", "mesh", "as", "units", "at", "orientation") > 0 {
		return shapes.Piece{}, false
	}
	tmp := Body{Name: b.Name, Orientation: mgl64.QuatIdent()}
	nerr := r.n
	r.shape(section{m: shapeOnly, path: path, name: name, pre: pre}, &tmp, false)
	if r.n > nerr || tmp.Shape == nil {
		return shapes.Piece{}, false
	}
	conv, ok := tmp.Shape.(shapes.Convex)
	if !ok || tmp.Static {
		r.errAt(path, "%sa piece must be a box, cylinder, sphere, capsule or a mesh kept as its hull, not a %s", pre, tmp.Kind)
		return shapes.Piece{}, false
	}
	sec := section{m: m, path: path, name: name, pre: pre}
	at, _ := r.vector(sec, "at", Length, shapes.Vec3{})
	r.orientation(sec, sec.value("orientation"), &tmp, i)
	if tmp.RandomOrientation {
		r.errAt(sub(path, "orientation"), "%sa piece's orientation must be a table { axis = [x, y, z], angle = degrees }, not \"random\"", pre)
		return shapes.Piece{}, false
	}
	return shapes.Piece{Shape: conv, Pose: shapes.Pose{Position: at, Orientation: tmp.Orientation}}, r.n == nerr
}
