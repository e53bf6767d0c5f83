package scene

import (
	"fmt"

	"clatter/engine"
)

// renamedJointKinds are the joint kinds of the previous release and their
// names now, after the kinematic pairs of mechanism textbooks (the
// revolute, prismatic and spherical pairs; a fixed joint allows no motion
// at all). A scene that still uses an old name is read as before, with a
// warning that names the new one. The old names go in the next release:
// delete this table and its two uses then.
var renamedJointKinds = [...]struct{ old, now string }{
	{"hinge", "revolute"},
	{"slider", "prismatic"},
	{"ball", "spherical"},
	{"weld", "fixed"},
}

// currentJointKind returns the current name of a joint kind and, when the
// file used a name of the previous release, the warning to give (the
// reader puts the file and line in front).
func currentJointKind(kind string) (now, warning string) {
	for _, r := range renamedJointKinds {
		if r.old == kind {
			return r.now, fmt.Sprintf("joint kind %q is now %q; the old name will be removed", r.old, r.now)
		}
	}
	return kind, ""
}

// jointKindSuggestion is the hint for an unknown joint kind: the nearest
// current name, or the current name of the nearest old one.
func jointKindSuggestion(kind string) string {
	if n, ok := Nearest(kind, jointKindNames); ok {
		return fmt.Sprintf("; did you mean %q?", n)
	}
	var old []string
	for _, r := range renamedJointKinds {
		old = append(old, r.old)
	}
	if n, ok := Nearest(kind, old); ok {
		now, _ := currentJointKind(n)
		return fmt.Sprintf("; did you mean %q (called %q before)?", now, n)
	}
	return ""
}

// JointKindNamed returns the joint kind of a name as scene files and
// summary.json write it, current or of the previous release, so that
// readers of older files keep working.
func JointKindNamed(name string) (engine.JointKind, bool) {
	now, _ := currentJointKind(name)
	k, ok := jointKinds[now]
	return k, ok
}
