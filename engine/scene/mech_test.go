package scene

import (
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"clatter/engine"
	"clatter/shapes"
)

// mechBase is a hinged flap over a driven table, in mm and g; the cases
// below add to it. Lines: units 1, the flap 2-6, the table 7-10.
const mechBase = `units = { length = "mm", mass = "g" }
[[body]]
name = "flap"
shape = { box = [100, 10, 30] }
density = "2.7 g/cm3"
position = [50, 0, 100]
[[body]]
name = "table"
driven = true
shape = { box = [400, 400, 20] }
`

// tableDrive drives the table of mechBase.
const tableDrive = `[[drive]]
body = "table"
tilt = { axis = [0, 1, 0], rate = "1 deg/s" }
`

func TestMechanismKeys(t *testing.T) {
	// Units: 1 rpm = 2 pi/60 rad/s; 1 N m = 1 kg m^2/s^2; plain numbers of
	// a hinge's stiffness are in g mm^2/s^2 per rad (the scene files'
	// convention: angles in degrees, angular quantities otherwise in rad).
	src := mechBase + tableDrive + `[[joint]]
name = "pin"
kind = "revolute"
bodies = ["flap", "table"]
at = [0, 0, 100]
axis = [0, 2, 0]
limits = [-30, "90 deg"]
friction = "0.01 N m"
collide = true
motor = { target = 10, stiffness = 2e9, damping = "0.1 N m s/rad", max_torque = "5 N m", program = [{ time = 1, target = 45 }] }
[[joint]]
name = "spin"
kind = "revolute"
bodies = ["flap"]
at = [0, 0, 100]
axis = [0, 1, 0]
motor = { speed = "30 rpm" }
`
	s, err := Parse([]byte(src), "mech.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Joints) != 2 || len(s.Drives) != 1 {
		t.Fatalf("%d joints and %d drives", len(s.Joints), len(s.Drives))
	}
	pin := s.Joints[0]
	d := pin.Def
	deg := math.Pi / 180
	if pin.A != "flap" || pin.B != "table" || d.Kind != engine.Revolute || pin.KindName() != "revolute" || !d.Collide {
		t.Errorf("joint %+v", pin)
	}
	if !nearVec(d.Anchor, shapes.Vec3{0, 0, 0.1}) || !nearVec(d.Axis, shapes.Vec3{0, 2, 0}) {
		t.Errorf("anchor %v axis %v", d.Anchor, d.Axis)
	}
	if !d.Limited || !near(d.Lower, -30*deg) || !near(d.Upper, 90*deg) || !near(d.Friction, 0.01) {
		t.Errorf("limits %v..%v friction %g", d.Lower, d.Upper, d.Friction)
	}
	m := d.Motor
	if m.Mode != engine.MotorServo || !near(m.Target, 10*deg) || !near(m.Stiffness, 2e9*1e-3*1e-6) || !near(m.Damping, 0.1) || !near(m.MaxForce, 5) {
		t.Errorf("motor %+v", m)
	}
	if len(pin.Program) != 1 || pin.Program[0].Time != 1 || !near(pin.Program[0].Motor.Target, 45*deg) || pin.Program[0].Motor.Stiffness != m.Stiffness {
		t.Errorf("program %+v", pin.Program)
	}
	spin := s.Joints[1].Def.Motor
	if s.Joints[1].B != "" || spin.Mode != engine.MotorSpeed || !near(spin.Speed, math.Pi) || !math.IsInf(spin.MaxForce, 1) {
		t.Errorf("speed motor %+v (base %q)", spin, s.Joints[1].B)
	}
	tl, ok := s.Drives[0].Motion.(*engine.Tilt)
	if !ok || !near(tl.Rate, deg) || tl.Point != (shapes.Vec3{}) {
		t.Errorf("drive %+v", s.Drives[0])
	}
	tb := s.Bodies[s.BodyIndex("table")]
	if !tb.Static || !tb.Driven {
		t.Errorf("table static %v driven %v; a driven body is not moved by contact", tb.Static, tb.Driven)
	}
	w, ids, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	if w.KindOf(ids[1]) != engine.Kinematic || w.NumJoints() != 2 {
		t.Errorf("table is %v, %d joints", w.KindOf(ids[1]), w.NumJoints())
	}
	// A study varies a joint's keys by its name.
	v, err := s.With("joint.pin.motor.stiffness", 4e9)
	if err != nil {
		t.Fatal(err)
	}
	if got := v.Joints[0].Def.Motor.Stiffness; !near(got, 4) {
		t.Errorf("varied stiffness %g N m/rad, want 4", got)
	}
}

