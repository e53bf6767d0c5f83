package engine

import (
	"math"

	"clatter/contact"
	"clatter/shapes"
)

// The exact joint solve. Gauss-Seidel sweeps converge slowly through a
// chain of joints whose links are light in some direction (a thin bar
// turns about its own long axis a thousand times more easily than about
// the others), and a slider-crank run at speed, or a spatial chain of
// slender links, is left visibly off its joints. So after the contact
// solve the velocities are projected onto the joints exactly, and the
// pseudo-velocities likewise, by the linear-time sparse factorisation of
// D. Baraff, "Linear-time dynamics using Lagrange multipliers", SIGGRAPH
// 1996: bodies and joints are the nodes of a graph, which is a forest as
// long as the joints make no closed loop among moving bodies (the ground
// and other fixed bodies are no nodes, so a slider-crank is a tree), and
// the block LDL^T factors of
//
//	H = [ M   -J^T ]
//	    [ -J    0  ]
//
// eliminated from the leaves up have no fill-in. The projection is the
// smallest change of the velocities, in the metric of the mass, that
// satisfies the joints; it removes kinetic energy and adds none.
//
// Joints that close a loop (a four-bar's fourth pin) are left to the
// sweeps, which handle a single loop well; so are limits, capped motors,
// servos and friction, which are inequalities or given impulses, and the
// contacts. A group of jointed bodies with any of these (or touching
// anything) has all its joint rows in the sweeps too, so that contacts and
// joints share their loads, and the projection then removes only what the
// sweeps left unconverged; a group with none of them is solved by the
// projection alone, and its rows skip the sweeps.

// treeNode is a body (size 6: linear then angular velocity) or a joint
// (size m: the rows of its block) of the forest.
type treeNode struct {
	body   int32 // solver body index of a body node, -1 for a joint node
	joint  int32 // joint index of a joint node, -1 for a body node
	size   int
	parent int32 // node index, -1 at a root
	// jac is the Jacobian (m x 6, row-major, zero below row m) that links
	// the node to its parent: a joint node's rows with respect to its
	// parent body, or a body node's parent joint's rows with respect to it.
	jac mat6
	m   int
	// d is the node's diagonal block once its children are eliminated, and
	// dinv its inverse: a body's mass block stays positive definite, a
	// joint's block negative definite.
	d, dinv mat6
	// f is D^-1 H_(node,parent).
	f mat6
	x [6]float64 // right-hand side, then solution
}

// jointTree is the scratch state of the exact solve, reused every step.
type jointTree struct {
	nodes  []treeNode
	bodyOf []int32 // solver body -> its node, -1 if none
	adj    []int32 // joint indices in the forest, grouped by body (CSR)
	adjAt  []int32 // start of each body's group in adj, then len(adj)
	fill   []int32
	seen   []bool  // per joint: has its node
	uf     []int32 // union-find over solver bodies
	sweep  []bool  // per union-find root: the group goes to the sweeps
	touch  []bool  // per solver body: has a contact point this step
}

func (t *jointTree) find(i int32) int32 {
	for t.uf[i] != i {
		t.uf[i] = t.uf[t.uf[i]]
		i = t.uf[i]
	}
	return i
}

func growFill[T any](s []T, n int, v T) []T {
	if cap(s) < n {
		s = make([]T, n)
	}
	s = s[:n]
	for i := range s {
		s[i] = v
	}
	return s
}

// push appends a node to the forest, reusing the space of earlier steps'
// nodes: its blocks are written before they are read (jacobianOf and
// buildTree for a node with a parent; a root's jac and f are not used).
// The pointer is valid until the next push.
func (t *jointTree) push(body, joint int32, size int, parent int32) *treeNode {
	if len(t.nodes) < cap(t.nodes) {
		t.nodes = t.nodes[:len(t.nodes)+1]
	} else {
		t.nodes = append(t.nodes, treeNode{})
	}
	nd := &t.nodes[len(t.nodes)-1]
	nd.body, nd.joint, nd.size, nd.parent, nd.m = body, joint, size, parent, 0
	return nd
}

// rigidMotor reports whether a joint's motor is an equality: a speed motor
// without a force cap.
func rigidMotor(jt *joint) bool {
	return jt.def.Motor.Mode == MotorSpeed && math.IsInf(jt.def.Motor.MaxForce, 1)
}

