package collide

// A cylinder lying on its side touches a plane along a line: the deepest
// points of its two rims. Its other rim points lie as far as a radius above
// that line, and the cylinder's spin about its own axis carries them toward
// the plane at up to the rolling speed. Emitted as speculative points, the
// linear bound v_n >= -gap/dt of speculative contacts (Catto, "Iterative
// dynamics with temporal coherence", 2005, as the solver cites it) treats
// that motion as a straight line: a point a radius above the line then
// caps the spin at one radian per step, while the point really moves on a
// circle about the axis and never comes closer to the plane than the line
// itself. Spin about the axis leaves the cylinder's surface where it is;
// only tilting the axis brings a cap's other points down. So only the
// points of the supporting feature are emitted, the rule of support-feature
// manifolds (Ericson, "Real-Time Collision Detection", 2005, sec. 5.2.3,
// and the contact-feature view of conservative advancement, Mirtich,
// "Impulse-based dynamic simulation of rigid body systems", PhD thesis,
// UC Berkeley, 1996): the whole cap where the cap faces the plane more than
// the side does, else the deepest point of each rim, the contact line.

// rimPoints returns how many of a cap's four rim points, deepest first,
// are candidates: all four when the cap faces the plane (the axis is nearer
// the normal than the plane, |cos| >= sin of its tilt), else one. sin and
// cos are those of the angle between the axis and the normal. The deepest
// point stays, so a cylinder standing on its rim keeps its contact, and a
// cylinder tipping onto its cap gets the cap's points from 45 degrees on,
// farther than any step that stays resolved turns it.
func rimPoints(sin, cos float64) int {
	if cos >= sin {
		return 4
	}
	return 1
}
