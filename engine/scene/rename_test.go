package scene

import (
	"reflect"
	"strings"
	"testing"
)

// renameScene holds one joint of each renamed kind; the %s are the kinds,
// in the order revolute, prismatic, spherical, fixed, on lines 20, 28, 35
// and 40.
const renameScene = `[world]
step = 0.001
[[body]]
name = "arm"
shape = { box = [0.4, 0.04, 0.02] }
density = 2700
position = [0.2, 0, 1]
[[body]]
name = "ram"
shape = { box = [0.05, 0.05, 0.1] }
density = 7800
position = [1, 0, 1]
[[body]]
name = "bob"
shape = { sphere = 0.03 }
density = 7800
position = [2, 0.3, 1]
[[joint]]
name = "pin"
kind = "%s"
bodies = ["arm"]
at = [0, 0, 1]
axis = [0, 1, 0]
limits = [-60, 10]
motor = { speed = "10 rpm", max_torque = "2 N m" }
[[joint]]
name = "guide"
kind = "%s"
bodies = ["ram"]
axis = [0, 0, 1]
limits = [-0.2, 0]
friction = "1 N"
[[joint]]
name = "socket"
kind = "%s"
bodies = ["bob"]
at = [2, 0, 1]
[[joint]]
name = "clamp"
kind = "%s"
bodies = ["ram", "arm"]
`

func renameSrc(kinds ...string) []byte {
	src := renameScene
	for _, k := range kinds {
		src = strings.Replace(src, "%s", k, 1)
	}
	return []byte(src)
}

// TestOldJointKinds reads a scene written with the joint kinds of the
// previous release: each old name gives a warning that names the new one,
// and the scene reads and runs exactly as the one with the new names.
func TestOldJointKinds(t *testing.T) {
	old, err := Parse(renameSrc("hinge", "slider", "ball", "weld"), "old.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	cur, err := Parse(renameSrc("revolute", "prismatic", "spherical", "fixed"), "old.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := append([]string{
		`old.toml:20: joint kind "hinge" is now "revolute"; the old name will be removed`,
		`old.toml:28: joint kind "slider" is now "prismatic"; the old name will be removed`,
		`old.toml:35: joint kind "ball" is now "spherical"; the old name will be removed`,
		`old.toml:40: joint kind "weld" is now "fixed"; the old name will be removed`,
	}, cur.Warnings...)
	if !reflect.DeepEqual(old.Warnings, want) {
		t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(old.Warnings, "\n"), strings.Join(want, "\n"))
	}
	if !reflect.DeepEqual(old.Joints, cur.Joints) {
		t.Fatalf("joints differ:\n%+v\n%+v", old.Joints, cur.Joints)
	}
	for i, j := range old.Joints {
		if k, ok := JointKindNamed(j.KindName()); !ok || k != j.Kind {
			t.Errorf("joint %d: its kind's name %q reads back as %v", i, j.KindName(), k)
		}
	}

	// Both run alike, bit for bit: the motor drives the arm into its stop
	// and the ram (clamped to the arm) into its own.
	wo, ids, err := old.Build()
	if err != nil {
		t.Fatal(err)
	}
	wc, _, err := cur.Build()
	if err != nil {
		t.Fatal(err)
	}
	for n := 0; n < 500; n++ {
		if err := wo.Step(old.World.Step); err != nil {
			t.Fatal(err)
		}
		if err := wc.Step(cur.World.Step); err != nil {
			t.Fatal(err)
		}
	}
	for _, id := range ids {
		if wo.Position(id) != wc.Position(id) || wo.Orientation(id) != wc.Orientation(id) {
			t.Errorf("body %q: %v %v with the old names, %v %v with the new", wo.Name(id), wo.Position(id), wo.Orientation(id), wc.Position(id), wc.Orientation(id))
		}
	}
}

// TestOldNamesInOutputs checks that names written by the previous release
// (in summary.json) still read as their kinds.
func TestOldNamesInOutputs(t *testing.T) {
	for _, c := range []struct {
		old, now string
	}{{"hinge", "revolute"}, {"slider", "prismatic"}, {"ball", "spherical"}, {"weld", "fixed"}, {"link", "link"}} {
		ko, oko := JointKindNamed(c.old)
		kn, okn := JointKindNamed(c.now)
		if !oko || !okn || ko != kn {
			t.Errorf("%q reads as %v (%v), %q as %v (%v)", c.old, ko, oko, c.now, kn, okn)
		}
	}
	if _, ok := JointKindNamed("hindge"); ok {
		t.Error(`"hindge" read as a joint kind`)
	}
}