// needsSweeps reports whether a joint has rows the projection cannot do.
func needsSweeps(jt *joint) bool {
	d := &jt.def
	return d.Limited || d.Friction > 0 || (d.Motor.Mode != MotorOff && !rigidMotor(jt)) ||
		(d.Kind == Distance && d.MinLength != d.MaxLength)
}

// groupJoints marks, before the rows are built, the joints that close a
// loop (loop) and the groups of jointed moving bodies that go to the
// sweeps (sweep, by union-find root): a group with a contact, a loop or a
// row that only the sweeps can do.
func (w *World) groupJoints() {
	c := &w.collision
	t := &w.mech.tree
	nb := len(w.b.kind) + 1 // and the ground
	t.uf = growFill(t.uf, nb, 0)
	for i := range t.uf {
		t.uf[i] = int32(i)
	}
	t.touch = growFill(t.touch, nb, false)
	for i := range c.points {
		t.touch[c.points[i].A], t.touch[c.points[i].B] = true, true
	}
	t.sweep = growFill(t.sweep, nb, false)
	joints := w.mech.joints
	for j := range joints {
		jt := &joints[j]
		jt.loop = false
		fa, fb := w.jointFree(jt.a), w.jointFree(jt.b)
		if fa && fb {
			ra, rb := t.find(int32(jt.a)), t.find(int32(jt.b))
			if ra == rb {
				jt.loop = true
			} else {
				t.uf[ra] = rb
			}
		}
	}
	for j := range joints {
		jt := &joints[j]
		for _, id := range [2]BodyID{jt.a, jt.b} {
			if w.jointFree(id) {
				r := t.find(int32(id))
				t.sweep[r] = t.sweep[r] || jt.loop || needsSweeps(jt) || t.touch[id]
			}
		}
	}
	// A touching body's group: bodies joined to it only by contact do not
	// count, the contact rows link them in the sweeps.
	for i := 0; i < len(w.b.kind); i++ {
		if t.touch[i] && w.jointFree(BodyID(i)) {
			t.sweep[t.find(int32(i))] = true
		}
	}
}

// swept reports whether a joint's rows go to the sweeps this step.
func (w *World) swept(jt *joint) bool {
	t := &w.mech.tree
	for _, id := range [2]BodyID{jt.a, jt.b} {
		if w.jointFree(id) && t.sweep[t.find(int32(id))] {
			return true
		}
	}
	return false
}

// pickNodeRows chooses the rows of a joint's node, at most 6: its
// equality rows, a rigid motor's row, and each of its other rows that the
// sweeps left strictly inside its bounds (a limit that pushes, a motor at
// its target speed, friction that sticks), which act as equalities this
// step: the projection must keep them, or it would push a joint through
// its stop. Rows at a bound are given forces, already applied, and fixed
// impulses (servos) likewise.
func (w *World) pickNodeRows(jt *joint) {
	rows := w.mech.rows
	jt.nodeN = 0
	for k := jt.eqFirst; k < jt.eqFirst+jt.eqCount; k++ {
		jt.node[jt.nodeN] = k
		jt.nodeN++
	}
	for k := jt.first; k < jt.first+jt.count && jt.nodeN < 6; k++ {
		r := &rows[k]
		if k >= jt.eqFirst && k < jt.eqFirst+jt.eqCount {
			continue
		}
		if (k == jt.first+jt.motorRow && rigidMotor(jt)) || (r.Lo < r.Impulse && r.Impulse < r.Hi) {
			jt.node[jt.nodeN] = k
			jt.nodeN++
		}
	}
}

// nodeRow returns the k-th row of a joint's node.
func (w *World) nodeRow(jt *joint, k int) *contact.Row { return &w.mech.rows[jt.node[k]] }

func nodeSize(jt *joint) int { return int(jt.nodeN) }

// jacobianOf writes the Jacobian of a joint's node rows with respect to
// solver body b (m x 6, zero below row m).
func (w *World) jacobianOf(jt *joint, b int32, out *mat6) int {
	m := nodeSize(jt)
	for k := 0; k < m; k++ {
		r := w.nodeRow(jt, k)
		l, a := r.LinB, r.AngB
		if r.A == b {
			l, a = r.LinA, r.AngA
		}
		out[k*6], out[k*6+1], out[k*6+2], out[k*6+3], out[k*6+4], out[k*6+5] = l[0], l[1], l[2], a[0], a[1], a[2]
	}
	clear(out[m*6:])
	return m
}

