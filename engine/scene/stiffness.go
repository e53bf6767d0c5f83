package scene

import (
	"fmt"
	"math"

	"clatter/engine"
	"clatter/shapes"
)

// Compliance is a material's or pair's `stiffness`, in SI: Linear (N/m)
// for a linear cushion, or Modulus (Pa) and Poisson for Hertz contact.
// The zero value is rigid.
type Compliance struct {
	Linear, Modulus, Poisson float64
}

// Given reports whether the key was set.
func (c Compliance) Given() bool { return c.Linear > 0 || c.Modulus > 0 }

// stiffness reads the `stiffness` key of a material or pair: a quantity,
// "40 N/mm", or a table { modulus = "2.4 GPa", poisson = 0.35 }.
func (r *reader) stiffness(sec section, st value) Compliance {
	if !st.Given() {
		return Compliance{}
	}
	v, path := st.v, st.path
	if t, isTable := v.(map[string]any); isTable {
		return r.hertzStiffness(sec, t, path)
	}
	k, ok := r.quantitySI(v, Stiffness, path, sec.pre+"stiffness")
	if !ok || !r.inRange(k, Stiffness, path, sec.pre+"stiffness") {
		return Compliance{}
	}
	if !(k > 0) {
		r.errAt(path, `%sstiffness must be > 0, got %g N/m; give the cushion's force per unit of indentation from its maker's data or a test, e.g. stiffness = "40 N/mm", or leave it out for a rigid contact`, sec.pre, k)
		return Compliance{}
	}
	return Compliance{Linear: k}
}

// hertzKeys are the keys of stiffness = { modulus, poisson }.
type hertzKeys struct {
	Modulus Quantity `toml:"modulus"`
	Poisson Quantity `toml:"poisson"`
}

func (r *reader) hertzStiffness(sec section, t map[string]any, path []string) Compliance {
	tsec := section{m: t, path: path, name: sec.name + " stiffness", pre: sec.pre + "stiffness: "}
	var k hertzKeys
	r.decode(tsec, &k)
	if !k.Modulus.Given() || !k.Poisson.Given() {
		r.errAt(path, `%sstiffness as a table needs both modulus and poisson, e.g. stiffness = { modulus = "210 GPa", poisson = 0.3 } (Hertz contact), or give a linear stiffness such as "40 N/mm"`, sec.pre)
		return Compliance{}
	}
	e, ok1 := r.quantitySI(k.Modulus.v, Pressure, k.Modulus.path, tsec.pre+"modulus")
	nu, ok2 := r.quantitySI(k.Poisson.v, Dimensionless, k.Poisson.path, tsec.pre+"poisson")
	if !ok1 || !ok2 || !r.inRange(e, Pressure, k.Modulus.path, tsec.pre+"modulus") {
		return Compliance{}
	}
	if !(e > 0) {
		r.errAt(k.Modulus.path, `%smodulus must be > 0, got %g Pa; give Young's modulus, e.g. "2.4 GPa"`, tsec.pre, e)
		return Compliance{}
	}
	if !(nu > -1 && nu < 0.5) || math.IsNaN(nu) {
		r.errAt(k.Poisson.path, "%spoisson must be between -1 and 0.5 (most solids 0.2 to 0.45), got %g", tsec.pre, nu)
		return Compliance{}
	}
	return Compliance{Modulus: e, Poisson: nu}
}

// stiffnessMismatch explains a linear cushion meeting a Hertz solid.
func stiffnessMismatch(a, b string) string {
	return fmt.Sprintf("materials %q and %q touch with a linear stiffness on one and a modulus on the other, which have no common law; add a [[pair]] with materials = [%q, %q] and its own stiffness", a, b, a, b)
}

func (c Compliance) engine() engine.Stiffness {
	return engine.Stiffness{Linear: c.Linear, Modulus: c.Modulus, Poisson: c.Poisson}
}

// stiffnessConflict finds two bodies whose materials meet with a linear
// stiffness on one side and a modulus on the other and no [[pair]]
// stiffness between them; it returns the later body's line and why.
func (s *Scene) stiffnessConflict() (int, string) {
	of := func(name string) Compliance {
		if i := s.MaterialIndex(name); i >= 0 {
			return s.Materials[i].Stiffness
		}
		return Compliance{}
	}
	paired := func(a, b string) bool {
		for _, p := range s.Pairs {
			if p.Stiffness.Given() && (p.A == a && p.B == b || p.A == b && p.B == a) {
				return true
			}
		}
		return false
	}
	for i := range s.Bodies {
		for j := 0; j < i; j++ {
			a, b := s.Bodies[j].Material, s.Bodies[i].Material
			ca, cb := of(a), of(b)
			if (ca.Linear > 0 && cb.Modulus > 0 || ca.Modulus > 0 && cb.Linear > 0) && !paired(a, b) {
				return s.Bodies[i].Line, fmt.Sprintf("body %q: %s", s.Bodies[i].Name, stiffnessMismatch(a, b))
			}
			bi, bj := &s.Bodies[i], &s.Bodies[j]
			hertz := (ca.Modulus > 0 || cb.Modulus > 0) && !(ca.Linear > 0 || cb.Linear > 0) && !paired(a, b)
			if hertz && !(bi.Static && bj.Static) && !round(bi.Shape) && !round(bj.Shape) {
				return bi.Line, fmt.Sprintf("body %q: its contact with %q would be Hertz contact (a stiffness given as modulus and poisson), which needs a round body, a sphere or a capsule; give one of their materials a linear stiffness such as \"40 N/mm\", or a [[pair]] one", bi.Name, bj.Name)
			}
		}
	}
	return 0, ""
}

// round reports whether a shape has the curved surface Hertz contact needs.
func round(sh shapes.Shape) bool {
	switch sh.(type) {
	case shapes.Sphere, *shapes.Sphere, shapes.Capsule, *shapes.Capsule:
		return true
	}
	return false
}
