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
// nodes: a root's f is zero, the other blocks are written before they are
// read (jacobianOf, buildTree, projectJoints; a root's jac is not used).
// The pointer is valid until the next push.
func (t *jointTree) push(body, joint int32, size int, parent int32) *treeNode {
	if len(t.nodes) < cap(t.nodes) {
		t.nodes = t.nodes[:len(t.nodes)+1]
	} else {
		t.nodes = append(t.nodes, treeNode{})
	}
	nd := &t.nodes[len(t.nodes)-1]
	nd.body, nd.joint, nd.size, nd.parent, nd.m = body, joint, size, parent, 0
	if parent < 0 {
		nd.f = mat6{} // a root has no parent to couple to
	}
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
	t := &w.mech.tree
	t.nodes = t.nodes[:0]
	t.bodyOf = growFill(t.bodyOf, len(w.collision.bodies), -1)
	if !w.treeAdjacency() {
		return false
	}
	w.orderTree()
	w.treeDiagonals()
	return w.eliminateTree()
}

// inTree reports whether a joint is a node of the forest: it has rows
// this step, equality rows among them, and closes no loop.
func inTree(jt *joint) bool { return jt.count > 0 && jt.eqCount > 0 && !jt.loop }

// treeAdjacency picks the rows of the forest's joints and lists the joints
// of each moving body (CSR, counting sort by body). It reports false if no
// joint is in the forest.
func (w *World) treeAdjacency() bool {
	t := &w.mech.tree
	nb := len(w.collision.bodies)
	joints := w.mech.joints
	for j := range joints {
		if jt := &joints[j]; inTree(jt) {
			w.pickNodeRows(jt)
		}
	}
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
	return true
}

// orderTree lays out the nodes breadth-first, parents before children,
// from a root in each group: a joint to a fixed body if the group has one,
// else its first body. A joint to a fixed body that is a leaf has a block
// of nearly zero (its regularisation) to eliminate, which costs digits; as
// the root it is eliminated last, from a block its children have filled.
func (w *World) orderTree() {
	t := &w.mech.tree
	joints := w.mech.joints
	t.seen = growFill(t.seen, len(joints), false)
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
		w.growTree()
	}
	for root := int32(0); root < int32(len(w.collision.bodies)); root++ {
		if t.bodyOf[root] >= 0 || t.adjAt[root] == t.adjAt[root+1] {
			continue
		}
		t.bodyOf[root] = int32(len(t.nodes))
		t.push(root, -1, 6, -1)
		w.growTree()
	}
}

// growTree adds, breadth-first from the last node pushed, the joints and
// bodies not yet in the forest that hang below it.
func (w *World) growTree() {
	t := &w.mech.tree
	joints := w.mech.joints
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

// treeDiagonals sets the diagonal blocks. All blocks are stored 6 x 6
// (row-major): a joint of m < 6 rows is padded with zero rows and columns
// of H and a -1 on the diagonal of its block, which keeps the padding out
// of every product and lets the loops run to a constant bound.
func (w *World) treeDiagonals() {
	c := &w.collision
	t := &w.mech.tree
	bodies := c.bodies
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
			jt := &w.mech.joints[nd.joint]
			for k := 0; k < 6; k++ {
				nd.d[k*6+k] = -1
				if k < nd.size {
					r := w.nodeRow(jt, k)
					nd.d[k*6+k] = -treeRegularization * selfCoupling(r, bodies)
				}
			}
		}
	}
}

// eliminateTree factors H from the leaves up (children come after their
// parents). It reports false if a block is not definite.
func (w *World) eliminateTree() bool {
	t := &w.mech.tree
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

// The products below, treeSolve and definiteInverse build up the sums of
// a row (or column) of their result side by side in six named variables,
// which the compiler keeps in registers, instead of each sum waiting for
// its own previous addition: about twice as fast. Every sum still adds the
// same terms in the same order from zero; the extra sums (of zero padding,
// or past the lower triangle) are dropped, so the results are the same
// bits as those of the plain loops.

// mulAB sets c = -a b for b with zero rows from m on and a (a joint's
// dinv) zero off its diagonal in rows and columns from m on: the rows of
// c from m on are zero.
func mulAB(c, a, b *mat6, m int) {
	m = min(m, 6)
	for i := 0; i < m; i++ {
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < m; k++ {
			aik, bk := a[i*6+k], (*[6]float64)(b[k*6:])
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, aik, bk)
		}
		c[i*6], c[i*6+1], c[i*6+2], c[i*6+3], c[i*6+4], c[i*6+5] = -v0, -v1, -v2, -v3, -v4, -v5
	}
	clear(c[m*6:])
}

// mulABt sets c = -a b^T for b with zero rows from m on: the columns of c
// from m on are zero.
func mulABt(c, a, b *mat6, m int) {
	for i := 0; i < 6; i++ {
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < 6; k++ {
			aik := a[i*6+k]
			v0 += aik * b[k]
			v1 += aik * b[6+k]
			v2 += aik * b[12+k]
			v3 += aik * b[18+k]
			v4 += aik * b[24+k]
			v5 += aik * b[30+k]
		}
		ci := (*[6]float64)(c[i*6:])
		ci[0], ci[1], ci[2], ci[3], ci[4], ci[5] = -v0, -v1, -v2, -v3, -v4, -v5
		for j := m; j < 6; j++ {
			ci[j] = 0
		}
	}
}

// mulAddLower adds a b to the lower triangle of c, for a with zero rows
// and b with zero columns from m on.
func mulAddLower(c, a, b *mat6, m int) {
	m = min(m, 6)
	for i := 0; i < m; i++ {
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < 6; k++ {
			aik, bk := a[i*6+k], (*[6]float64)(b[k*6:])
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, aik, bk)
		}
		addLowerRow(c, i, v0, v1, v2, v3, v4, v5)
	}
}