// treeRegularization is the compliance, relative to each row's own
// coupling J M^-1 J^T, given to every joint node: far below the rows'
// scale, so an independent joint is solved to about 1e-10 of its load,
// while redundant rows (two coaxial bearings, a planar linkage's
// out-of-plane rows) share their load instead of making H singular.
const treeRegularization = 1e-10

// buildTree picks the forest, orders it and factors H. It reports false
// if there is nothing to do or a block is not definite.
func (w *World) buildTree() bool {
	c := &w.collision
	t := &w.mech.tree
	bodies := c.bodies
	nb := len(bodies)
	joints := w.mech.joints
	t.nodes = t.nodes[:0]
	t.bodyOf = growFill(t.bodyOf, nb, -1)
	inTree := func(jt *joint) bool { return jt.count > 0 && jt.eqCount > 0 && !jt.loop }
	for j := range joints {
		if jt := &joints[j]; inTree(jt) {
			w.pickNodeRows(jt)
		}
	}
	// Adjacency of the moving bodies (CSR, counting sort by body).
	t.adjAt = growFill(t.adjAt, nb+1, 0)
	any := false
	for j := range joints {
		if jt := &joints[j]; inTree(jt) {
			any = true
			for _, id := range [2]BodyID{jt.a, jt.b} {
				if w.jointFree(id) {
					t.adjAt[id+1]++
				}
			}
		}
	}
	if !any {
		return false
	}
	for i := 0; i < nb; i++ {
		t.adjAt[i+1] += t.adjAt[i]
	}
	t.adj = growFill(t.adj, int(t.adjAt[nb]), 0)
	t.fill = growFill(t.fill, nb, 0)
	for j := range joints {
		if jt := &joints[j]; inTree(jt) {
			for _, id := range [2]BodyID{jt.a, jt.b} {
				if w.jointFree(id) {
					t.adj[t.adjAt[id]+t.fill[id]] = int32(j)
					t.fill[id]++
				}
			}
		}
	}
	// Breadth-first, parents before children, from a root in each group:
	// a joint to a fixed body if the group has one, else its first body. A
	// joint to a fixed body that is a leaf has a block of nearly zero (its
	// regularisation) to eliminate, which costs digits; as the root it is
	// eliminated last, from a block its children have filled.
	t.seen = growFill(t.seen, len(joints), false)
	grow := func() {
		for q := len(t.nodes) - 1; q < len(t.nodes); q++ {
			if b := t.nodes[q].body; b >= 0 {
				for _, j := range t.adj[t.adjAt[b]:t.adjAt[b+1]] {
					if t.seen[j] {
						continue
					}
					t.seen[j] = true
					jt := &joints[j]
					nd := t.push(-1, j, nodeSize(jt), int32(q))
					nd.m = w.jacobianOf(jt, b, &nd.jac)
				}
				continue
			}
			jt := &joints[t.nodes[q].joint]
			for _, id := range [2]BodyID{jt.a, jt.b} {
				if b := int32(id); w.jointFree(id) && t.bodyOf[b] < 0 {
					t.bodyOf[b] = int32(len(t.nodes))
					nd := t.push(b, -1, 6, int32(q))
					nd.m = w.jacobianOf(jt, b, &nd.jac)
				}
			}
		}
	}
	for j := range joints {
		jt := &joints[j]
		if !inTree(jt) || w.jointFree(jt.a) == w.jointFree(jt.b) {
			continue
		}
		free := jt.a
		if !w.jointFree(free) {
			free = jt.b
		}
		if t.bodyOf[free] >= 0 {
			continue // its group has a root already
		}
		t.seen[j] = true
		t.push(-1, int32(j), nodeSize(jt), -1)
		grow()
	}
	for root := int32(0); root < int32(nb); root++ {
		if t.bodyOf[root] >= 0 || t.adjAt[root] == t.adjAt[root+1] {
			continue
		}
		t.bodyOf[root] = int32(len(t.nodes))
		t.push(root, -1, 6, -1)
		grow()
	}
	// The diagonal blocks. All blocks are stored 6 x 6 (row-major): a
	// joint of m < 6 rows is padded with zero rows and columns of H and a
	// -1 on the diagonal of its block, which keeps the padding out of every
	// product and lets the loops run to a constant bound.
	for i := range t.nodes {
		nd := &t.nodes[i]
		nd.d = mat6{}
		if nd.body >= 0 {
			m := 1 / bodies[nd.body].InvMass
			in := &c.inertia[nd.body] // this step's, from solve
			for k := 0; k < 3; k++ {
				nd.d[k*6+k] = m
				for j := 0; j < 3; j++ {
					nd.d[(3+k)*6+3+j] = in.At(k, j)
				}
			}
		} else {
			jt := &joints[nd.joint]
			for k := 0; k < 6; k++ {
				nd.d[k*6+k] = -1
				if k < nd.size {
					r := w.nodeRow(jt, k)
					nd.d[k*6+k] = -treeRegularization * selfCoupling(r, bodies)
				}
			}
		}
	}
	// Eliminate from the leaves up (children come after their parents).
	for q := len(t.nodes) - 1; q >= 0; q-- {
		nd := &t.nodes[q]
		sign := 1.0
		if nd.body < 0 {
			sign = -1
		}
		n := 6
		if nd.body < 0 {
			n = nd.size
		}
		if !definiteInverse(&nd.d, &nd.dinv, sign, n) {
			return false
		}
		if nd.parent < 0 {
			continue
		}
		p := &t.nodes[nd.parent]
		// The products below skip what is known to be zero: the rows of jac
		// from m on (a joint of m < 6 rows), and the padding of a joint's
		// dinv (zero off its diagonal). Only the lower triangle of D_p is
		// updated, the part definiteInverse reads.
		if nd.body >= 0 {
			// Body below joint p: H_(n,p) = -jac^T, f = D^-1 H = -dinv jac^T,
			// and D_p -= H^T f = -jac f.
			mulABt(&nd.f, &nd.dinv, &nd.jac, nd.m)
			mulAddLower(&p.d, &nd.jac, &nd.f, nd.m)
			continue
		}
		// Joint below body p: H_(n,p) = -jac, f = -dinv jac, and
		// D_p -= H^T f = -jac^T f.
		mulAB(&nd.f, &nd.dinv, &nd.jac, nd.m)
		mulAtBAddLower(&p.d, &nd.jac, &nd.f, nd.m)
	}
	return true
}

