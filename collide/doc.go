// Package collide finds which pairs of bodies touch and where: the narrow
// phase (this package), the sweep-and-prune broad phase (package
// collide/broad) and bounding volume hierarchies over static triangle
// meshes (package collide/bvh).
//
// A Detector answers, for one candidate pair at a time,
//
//	dst = det.Collide(dst[:0], shapeA, poseA, shapeB, poseB, margin)
//
// with contact manifolds: a world normal from A toward B and at most four
// points, each with its signed separation (negative when penetrating,
// positive up to margin for speculative contacts of shapes still apart) and
// a feature id that stays the same while the same features touch, so that
// impulses carry over between steps. A manifold also describes the contact
// patch that its points sample, its centre and effective friction radius, from
// all the touching candidates before the reduction to four (patch.go), for
// friction against twisting. A Detector keeps scratch buffers and allocates
// nothing once they have grown; use one per world.
//
// A world that queries the same pairs step after step calls
//
//	dst = det.CollidePair(dst[:0], key, shapeA, poseA, shapeB, poseB, margin)
//
// with a key per pair (the two body ids), and det.NextStep() after each
// step's queries. The results are those of Collide; the Detector remembers
// per key the axis that last proved a pair apart and tries it first, so a
// pair still apart costs two support queries (most candidate pairs of a
// resting pile are apart). It also remembers the simplex a pair's last GJK
// query ended with, and the next one starts from it (gjkwarm.go): on the
// general path the results are then Collide's to GJK's and EPA's
// tolerances, found in a fraction of the iterations for a pair that moves
// a little a step. With det.SetPersistence(slop) a touching pair
// that has barely moved since its last full query refreshes that query's
// points from the two shapes' frames instead (persist.go), within a tenth
// of the slop of a fresh query.
//
// Methods, by pair:
//   - spheres and capsules: exactly, through their core point or segment;
//     two points for capsules lying side by side;
//   - a sphere against a box, cylinder or hull: the exact closest point (GJK
//     on the centre for hulls), the nearest face when the centre is inside;
//   - boxes and hulls against each other: the separating-axis test on face
//     normals and edge cross products (edge pairs pruned on the Gauss map;
//     15 axes for two boxes; a box's arcs found from the coordinate planes
//     of its frame, so a box against a hull costs one pass over the hull;
//     a hull of 256 faces or more is searched by branch and bound over cone
//     trees of its face and edge normals instead, with the same answer,
//     hullindex.go; a hull lying over a box's face skips the hull's faces
//     and edges when its deepest vertex proves they cannot change the
//     answer, boxhullrest.go), then the incident face clipped against the reference face
//     (Sutherland and Hodgman 1974) for up to four points;
//   - a cylinder against a box or a mesh triangle: separating axes (face normals, the cylinder's axis, side
//     and edge, vertex and rim, and the common normals of an edge and a
//     rim circle, found by a one-dimensional search only for edges that
//     come within the depth of a rim), accepted when points of both
//     shapes certify the distance or the overlap, else the general path
//     below (cylpoly.go); then the manifold as on the general path;
//   - every other convex pair (two cylinders, a cylinder or a capsule
//     against a hull, a capsule against a box, any other shapes.Convex): GJK distance with the signed-volumes
//     sub-simplex step (Gilbert, Johnson and Keerthi 1988; Montanari,
//     Petrinic and Barbieri 2017) and EPA depth (van den Bergen 2001/2003),
//     then the features of both shapes along the normal clipped into a
//     manifold (a cylinder's cap as a rim polygon, its side as a line);
//   - a convex shape against a static Plane: its support points within the
//     margin (box and hull vertices, cylinder rim points, capsule ends);
//   - a convex shape against a static Mesh (see NewMesh): each triangle the
//     hierarchy returns as a thin convex, with internal-edge correction from
//     the mesh's edge adjacency, and the contacts of coplanar triangles
//     merged into one manifold, so that a part sliding over a tessellated
//     flat sees the same contact as on a plane; a box or hull face lying
//     flat on a triangle gives its corners over it directly (meshflat.go);
//     the triangles near a part are kept for a box a quarter larger than
//     its own and picked from that list while it stays inside
//     (meshmem.go), with the same result as a walk of the hierarchy;
//   - a shapes.Compound: each piece against the other shape, SubA/SubB
//     naming the piece.
//
// Distance and Penetration expose the GJK and EPA queries themselves.
// Iterative methods are bounded; Stats counts their fallbacks.
//
// It imports package shapes and nothing above it.
package collide