func TestDriveKeys(t *testing.T) {
	csv := "time,x,y,z\n0,0,0,0\n1,10,0,0\n2,0,0,0\n"
	fsys := fstest.MapFS{"poses.csv": {Data: []byte(csv)}}
	src := mechBase + `[[drive]]
body = "table"
path = "poses.csv"
repeat = true
conveyor = ["0.2 m/s", 0, 0]
[[body]]
name = "track"
driven = true
shape = { box = [400, 40, 10] }
[[drive]]
body = "track"
center = [0, 0, -50]
vibration = [{ along = [1, 0, 1], amplitude = 0.5, frequency = "100 Hz", phase = 90 }, { turn = [0, 0, 1], amplitude = 0.2, frequency = 100 }]
[[body]]
name = "belt"
static = true
shape = { box = [400, 40, 10] }
[[drive]]
body = "belt"
conveyor = [100, 0, 0]
`
	s, err := Parse([]byte(src), "drive.toml", Options{FS: fsys, Dir: "."})
	if err != nil {
		t.Fatal(err)
	}
	table, ok := s.Drives[0].Motion.(*engine.PoseTable)
	if !ok || !table.Repeat || len(table.Times) != 3 || !nearVec(table.Poses[1].Position, shapes.Vec3{0.01, 0, 0}) || !nearVec(s.Drives[0].Conveyor, shapes.Vec3{0.2, 0, 0}) {
		t.Errorf("path drive %+v", s.Drives[0])
	}
	vib, ok := s.Drives[1].Motion.(*engine.Vibration)
	if !ok || len(vib.Terms) != 2 || !nearVec(vib.Center, shapes.Vec3{0, 0, -0.05}) {
		t.Fatalf("vibration %+v", s.Drives[1].Motion)
	}
	lin, rot := vib.Terms[0], vib.Terms[1]
	if lin.Rotary || !near(lin.Amplitude, 5e-4) || lin.Frequency != 100 || !near(lin.Phase, math.Pi/2) {
		t.Errorf("linear term %+v", lin)
	}
	if !rot.Rotary || !near(rot.Amplitude, 0.2*math.Pi/180) || rot.Axis != (shapes.Vec3{0, 0, 1}) {
		t.Errorf("rotary term %+v", rot)
	}
	if d := s.Drives[2]; d.Motion != nil || !nearVec(d.Conveyor, shapes.Vec3{0.1, 0, 0}) {
		t.Errorf("conveyor %+v", d)
	}
	if _, _, err := s.Build(); err != nil {
		t.Fatal(err)
	}
}