// mat6 is a 6 x 6 block, row-major.
type mat6 = [36]float64

// mulAB sets c = -a b for b with zero rows from m on and a (a joint's
// dinv) zero off its diagonal in rows and columns from m on: the rows of
// c from m on are zero.
func mulAB(c, a, b *mat6, m int) {
	for i := 0; i < m; i++ {
		for j := 0; j < 6; j++ {
			v := 0.0
			for k := 0; k < m; k++ {
				v += a[i*6+k] * b[k*6+j]
			}
			c[i*6+j] = -v
		}
	}
	for i := m * 6; i < 36; i++ {
		c[i] = 0
	}
}

// mulABt sets c = -a b^T for b with zero rows from m on: the columns of c
// from m on are zero.
func mulABt(c, a, b *mat6, m int) {
	for i := 0; i < 6; i++ {
		for j := 0; j < 6; j++ {
			if j >= m {
				c[i*6+j] = 0
				continue
			}
			v := 0.0
			for k := 0; k < 6; k++ {
				v += a[i*6+k] * b[j*6+k]
			}
			c[i*6+j] = -v
		}
	}
}

// mulAddLower adds a b to the lower triangle of c, for a with zero rows
// and b with zero columns from m on.
func mulAddLower(c, a, b *mat6, m int) {
	for i := 0; i < m; i++ {
		for j := 0; j <= i; j++ {
			v := 0.0
			for k := 0; k < 6; k++ {
				v += a[i*6+k] * b[k*6+j]
			}
			c[i*6+j] += v
		}
	}
}

// mulAtBAddLower adds a^T b to the lower triangle of c, for a and b with
// zero rows from m on.
func mulAtBAddLower(c, a, b *mat6, m int) {
	for i := 0; i < 6; i++ {
		for j := 0; j <= i; j++ {
			v := 0.0
			for k := 0; k < m; k++ {
				v += a[k*6+i] * b[k*6+j]
			}
			c[i*6+j] += v
		}
	}
}

