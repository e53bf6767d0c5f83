// Package contact solves the contact and joint constraints of one step:
// restitution at impacts, non-penetration, Coulomb friction and position
// correction, by sequential impulses on constraint rows.
//
// It knows bodies only as a slice of Body (inverse mass, world inverse
// inertia, centre of mass, velocities) indexed by integer ids, and contacts
// as a slice of Point filled by the narrow phase; it imports neither the
// world nor the collision code.
//
// # Rows
//
// Every constraint is a row: two bodies, a Jacobian (linear and angular
// parts for each), an effective mass, a target velocity, bounds on the
// accumulated impulse and the impulse itself. A contact point gives three
// rows, the normal (impulse >= 0) and two tangents whose impulse is held in
// the disk |f_t| <= mu f_n. Joints come in as extra rows (Row) and share the
// same iterations.
//
// The points of a face or edge contact that carry a patch (Point.PatchCenter,
// Point.PatchRadius) leave their tangent rows to the patch: two tangents at
// the patch centre and a twist about the normal, bounded together by the
// ellipsoidal limit surface (f_t/(mu N))^2 + (tau/(mu N r))^2 <= 1, so that a
// face resists spinning with the lever arm of uniform pressure (twist.go).
//
// # One step
//
// Solve runs, in order:
//
//  1. Warm start: the impulses of the previous step, matched by Point.Key (a
//     radix sort of the keys merged with last step's, see keys.go), scaled
//     and applied (Catto, "Iterative dynamics with temporal coherence",
//     2005). Friction is remembered as a world vector and projected onto the
//     new tangent plane.
//  2. Sticking or sliding per point: the static coefficient while a contact
//     sticks, the kinetic one while it slides (see Settings.CreepSpeed).
//  3. Impacts: contacts approaching faster than Settings.BounceThreshold get
//     Newton restitution pair by pair, in the given order, on the current
//     approach velocity, with friction; passes repeat while anything still
//     impacts, so impacts travel through chains as in Newton's cradle
//     (Guendelman, Bridson and Fedkiw, "Nonconvex rigid bodies with
//     stacking", SIGGRAPH 2003). The points of one pair are solved together.
//  4. Velocity iterations: projected Gauss-Seidel with accumulated-impulse
//     clamping (Catto 2005). A speculative point (Separation > 0) may
//     approach by Separation/dt.
//  5. Position pass: penetration beyond the point's slop (Settings.Slop, or
//     less for small parts: slop.go) is removed, a fraction
//     per step, by pseudo-velocities (split impulses) in their own
//     Gauss-Seidel sweeps. They are written to Body.Vp, Body.Wp and never
//     into V, W, so position correction adds no kinetic energy.
//
// # Layout
//
// The sweeps touch contiguous memory only: the rows in slices in sweep
// order, each contact row in a compact form (rows.go), and the velocities
// of the bodies that the points join gathered into a solver-own slice
// (bodies.go) and scattered back at the end; bodies that neither move nor
// can be moved share one fixed slot whose side of a row is skipped.
//
// # Use by the world
//
// Each step the world adds gravity and applied forces to V and W, runs the
// narrow phase into a []Point (the points of one manifold consecutive),
// fills the []Body and any joint rows, calls Solve, then integrates
// positions with V+Vp and W+Wp and drops Vp and Wp. Points with
// ImpactSpeed > 0 are the step's impacts. One Solver per world keeps the
// warm-start memory and all scratch space, so steady-state steps allocate
// nothing; body indices may change between steps, keys must not. Points
// left out for a while (their bodies asleep) keep their memory through
// Solver.Remembered and Solver.Recall.
package contact