func TestBadMechanismKeys(t *testing.T) {
	revolute := func(extra string) string {
		return mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"revolute\"\nbodies = [\"flap\", \"table\"]\nat = [0, 0, 100]\naxis = [0, 1, 0]\n" + extra
	}
	vib := func(term string) string {
		return mechBase + "[[drive]]\nbody = \"table\"\nvibration = [" + term + "]\n"
	}
	for _, c := range []struct{ name, src, want string }{
		{"misspelt joint key", revolute("axsi = [0, 1, 0]\n"), `mech.toml:20: unknown key "axsi" in joint "pin"; did you mean "axis"?`},
		{"unknown kind", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"hing\"\n", `joint "pin": unknown kind "hing"; did you mean "revolute" (called "hinge" before)?`},
		{"no name", mechBase + tableDrive + "[[joint]]\nkind = \"revolute\"\n", `[[joint]] number 1: name is missing`},
		{"no bodies", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\n", `joint "pin": bodies is missing`},
		{"unknown body", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"flop\"]\nat = [0, 0, 0]\n",
			`mech.toml:17: joint "pin": no body is named "flop"; did you mean "flap"?`},
		{"three bodies", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"flap\", \"table\", \"flap\"]\n", `bodies must name one or two bodies`},
		{"fixed body first", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"table\", \"flap\"]\nat = [0, 0, 0]\n",
			`joint "pin": the first body "table" is driven; name the moving body first`},
		{"no moving body", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"table\"]\nat = [0, 0, 0]\n",
			`neither body moves under gravity and contact`},
		{"revolute joint without axis", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"revolute\"\nbodies = [\"flap\"]\nat = [0, 0, 100]\n",
			`joint "pin": a revolute joint needs axis = [x, y, z], the line it turns about`},
		{"spherical joint without point", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"flap\"]\n", `a spherical joint needs at = [x, y, z]`},
		{"zero axis", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"prismatic\"\nbodies = [\"flap\"]\naxis = [0, 0, 0]\n", `joint "pin": axis must not be zero`},
		{"limits reversed", revolute("limits = [30, -30]\n"), `joint "pin": limits must be [lower, upper] with lower <= upper, got 30 and -30 deg`},
		{"limits of a spherical joint", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"spherical\"\nbodies = [\"flap\"]\nat = [0, 0, 0]\nlimits = [0, 1]\n",
			`a spherical joint takes no limits`},
		{"motor of a fixed joint", mechBase + tableDrive + "[[joint]]\nname = \"pin\"\nkind = \"fixed\"\nbodies = [\"flap\"]\nmotor = { speed = 1 }\n",
			`a fixed joint takes no motor: only revolute and prismatic joints are driven by a motor`},
		{"speed and target", revolute("motor = { speed = 1, target = 2, stiffness = 1 }\n"), `give either speed (a speed motor) or target`},
		{"servo without spring", revolute("motor = { target = 20 }\n"), `a servo needs stiffness > 0 or damping > 0`},
		{"force cap on a revolute joint", revolute("motor = { speed = 1, max_force = 2 }\n"), `unknown key "max_force" in the motor of joint "pin"`},
		{"zero cap", revolute("motor = { speed = 1, max_torque = 0 }\n"), `max_torque must be positive (leave it out for no cap)`},
		{"torque as a force", revolute("friction = \"2 N\"\n"), `friction must be a torque, got "2 N", which is a force`},
		{"negative friction", revolute("friction = -1\n"), `friction (a torque that resists the motion) must be >= 0`},
		{"program out of order", revolute("motor = { target = 0, stiffness = 1, program = [{ time = 2, target = 1 }, { time = 1, target = 0 }] }\n"),
			`program entry 2: times must be >= 0 and in order, got 1 s after 2 s`},
		{"program speed of a servo", revolute("motor = { target = 0, stiffness = 1, program = [{ time = 2, speed = 1 }] }\n"), `unknown key "speed" in program entry 1`},
		{"link without other end", mechBase + tableDrive + "[[joint]]\nname = \"rope\"\nkind = \"link\"\nbodies = [\"flap\"]\nat = [0, 0, 0]\n",
			`a link joint needs at_other`},
		{"length of a revolute joint", revolute("length = 3\n"), `a revolute joint takes no length`},
		{"duplicate joint", revolute("") + "[[joint]]\nname = \"pin\"\nkind = \"fixed\"\nbodies = [\"flap\"]\n", `joint "pin": the name is already used by the joint at line 14`},
		{"static and driven", strings.Replace(mechBase, "driven = true\n", "driven = true\nstatic = true\n", 1) + tableDrive, `a body is either static (it never moves) or driven`},
		{"driven without drive", mechBase, `mech.toml:9: body "table": driven = true, but no [[drive]] names it`},
		{"driven body with mass", mechBase + "mass = 3\n" + tableDrive, `body "table": a driven body moves only as its [[drive]] says, so it takes no mass`},
		{"drive of a dynamic body", mechBase + tableDrive + "[[drive]]\nbody = \"flap\"\nconveyor = [1, 0, 0]\n", `drive of "flap": body "flap" is dynamic`},
		{"vibration of a static body", strings.Replace(mechBase, "driven = true", "static = true", 1) + tableDrive,
			`body "table" is static, so it cannot be moved by tilt; write driven = true in its [[body]] instead of static = true`},
		{"two motions", mechBase + "[[drive]]\nbody = \"table\"\ntilt = { axis = [0, 1, 0], rate = 1 }\npath = \"p.csv\"\n", `give one of vibration, tilt and path, got tilt and path`},
		{"two drives", mechBase + tableDrive + tableDrive, `drive of "table": the body is already driven by the [[drive]] at line 11`},
		{"unknown drive body", mechBase + tableDrive + "[[drive]]\nbody = \"tabel\"\nconveyor = [1, 0, 0]\n", `no body is named "tabel"; did you mean "table"?`},
		{"term without direction", vib("{ amplitude = 1, frequency = 50 }"), `vibration term 1: give along = [x, y, z] (a linear vibration) or turn`},
		{"term without frequency", vib("{ along = [0, 0, 1], amplitude = 1 }"), `vibration term 1: frequency is missing`},
		{"zero frequency", vib("{ along = [0, 0, 1], amplitude = 1, frequency = 0 }"), `frequency must be positive`},
		{"negative amplitude", vib("{ along = [0, 0, 1], amplitude = -1, frequency = 50 }"), `amplitude must be >= 0 (a phase of 180 reverses a term)`},
		{"angle as amplitude of a line", vib("{ along = [0, 0, 1], amplitude = \"1 deg\", frequency = 50 }"), `amplitude must be a length`},
		{"too coarse a step", vib("{ along = [0, 0, 1], amplitude = 0.1, frequency = 400 }"),
			`drive of "table": the 400 Hz vibration gets only 2.5 steps of 0.001 s per period, too few to follow it; use a step of at most 0.0001 s`},
		{"tilt without rate", mechBase + "[[drive]]\nbody = \"table\"\ntilt = { axis = [0, 1, 0] }\n", `rate is missing`},
		{"negative tilt rate", mechBase + "[[drive]]\nbody = \"table\"\ntilt = { axis = [0, 1, 0], rate = -1 }\n", `rate must be positive; turn the axis around`},
		{"missing pose table", mechBase + "[[drive]]\nbody = \"table\"\npath = \"nope.csv\"\n", `drive of "table": pose table "nope.csv" not found`},
		{"repeat without path", mechBase + tableDrive + "repeat = true\n", `repeat belongs to a path`},
		{"randomized jointed body", revolute("") + "[sweep]\ntrials = 2\n[sweep.randomize]\norientation = [\"flap\"]\n",
			`body "flap" is held by a joint, whose geometry is fixed in the scene`},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse([]byte(c.src), "mech.toml", Options{FS: fstest.MapFS{}, Dir: "."})
			if err == nil {
				t.Fatalf("no error, want %q", c.want)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("got\n%v\nwant it to contain\n%s", err, c.want)
			}
		})
	}
}

func TestVaryWarnsOfPlainUnits(t *testing.T) {
	// A study replaces "1 deg/s" by plain numbers, which are rad/s (angular
	// speeds in a scene are rad/s): the user is told.
	src := mechBase + tableDrive + "[sweep]\ntrials = 1\n[[sweep.vary]]\nkey = \"drive.table.tilt.rate\"\nvalues = [0.01, 0.02]\n"
	s, err := Parse([]byte(src), "mech.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := `mech.toml:17: [[sweep.vary]] "drive.table.tilt.rate": the scene writes "1 deg/s", but the values are plain numbers in the file's units, rad/s`
	if len(s.Warnings) != 1 || s.Warnings[0] != want {
		t.Errorf("warnings %q, want %q", s.Warnings, want)
	}
	v, err := s.With("drive.table.tilt.rate", 0.02)
	if err != nil {
		t.Fatal(err)
	}
	if r := v.Drives[0].Motion.(*engine.Tilt).Rate; r != 0.02 {
		t.Errorf("varied rate %g rad/s, want 0.02", r)
	}
}