// definiteInverse writes the inverse of the symmetric 6 x 6 matrix a,
// positive definite if sign is 1 and negative definite if sign is -1, into
// inv by way of the Cholesky factor of sign a; it reports false if a is
// not definite to working precision. Only the lower triangle of a is read.
// Rows and columns from n on are a joint's padding, zero but for the
// diagonal's sign: their inverse is written without arithmetic.
func definiteInverse(a, inv *mat6, sign float64, n int) bool {
	var l, li mat6
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			l[i*6+j] = sign * a[i*6+j]
		}
	}
	// Cholesky: l lower with l l^T = sign a.
	for j := 0; j < n; j++ {
		d := l[j*6+j]
		for k := 0; k < j; k++ {
			d -= l[j*6+k] * l[j*6+k]
		}
		if !(d > 0) {
			return false
		}
		d = math.Sqrt(d)
		l[j*6+j] = d
		for i := j + 1; i < n; i++ {
			v := l[i*6+j]
			for k := 0; k < j; k++ {
				v -= l[i*6+k] * l[j*6+k]
			}
			l[i*6+j] = v / d
		}
	}
	// li = l^-1, lower triangular.
	for j := 0; j < n; j++ {
		li[j*6+j] = 1 / l[j*6+j]
		for i := j + 1; i < n; i++ {
			v := 0.0
			for k := j; k < i; k++ {
				v -= l[i*6+k] * li[k*6+j]
			}
			li[i*6+j] = v / l[i*6+i]
		}
	}
	// a^-1 = sign li^T li.
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			v := 0.0
			for k := i; k < n; k++ {
				v += li[k*6+i] * li[k*6+j]
			}
			inv[i*6+j], inv[j*6+i] = sign*v, sign*v
		}
	}
	for i := n; i < 6; i++ {
		for j := 0; j < 6; j++ {
			inv[i*6+j], inv[j*6+i] = 0, 0
		}
		inv[i*6+i] = sign
	}
	return true
}

// treeSolve solves H x = b with the factors; the right-hand sides and the
// solutions are in the nodes' x (zero in a joint's padding).
//
// The loops leave out the products with the zeros that buildTree's
// blocks are known to hold (a root's f is not even written): a body's f
// has zero columns from m on, a joint's f zero rows from its size on, a
// joint's dinv is zero off its diagonal in its padding, and a joint's x
// is zero there. Each sum is the same sum of the same nonzero terms in the
// same order, so the result is bit for bit that of the full 6 x 6 loops.
func (t *jointTree) treeSolve() {
	nodes := t.nodes
	// Leaves up: y = L^-1 b, b_p -= F_n^T y_n.
	for q := len(nodes) - 1; q >= 0; q-- {
		nd := &nodes[q]
		if nd.parent < 0 {
			continue
		}
		x := &nd.x
		px := &nodes[nd.parent].x
		cols, rows := nd.m, 6 // a body's f, below a joint of m rows
		if nd.body < 0 {
			cols, rows = 6, nd.m // a joint's f, below a body
		}
		for i := 0; i < cols; i++ {
			v := 0.0
			for k := 0; k < rows; k++ {
				v += nd.f[k*6+i] * x[k]
			}
			px[i] -= v
		}
	}
	// Down from the roots: x_n = D_n^-1 y_n - F_n x_p.
	for q := range nodes {
		nd := &nodes[q]
		x := nd.x
		var z [6]float64
		n := 6
		if nd.body < 0 {
			n = nd.size
		}
		if nd.parent < 0 {
			for i := 0; i < n; i++ {
				v := 0.0
				for k := 0; k < n; k++ {
					v += nd.dinv[i*6+k] * x[k]
				}
				z[i] = v
			}
			nd.x = z
			continue
		}
		px := &nodes[nd.parent].x
		// Columns to m of both products, then the rest of one of them: a
		// body's dinv (its f is zero there) or a joint's f (its dinv and x
		// are zero there).
		m := nd.m
		for i := 0; i < n; i++ {
			v := 0.0
			for k := 0; k < m; k++ {
				v += nd.dinv[i*6+k]*x[k] - nd.f[i*6+k]*px[k]
			}
			if nd.body >= 0 {
				for k := m; k < 6; k++ {
					v += nd.dinv[i*6+k] * x[k]
				}
			} else {
				for k := m; k < 6; k++ {
					v -= nd.f[i*6+k] * px[k]
				}
			}
			z[i] = v
		}
		nd.x = z
	}
}

