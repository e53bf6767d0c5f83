// Package contact builds constraint rows for contacts and joints and solves
// them with sequential impulses (projected Gauss-Seidel) with accumulated
// clamping and warm starting, Coulomb friction, and restitution.
//
// It knows bodies only as rows of mass and inertia data indexed by integer
// id; it imports neither the world nor the command.
package contact