// mulAtBAddLower adds a^T b to the lower triangle of c, for a and b with
// zero rows from m on.
func mulAtBAddLower(c, a, b *mat6, m int) {
	m = min(m, 6)
	for i := 0; i < 6; i++ {
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < m; k++ {
			aki, bk := a[k*6+i], (*[6]float64)(b[k*6:])
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, aki, bk)
		}
		addLowerRow(c, i, v0, v1, v2, v3, v4, v5)
	}
}

// madd6 returns v + s b, component by component: one step of six sums
// built up side by side (it is inlined, and the sums stay in registers).
func madd6(v0, v1, v2, v3, v4, v5, s float64, b *[6]float64) (float64, float64, float64, float64, float64, float64) {
	return v0 + s*b[0], v1 + s*b[1], v2 + s*b[2], v3 + s*b[3], v4 + s*b[4], v5 + s*b[5]
}

// addLowerRow adds v to row i of c up to the diagonal.
func addLowerRow(c *mat6, i int, v0, v1, v2, v3, v4, v5 float64) {
	v := [6]float64{v0, v1, v2, v3, v4, v5}
	ci := (*[6]float64)(c[i*6:])
	for j := 0; j <= i && j < 6; j++ {
		ci[j] += v[j]
	}
}

// definiteInverse writes the inverse of the symmetric 6 x 6 matrix a,
// positive definite if sign is 1 and negative definite if sign is -1, into
// inv by way of the Cholesky factor of sign a; it reports false if a is
// not definite to working precision. Only the lower triangle of a is read.
// Rows and columns from n on are a joint's padding, zero but for the
// diagonal's sign: their inverse is written without arithmetic.
func definiteInverse(a, inv *mat6, sign float64, n int) bool {
	n = min(n, 6) // as it is; this lets the compiler drop the bounds checks
	var l, li [6][6]float64
	for i := 0; i < n; i++ {
		ai := (*[6]float64)(a[i*6:])
		for j := 0; j <= i; j++ {
			l[i][j] = sign * ai[j]
		}
	}
	// Cholesky: l lower with l l^T = sign a.
	for j := 0; j < n; j++ {
		lj := &l[j]
		d := lj[j]
		for k := 0; k < j; k++ {
			d -= lj[k] * lj[k]
		}
		if !(d > 0) {
			return false
		}
		d = math.Sqrt(d)
		lj[j] = d
		for i := j + 1; i < n; i++ {
			lr := &l[i]
			v := lr[j]
			for k := 0; k < j; k++ {
				v -= lr[k] * lj[k]
			}
			lr[j] = v / d
		}
	}
	// li = l^-1, lower triangular, a row at a time: li_ij = -(sum over k
	// from j to i-1 of l_ik li_kj) / l_ii. The terms with k < j are those
	// of li's upper triangle, zero, and leave the sums as they are.
	for i := 0; i < n; i++ {
		lr := &l[i]
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < i; k++ {
			lik, lk := lr[k], &li[k]
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, -lik, lk) // v - s b: the same bits
		}
		v := [6]float64{v0, v1, v2, v3, v4, v5}
		for j := 0; j < i; j++ {
			li[i][j] = v[j] / lr[i]
		}
		li[i][i] = 1 / lr[i]
	}
	// a^-1 = sign li^T li.
	for i := 0; i < n; i++ {
		var v0, v1, v2, v3, v4, v5 float64
		for k := i; k < n; k++ {
			lki, lk := li[k][i], &li[k]
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, lki, lk)
		}
		v := [6]float64{v0, v1, v2, v3, v4, v5}
		for j := 0; j <= i; j++ {
			inv[i*6+j], inv[j*6+i] = sign*v[j], sign*v[j]
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
// solutions are in the nodes' x (zero in a joint's padding). The six sums
// of each product build up side by side in named variables, which the
// compiler keeps in registers (see mulAB).
func (t *jointTree) treeSolve() {
	nodes := t.nodes
	// Leaves up: y = L^-1 b, b_p -= F_n^T y_n.
	for q := len(nodes) - 1; q >= 0; q-- {
		nd := &nodes[q]
		if nd.parent < 0 {
			continue
		}
		var v0, v1, v2, v3, v4, v5 float64
		for k := 0; k < 6; k++ {
			xk, f := nd.x[k], (*[6]float64)(nd.f[k*6:])
			v0, v1, v2, v3, v4, v5 = madd6(v0, v1, v2, v3, v4, v5, xk, f)
		}
		px := &nodes[nd.parent].x
		px[0], px[1], px[2], px[3], px[4], px[5] = px[0]-v0, px[1]-v1, px[2]-v2, px[3]-v3, px[4]-v4, px[5]-v5
	}
	// Down from the roots: x_n = D_n^-1 y_n - F_n x_p.
	for q := range nodes {
		nd := &nodes[q]
		var px [6]float64
		if nd.parent >= 0 {
			px = nodes[nd.parent].x
		}
		var z0, z1, z2, z3, z4, z5 float64
		d, f := &nd.dinv, &nd.f
		for k := 0; k < 6; k++ {
			xk, pk := nd.x[k], px[k]
			z0 += d[k]*xk - f[k]*pk
			z1 += d[6+k]*xk - f[6+k]*pk
			z2 += d[12+k]*xk - f[12+k]*pk
			z3 += d[18+k]*xk - f[18+k]*pk
			z4 += d[24+k]*xk - f[24+k]*pk
			z5 += d[30+k]*xk - f[30+k]*pk
		}
		nd.x = [6]float64{z0, z1, z2, z3, z4, z5}
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