// projectJoints makes the velocities (pseudo false) or the pseudo-
// velocities (pseudo true) satisfy the forest's joints exactly: J v =
// Target for the velocities; for the pseudo-velocities J vp dt = -C_end,
// where C_end are the joint's values at the end of the step if the bodies
// moved with the final velocities (second order in the step, so that only
// the third-order remainder and the pseudo-velocities' own curvature are
// left for the next step). The velocity projection's impulses are added to
// the rows' Impulse, for the reactions.
func (w *World) projectJoints(pseudo bool) {
	c := &w.collision
	t := &w.mech.tree
	bodies := c.bodies
	dt := w.mech.dt
	for i := range t.nodes {
		nd := &t.nodes[i]
		nd.x = [6]float64{}
		if nd.joint < 0 {
			continue
		}
		jt := &w.mech.joints[nd.joint]
		var end [6]float64
		if pseudo {
			w.endValues(jt, &end)
		}
		for k := 0; k < nd.size; k++ {
			r := w.nodeRow(jt, k)
			A, B := &bodies[r.A], &bodies[r.B]
			// The right-hand side is -(target - J v) = J v - target.
			if pseudo {
				// Motors and friction: the pass leaves their speed alone; a
				// limit that pushes is brought to its stop.
				target := 0.0
				switch {
				case int32(k) < jt.eqCount:
					target = -end[k] / dt
				case r.Correct:
					gap := r.Drift / w.jointScale()
					target = -(gap + (r.LinA.Dot(A.V)+r.AngA.Dot(A.W)+r.LinB.Dot(B.V)+r.AngB.Dot(B.W))*dt) / dt
				}
				nd.x[k] = r.LinA.Dot(A.Vp) + r.AngA.Dot(A.Wp) + r.LinB.Dot(B.Vp) + r.AngB.Dot(B.Wp) - target
			} else {
				nd.x[k] = r.LinA.Dot(A.V) + r.AngA.Dot(A.W) + r.LinB.Dot(B.V) + r.AngB.Dot(B.W) - r.Target
			}
		}
	}
	t.treeSolve()
	for i := range t.nodes {
		nd := &t.nodes[i]
		if nd.body >= 0 {
			b := &bodies[nd.body]
			dv := shapes.Vec3{nd.x[0], nd.x[1], nd.x[2]}
			dw := shapes.Vec3{nd.x[3], nd.x[4], nd.x[5]}
			if pseudo {
				b.Vp, b.Wp = flushTiny(b.Vp.Add(dv)), flushTiny(b.Wp.Add(dw))
			} else {
				b.V, b.W = flushTiny(b.V.Add(dv)), flushTiny(b.W.Add(dw))
			}
		} else if !pseudo {
			jt := &w.mech.joints[nd.joint]
			for k := 0; k < nd.size; k++ {
				w.nodeRow(jt, k).Impulse += nd.x[k]
			}
		}
	}
}

// endValues writes the values of a joint's equality rows at the end of the
// step with the bodies moving at the solved velocities (predictAll), in the
// basis of its decoupled rows.
func (w *World) endValues(jt *joint, out *[6]float64) {
	pa, qa := w.predicted(jt.a)
	pb, qb := w.predicted(jt.b)
	g := jointGeomAt(jt, pa, qa, pb, qb, false)
	eqValues(jt, &g, qb, &jt.basis, out)
	jt.chol.apply(out)
}

// tinyVelocity (m/s or rad/s) is far below anything physical. A motion the
// joints forbid exactly (the out-of-plane turning of a planar linkage)
// starts at rounding level and is cut by the projection every step, so
// left alone it would sink into subnormal numbers, on which arithmetic is
// some ten times slower (measured: a hundred-link chain's step slowed from
// 1.2 to 8 ms within 1.5 s of simulated time). Components below it are 0.
const tinyVelocity = 1e-100

func flushTiny(v shapes.Vec3) shapes.Vec3 {
	for k, x := range v {
		if math.Abs(x) < tinyVelocity {
			v[k] = 0
		}
	}
	return v
}
