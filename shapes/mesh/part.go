package mesh

import (
	"errors"
	"fmt"

	"clatter/shapes"
)

// hullVolumeSlack is how far, as a fraction, a solid's volume may exceed its
// convex hull's before the mesh counts as self-overlapping: the hull drops
// points within 1e-7 of the part's size of its faces, which changes its
// volume by a few times that.
const hullVolumeSlack = 1e-6

// Part is a rigid part made from a mesh: its convex hull is the shape used
// for contact, and its mass properties are those of the solid the mesh
// bounds, or of the hull when the mesh bounds none.
type Part struct {
	Name string
	// Mesh is the welded mesh, facing outward if it bounds a solid.
	Mesh *Mesh
	// Hull is the convex hull of the mesh's vertices, the contact shape.
	Hull *shapes.Hull
	// Topology is the mesh's edge count by use.
	Topology Topology
	// Solid is true when the mass properties are those of the mesh's own
	// solid, false when they are taken from the hull.
	Solid bool
	// Warnings say, one sentence each, what was repaired or approximated.
	Warnings []string

	unit shapes.Mass // at density 1
}

// LoadPart reads an STL file in unit and makes a part of it.
func LoadPart(path string, unit Unit) (*Part, error) {
	m, err := LoadSTL(path, unit)
	if err != nil {
		return nil, err
	}
	return NewPart(m)
}

// NewPart makes a part of m. A closed, consistently oriented mesh gives the
// mass properties of its solid; one that faces inward is flipped (m is
// changed) with a warning. An open, non-manifold or inconsistent mesh gives
// its hull's mass properties, with a warning saying why. The only errors are
// a mesh without thickness (all vertices on a plane or a line, or a hull
// that encloses no volume) and a hull that cannot be built.
func NewPart(m *Mesh) (*Part, error) {
	hull, err := shapes.NewHull(m.Vertices)
	if errors.Is(err, shapes.ErrDegenerate) {
		return nil, fmt.Errorf("%s: zero thickness: %w", m.Name, err)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: no convex hull: %w", m.Name, err)
	}
	hullMass := hull.Mass(1)
	if !(hullMass.Volume > 0) || len(hull.Faces) < 4 {
		return nil, fmt.Errorf("%s: zero thickness: its convex hull (%d vertices, %d faces) encloses no volume: %w", m.Name, len(hull.Vertices), len(hull.Faces), shapes.ErrDegenerate)
	}
	p := &Part{Name: m.Name, Mesh: m, Hull: hull, Topology: m.Topology()}
	if problem := p.Topology.Problem(); problem != "" {
		p.warn("mesh is %s; mass properties taken from its convex hull", problem)
		p.unit = hullMass
		return p, nil
	}
	if m.SignedVolume() < 0 {
		m.Flip()
		p.warn("triangles faced inward; turned them outward")
	}
	mp, err := shapes.PolyhedronMass(m.Vertices, m.Triangles, 1)
	if err != nil {
		p.warn("mesh encloses no volume (%v); mass properties taken from its convex hull", err)
		p.unit = hullMass
		return p, nil
	}
	if mp.Volume > hullMass.Volume*(1+hullVolumeSlack) {
		p.warn("mesh volume %.6g exceeds its convex hull's %.6g: shells overlap or intersect themselves, so mass properties are doubtful", mp.Volume, hullMass.Volume)
	}
	p.Solid = true
	p.unit = mp
	return p, nil
}

func (p *Part) warn(format string, args ...any) {
	p.Warnings = append(p.Warnings, p.Name+": "+fmt.Sprintf(format, args...))
}

// Mass returns the part's mass properties at the given density, in the
// part's (the file's) axes.
func (p *Part) Mass(density float64) shapes.Mass { return p.unit.Scaled(density) }

// Principal returns the principal moments of inertia (ascending) about the
// centre of mass at the given density, and the principal axes as the columns
// of a rotation (shapes.Principal).
func (p *Part) Principal(density float64) (moments shapes.Vec3, axes shapes.Mat3, err error) {
	moments, axes, err = shapes.Principal(p.Mass(density).Inertia)
	if err != nil {
		err = fmt.Errorf("%s: %w", p.Name, err)
	}
	return moments, axes, err
}
