package engine

import (
	"fmt"
	"math"
	"slices"
)

// Material holds the surface coefficients of one material.
type Material struct {
	Name string
	// Friction is the kinetic Coulomb coefficient, StaticFriction the
	// coefficient while a contact sticks (at least Friction; 0 means equal
	// to Friction). Restitution is Newton's coefficient, 0 to 1.
	Friction, StaticFriction, Restitution float64
	// Stiffness, if set, makes contacts against the material compliant
	// (stiffness.go, compliant.go).
	Stiffness Stiffness
}

// PairCoefficients are the coefficients that apply between two materials.
type PairCoefficients struct {
	Friction, StaticFriction, Restitution float64
	// Stiffness, if set, replaces the materials' compliant law for the pair.
	Stiffness Stiffness
}

func (m Material) check() error {
	if !(m.Friction >= 0) || math.IsInf(m.Friction, 0) {
		return fmt.Errorf("material %q: friction must be a finite number >= 0, got %g", m.Name, m.Friction)
	}
	if m.StaticFriction != 0 && (!(m.StaticFriction >= m.Friction) || math.IsInf(m.StaticFriction, 0)) {
		return fmt.Errorf("material %q: static friction must be at least the kinetic friction %g, got %g", m.Name, m.Friction, m.StaticFriction)
	}
	if !(m.Restitution >= 0 && m.Restitution <= 1) {
		return fmt.Errorf("material %q: restitution must be between 0 and 1, got %g", m.Name, m.Restitution)
	}
	if err := m.Stiffness.check(); err != nil {
		return fmt.Errorf("material %q: %v", m.Name, err)
	}
	return nil
}

// AddMaterial adds a material and returns its index for BodyDef.Material.
// Index 0 is the default material (friction 0.5, restitution 0).
func (w *World) AddMaterial(m Material) (int, error) {
	if err := m.check(); err != nil {
		return -1, err
	}
	if m.StaticFriction == 0 {
		m.StaticFriction = m.Friction
	}
	w.materials = append(w.materials, m)
	w.buildPairTable()
	return len(w.materials) - 1, nil
}

// SetPair overrides the mixing rule for one pair of materials.
func (w *World) SetPair(a, b int, c PairCoefficients) error {
	if a < 0 || b < 0 || a >= len(w.materials) || b >= len(w.materials) {
		return fmt.Errorf("pair (%d, %d): unknown material", a, b)
	}
	m := Material{Name: w.materials[a].Name + "/" + w.materials[b].Name, Friction: c.Friction, StaticFriction: c.StaticFriction, Restitution: c.Restitution, Stiffness: c.Stiffness}
	if err := m.check(); err != nil {
		return err
	}
	if c.StaticFriction == 0 {
		c.StaticFriction = c.Friction
	}
	if w.pairOverride == nil {
		w.pairOverride = make(map[[2]int]PairCoefficients)
	}
	if a > b {
		a, b = b, a
	}
	w.pairOverride[[2]int{a, b}] = c
	w.buildPairTable()
	return nil
}

// mix is the rule for a pair without an entry of its own: the geometric
// mean of each coefficient. It is common practice, not physics (friction
// and restitution belong to a pair of surfaces, not to one); give measured
// pairs explicitly.
func mix(a, b Material) PairCoefficients {
	return PairCoefficients{
		Friction:       math.Sqrt(a.Friction * b.Friction),
		StaticFriction: math.Sqrt(a.StaticFriction * b.StaticFriction),
		Restitution:    math.Sqrt(a.Restitution * b.Restitution),
	}
}

// buildPairTable fills the dense n x n table read in the step loop.
func (w *World) buildPairTable() {
	n := len(w.materials)
	w.pairs = slices.Grow(w.pairs[:0], n*n)[:n*n] // every entry is written below
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			c := mix(w.materials[i], w.materials[j])
			a, b := i, j
			if a > b {
				a, b = b, a
			}
			if o, ok := w.pairOverride[[2]int{a, b}]; ok {
				c = o
			}
			w.pairs[i*n+j] = c
		}
	}
	w.buildSpringTable() // stiffness.go
}

// Pair returns the coefficients that apply between materials a and b.
func (w *World) Pair(a, b int) PairCoefficients { return w.pairs[a*len(w.materials)+b] }
