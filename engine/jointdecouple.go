package engine

import (
	"math"

	"clatter/contact"
	"clatter/shapes"
)

// minvJ is M^-1 J^T of a row: the velocity changes per unit impulse.
type minvJ struct{ va, wa, vb, wb shapes.Vec3 }

func responseOf(r *contact.Row, bodies []contact.Body) minvJ {
	A, B := &bodies[r.A], &bodies[r.B]
	return minvJ{r.LinA.Mul(A.InvMass), A.InvInertia.Mul3x1(r.AngA), r.LinB.Mul(B.InvMass), B.InvInertia.Mul3x1(r.AngB)}
}

// coupling is J_r M^-1 J_s^T for rows r and s of the same two bodies.
func coupling(r *contact.Row, s minvJ) float64 {
	return r.LinA.Dot(s.va) + r.AngA.Dot(s.wa) + r.LinB.Dot(s.vb) + r.AngB.Dot(s.wb)
}

// selfCoupling is J M^-1 J^T of one row: coupling(r, responseOf(r,
// bodies)) with the same arithmetic, without the temporaries.
func selfCoupling(r *contact.Row, bodies []contact.Body) float64 {
	A, B := &bodies[r.A], &bodies[r.B]
	return linCoupling(&r.LinA, A.InvMass) + angCoupling(&r.AngA, &A.InvInertia) +
		linCoupling(&r.LinB, B.InvMass) + angCoupling(&r.AngB, &B.InvInertia)
}

func linCoupling(v *shapes.Vec3, invMass float64) float64 {
	return v[0]*(v[0]*invMass) + v[1]*(v[1]*invMass) + v[2]*(v[2]*invMass)
}

func angCoupling(v *shapes.Vec3, inv *shapes.Mat3) float64 {
	u0 := inv[0]*v[0] + inv[3]*v[1] + inv[6]*v[2]
	u1 := inv[1]*v[0] + inv[4]*v[1] + inv[7]*v[2]
	u2 := inv[2]*v[0] + inv[5]*v[1] + inv[8]*v[2]
	return v[0]*u0 + v[1]*u1 + v[2]*u2
}

// decoupleTol is the smallest pivot of the Cholesky factor, relative to its
// row's own diagonal entry, at which a joint's rows still count as
// independent; below it (a body with no mass in some direction) the rows
// are left as they are.
const decoupleTol = 1e-9

// decouple replaces a joint's equality rows J (at most 6) by L^-1 J, where
// L L^T = J M^-1 J^T is the Cholesky factor of the rows' coupling matrix:
// the new rows span the same constraints, and their coupling matrix is the
// identity, so one Gauss-Seidel sweep over them solves the joint exactly
// (block Gauss-Seidel across joints, at the cost of scalar sweeps). Without
// it the sweeps over a hinge's rows converge slowly for a body whose lever
// arm is long against its radius of gyration. The drifts and targets are
// transformed alike. It reports whether the rows were transformed.
func decouple(rows []contact.Row, bodies []contact.Body, chol *cholesky) bool {
	n := len(rows)
	if n < 1 || n > 6 {
		return false
	}
	var resp [6]minvJ
	for i := 0; i < n; i++ {
		resp[i] = responseOf(&rows[i], bodies)
	}
	var km [6][6]float64 // the coupling matrix J M^-1 J^T, lower triangle
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			km[i][j] = coupling(&rows[i], resp[j])
		}
	}
	if !chol.factor(&km, n, decoupleTol) {
		return false
	}
	L := &chol.l
	for i := 0; i < n; i++ {
		r := &rows[i]
		for k := 0; k < i; k++ {
			f := L[i][k]
			p := &rows[k]
			r.LinA, r.AngA = r.LinA.Sub(p.LinA.Mul(f)), r.AngA.Sub(p.AngA.Mul(f))
			r.LinB, r.AngB = r.LinB.Sub(p.LinB.Mul(f)), r.AngB.Sub(p.AngB.Mul(f))
			r.Drift -= p.Drift * f
			r.Target -= p.Target * f
		}
		s := 1 / L[i][i]
		r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(s), r.AngA.Mul(s), r.LinB.Mul(s), r.AngB.Mul(s)
		r.Drift *= s
		r.Target *= s
	}
	return true
}

// normalise scales a joint's equality rows to unit coupling each (the
// diagonal of J M^-1 J^T), recording the scales as a diagonal factor.
func normalise(rows []contact.Row, bodies []contact.Body, chol *cholesky) {
	chol.n = 0
	if len(rows) > 6 {
		return
	}
	for i := range rows {
		r := &rows[i]
		k := selfCoupling(r, bodies)
		if !(k > 0) || math.IsInf(k, 0) {
			chol.n = 0
			return // left as it is; the exact solve then fails and skips
		}
		s := math.Sqrt(k)
		for j := range chol.l[i] {
			chol.l[i][j] = 0
		}
		chol.l[i][i] = s
		r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(1/s), r.AngA.Mul(1/s), r.LinB.Mul(1/s), r.AngB.Mul(1/s)
		r.Drift /= s
		r.Target /= s
		chol.n = i + 1
	}
}
