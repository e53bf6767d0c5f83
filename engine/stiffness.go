package engine

import (
	"fmt"
	"math"
	"slices"
)

// Stiffness makes a material compliant: a contact against it is a spring
// instead of a rigid constraint. The zero value is rigid.
type Stiffness struct {
	// Linear, N/m: a cushion whose force grows in proportion to its
	// indentation; the whole contact between two bodies acts as one spring.
	Linear float64
	// Modulus (Pa) and Poisson: Young's modulus and Poisson's ratio of an
	// elastic solid, for Hertz contact of round surfaces.
	Modulus, Poisson float64
}

// Compliant reports whether s makes contacts springs.
func (s Stiffness) Compliant() bool { return s.Linear > 0 || s.Modulus > 0 }

func (s Stiffness) check() error {
	switch {
	case s.Linear != 0 && s.Modulus != 0:
		return fmt.Errorf("give either a linear stiffness or a modulus and Poisson's ratio, not both")
	case s.Linear < 0 || math.IsNaN(s.Linear) || math.IsInf(s.Linear, 0):
		return fmt.Errorf("stiffness must be a finite number > 0, got %g", s.Linear)
	case s.Modulus < 0 || math.IsNaN(s.Modulus) || math.IsInf(s.Modulus, 0):
		return fmt.Errorf("modulus must be a finite number > 0, got %g", s.Modulus)
	case s.Modulus > 0 && !(s.Poisson > -1 && s.Poisson < 0.5):
		return fmt.Errorf("poisson must be between -1 and 0.5, got %g", s.Poisson)
	}
	return nil
}

// springLaw is the compliant law of one pair of materials, resolved once.
type springLaw struct {
	k     float64 // linear: N/m of the pair (0 if not linear)
	eStar float64 // Hertz: contact modulus E* of the pair, Pa (0 if not Hertz)
	err   string  // why the pair's stiffness cannot be resolved
}

func (l springLaw) compliant() bool { return l.k > 0 || l.eStar > 0 || l.err != "" }

// contactCompliance is 1/E of one Hertz body, (1 - nu^2)/E (Johnson,
// "Contact Mechanics", 1985, eq. 4.22).
func contactCompliance(s Stiffness) float64 { return (1 - s.Poisson*s.Poisson) / s.Modulus }

// seriesLaw combines two materials: rigid with compliant is the compliant
// one; two linear cushions are springs in series (k = k1 k2 / (k1 + k2));
// two Hertz solids give 1/E* = (1-nu1^2)/E1 + (1-nu2^2)/E2 (Johnson 1985,
// eq. 4.22). A linear cushion against a Hertz solid has no single law and
// is refused: give the pair its own stiffness.
func seriesLaw(a, b Material) springLaw {
	sa, sb := a.Stiffness, b.Stiffness
	switch {
	case !sa.Compliant() && !sb.Compliant():
		return springLaw{}
	case sa.Linear > 0 && sb.Linear > 0:
		return springLaw{k: sa.Linear * sb.Linear / (sa.Linear + sb.Linear)}
	case sa.Modulus > 0 && sb.Modulus > 0:
		return springLaw{eStar: 1 / (contactCompliance(sa) + contactCompliance(sb))}
	case sa.Linear > 0 && !sb.Compliant():
		return springLaw{k: sa.Linear}
	case sb.Linear > 0 && !sa.Compliant():
		return springLaw{k: sb.Linear}
	case sa.Modulus > 0 && !sb.Compliant():
		return springLaw{eStar: 1 / contactCompliance(sa)}
	case sb.Modulus > 0 && !sa.Compliant():
		return springLaw{eStar: 1 / contactCompliance(sb)}
	}
	return springLaw{err: fmt.Sprintf("materials %q and %q: a linear stiffness meets a modulus; give the pair its own stiffness in a [[pair]]", a.Name, b.Name)}
}

// pairLaw is the law a [[pair]] sets: a linear stiffness as given, or a
// modulus as two equal solids in series, E* = E / (2 (1 - nu^2)).
func pairLaw(s Stiffness) springLaw {
	if s.Linear > 0 {
		return springLaw{k: s.Linear}
	}
	return springLaw{eStar: 1 / (2 * contactCompliance(s))}
}

// buildSpringTable fills the n x n table of compliant laws beside the pair
// table, and notes whether the world has any compliant contact at all (a
// rigid world never looks at it).
func (w *World) buildSpringTable() {
	n := len(w.materials)
	w.soft.laws = slices.Grow(w.soft.laws[:0], n*n)[:n*n] // every entry is written below
	w.soft.on = false
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			l := seriesLaw(w.materials[i], w.materials[j])
			a, b := min(i, j), max(i, j)
			if o, ok := w.pairOverride[[2]int{a, b}]; ok && o.Stiffness.Compliant() {
				l = pairLaw(o.Stiffness)
			}
			w.soft.laws[i*n+j] = l
			w.soft.on = w.soft.on || l.compliant()
		}
	}
}
