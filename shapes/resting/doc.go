// Package resting analyses how a rigid part comes to rest on a flat,
// horizontal support: for every face of its convex hull, whether the part can
// stand on it, how far the support may tilt before the part tips over, and
// the quasi-static probability that a part dropped in a random orientation
// ends up on it.
//
// The probabilities follow the capture-region model of M. A. Wiegley,
// A. S. Rao and K. Y. Goldberg, "Computing a statistical distribution of
// stable poses for a polyhedron", Proc. 30th Allerton Conference, 1992; the
// natural resting aspects of parts in feeders are the subject of
// G. Boothroyd, C. Poli and L. E. Murch, "Automatic Assembly", Marcel Dekker,
// 1982. Each face captures the gravity directions whose ray from the centre
// of mass pierces it, a solid angle computed exactly; a face on which the part
// cannot stand passes its share to the face the part rolls onto.
//
// OfHull analyses a convex hull, OfShape the project's shapes (boxes,
// cylinders, capsules, spheres, hulls and compounds of polyhedral pieces).
// FaceDown names the face a part rests on, given the gravity direction in
// the part's frame, so that the world and sweeps can report resting faces by
// the same index that `clatter inspect` lists.
//
// All directions are in the part's own frame; angles are radians.
package resting
