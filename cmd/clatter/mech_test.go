package main

import (
	"bufio"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

// The four mechanism examples of testdata/mechanisms, each run with
// `clatter run` and checked against what it must do.

// jointRow is one line of joints.csv; missing quantities are NaN.
type jointRow struct {
	t     float64
	joint string
	v     [9]float64 // fx fy fz tx ty tz position speed effort
}

func readJoints(t *testing.T, dir string) []jointRow {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "joints.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Scan()
	if h := sc.Text(); h != "time,joint,fx,fy,fz,tx,ty,tz,position,speed,effort" {
		t.Fatalf("joints.csv header %q", h)
	}
	var rows []jointRow
	for sc.Scan() {
		fields := strings.Split(sc.Text(), ",")
		if len(fields) != 11 {
			t.Fatalf("joints.csv row has %d fields: %q", len(fields), sc.Text())
		}
		r := jointRow{t: parseFloat(t, fields[0]), joint: fields[1]}
		for i := range r.v {
			r.v[i] = math.NaN()
			if fields[2+i] != "" {
				r.v[i] = parseFloat(t, fields[2+i])
			}
		}
		rows = append(rows, r)
	}
	return rows
}

// rowsOf returns the trajectory rows of one body.
func rowsOf(rows []row, body string) []row {
	var out []row
	for _, r := range rows {
		if r.body == body {
			out = append(out, r)
		}
	}
	return out
}

func TestExampleVibratingTrack(t *testing.T) {
	// Five parts on a track rising 3 degrees, vibrating at 50 Hz, 20 degrees
	// to the track, at throw number 1.2. The particle model of the hopping
	// regime (Redford and Boothroyd 1967-68, from memory, as stepped by the
	// engine's TestFeederConveyingSpeed) gives 24.8 mm/s for this track;
	// parts of different shapes side by side knock each other, so each must
	// climb at between half and one and a half times that over 0.1-0.6 s,
	// and none may leave the track (60 mm wide, 600 mm long).
	const model = 24.8
	dir := mustRun(t, "../../testdata/mechanisms/vibrating-track.toml")
	_, rows := readTrajectory(t, dir)
	along := [3]float64{math.Cos(3 * math.Pi / 180), 0, math.Sin(3 * math.Pi / 180)}
	for _, name := range []string{"plate", "disc", "block", "pin", "cube"} {
		rs := rowsOf(rows, name)
		var x0, x1 float64
		for _, r := range rs {
			x := r.v[0]*along[0] + r.v[2]*along[2]
			if math.Abs(r.t-0.1) < 1e-9 {
				x0 = x
			}
			if math.Abs(r.t-0.6) < 1e-9 {
				x1 = x
			}
			if math.Abs(r.v[1]) > 30 || math.Abs(x) > 300 {
				t.Fatalf("%s left the track at t = %g s: %v", name, r.t, r.v[:3])
			}
		}
		v := (x1 - x0) / 0.5
		if v < 0.5*model || v > 1.5*model {
			t.Errorf("%s climbs at %.1f mm/s, model %.1f mm/s", name, v, model)
		}
		t.Logf("%s climbs at %.1f mm/s (model %.1f)", name, v, model)
	}
}

// tiltScene writes the carton tilt example with other friction values.
func tiltScene(t *testing.T, friction, static string) string {
	t.Helper()
	b, err := os.ReadFile("../../testdata/mechanisms/carton-tilt.toml")
	if err != nil {
		t.Fatal(err)
	}
	s := strings.Replace(string(b), "friction = 0.5\nstatic_friction = 0.6", "friction = "+friction+"\nstatic_friction = "+static, 1)
	if s == string(b) {
		t.Fatal("carton-tilt.toml no longer has the friction lines this test replaces")
	}
	p := filepath.Join(t.TempDir(), "tilt.toml")
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func TestExampleCartonTilt(t *testing.T) {
	// A carton 250 mm deep (in the tilt direction) and 500 mm tall on a
	// table tilting at 2 deg/s from 0.2 s about its lower edge at x = 400
	// mm. Rigid block on an incline (statics): it tips at
	// atan(b/h) = 26.57 degrees if mu_s > b/h, else slides at atan(mu_s).
	// Within 0.5 degrees (the tilt-table requirement).
	const rate, start, tol = 2.0, 0.2, 0.5
	for _, c := range []struct {
		name, friction, static string
		tips                   bool
		want                   float64
	}{
		{"the example (mu_s 0.6): tips", "", "", true, math.Atan(0.5) * 180 / math.Pi},
		{"mu_s 0.45: slides", "0.4", "0.45", false, math.Atan(0.45) * 180 / math.Pi},
	} {
		path := "../../testdata/mechanisms/carton-tilt.toml"
		if c.friction != "" {
			path = tiltScene(t, c.friction, c.static)
		}
		dir := mustRun(t, path)
		_, rows := readTrajectory(t, dir)
		rs := rowsOf(rows, "carton")
		tipAt, slideAt := math.NaN(), math.NaN()
		var rel0 [2]float64
		for i, r := range rs {
			table := math.Max(0, math.Min(35, rate*(r.t-start))) * math.Pi / 180
			// The carton turns about y; its angle beyond the table's is tipping.
			turn := 2 * math.Atan2(r.v[5], r.v[3])
			// Its centre in the table's frame (the table turns about y
			// through the hinge at x = 400 mm, z = 0).
			dx, dz := r.v[0]-400, r.v[2]
			rel := [2]float64{dx*math.Cos(table) - dz*math.Sin(table), dx*math.Sin(table) + dz*math.Cos(table)}
			if i == 0 {
				rel0 = rel
			}
			deg := table * 180 / math.Pi
			// Clearly tipping: turned 1e-3 rad past the table; clearly
			// sliding: moved 0.5 mm along it without turning.
			if math.IsNaN(tipAt) && turn-table > 1e-3 {
				tipAt = deg
			}
			if math.IsNaN(slideAt) && math.Abs(rel[0]-rel0[0]) > 0.5 && turn-table < 1e-4 {
				slideAt = deg
			}
		}
		got, other := tipAt, slideAt
		if !c.tips {
			got, other = slideAt, tipAt
		}
		if math.Abs(got-c.want) > tol {
			t.Errorf("%s: at %.2f degrees, want %.2f (tipped at %.2f, slid at %.2f)", c.name, got, c.want, tipAt, slideAt)
		}
		if !(math.IsNaN(other) || other > got) {
			t.Errorf("%s: the other motion came first, at %.2f degrees", c.name, other)
		}
		t.Logf("%s: at %.2f degrees (want %.2f)", c.name, got, c.want)
	}
}

func TestExampleCamFollower(t *testing.T) {
	// A circular cam of radius R = 30 mm turned at 60 rpm about a shaft
	// e = 10 mm from its centre lifts a flat-faced follower (10 mm to its
	// centre) in a vertical guide. Flat-faced follower on an eccentric
	// circle (cam kinematics, e.g. Norton, Design of Machinery, chapter 8):
	// its face is at R + e sin(-theta) above the shaft for the cam turned
	// by theta about +y. Within 0.3 mm: the contact sits up to the slop
	// (0.2 mm) inside the cam and that depth changes with the load.
	const R, e, tol = 30.0, 10.0, 0.3
	dir := mustRun(t, "../../testdata/mechanisms/cam-follower.toml")
	_, traj := readTrajectory(t, dir)
	follower := rowsOf(traj, "follower")
	var theta []float64
	for _, j := range readJoints(t, dir) {
		if j.joint == "camshaft" {
			theta = append(theta, j.v[6]*math.Pi/180)
			if s := j.v[7]; j.t > 0 && math.Abs(s+2*math.Pi) > 1e-6 {
				t.Errorf("camshaft runs at %.6g rad/s at t = %g s, want -2 pi", s, j.t)
			}
		}
	}
	if len(theta) != len(follower) || len(theta) < 200 {
		t.Fatalf("%d camshaft rows and %d follower rows", len(theta), len(follower))
	}
	worst, lo, hi := 0.0, math.Inf(1), math.Inf(-1)
	for i, r := range follower {
		if r.t < 0.05 {
			continue // settling onto the cam
		}
		got := r.v[2] - 10
		worst = math.Max(worst, math.Abs(got-(R+e*math.Sin(-theta[i]))))
		lo, hi = math.Min(lo, got), math.Max(hi, got)
	}
	if worst > tol {
		t.Errorf("follower off the cam's lift by up to %.3g mm", worst)
	}
	if stroke := hi - lo; math.Abs(stroke-2*e) > tol {
		t.Errorf("stroke %.4g mm, want 2e = %g", stroke, 2*e)
	}
	t.Logf("follower within %.3g mm of the lift; stroke %.4g mm", worst, hi-lo)
	// summary.json: both joints, the shaft's final speed -2 pi rad/s and
	// the guide's travel the follower's rise from its start at 40 mm.
	s := readSummary(t, dir)
	if len(s.Joints) != 2 || s.Joints[0].Name != "camshaft" || s.Joints[0].Kind != "revolute" || s.Joints[1].Kind != "prismatic" {
		t.Fatalf("summary joints %+v", s.Joints)
	}
	if sp := s.Joints[0].Speed; sp == nil || math.Abs(*sp+2*math.Pi) > 1e-6 {
		t.Errorf("camshaft speed %v, want -2 pi", sp)
	}
	last := follower[len(follower)-1]
	if p := s.Joints[1].Position; p == nil || math.Abs(*p-(last.v[2]-40)) > 1e-6 {
		t.Errorf("guide travel %v, want %g", p, last.v[2]-40)
	}
	if s.Joints[1].MaxForce <= 0 {
		t.Error("the guide carried no force")
	}
}

func TestExampleFlapKicker(t *testing.T) {
	// The flap swings across the belt (50 mm either side of y = 0) at 1.4 s
	// and back at 1.8 s: the first carton ends off the belt's +y side (on
	// the floor below it), the second rides on past the flap's pin at
	// x = 100 mm, still on the belt.
	dir := mustRun(t, "../../testdata/mechanisms/flap-kicker.toml")
	s := readSummary(t, dir)
	pos := map[string][3]float64{}
	for _, b := range s.Bodies {
		pos[b.Name] = b.Position
	}
	if p := pos["first"]; p[1] < 65 || p[2] > 0 {
		t.Errorf("first carton not knocked off the belt: ends at %v", p)
	}
	if p := pos["second"]; math.Abs(p[1]) > 35 || p[0] < 150 || p[2] < 14 {
		t.Errorf("second carton should ride on past the flap: ends at %v", p)
	}
	// The servo's program: the flap near -70 degrees between the swings
	// (it has 0.4 s to get there), back at 0 at the end.
	var at17, end float64
	for _, j := range readJoints(t, dir) {
		if math.Abs(j.t-1.7) < 1e-9 {
			at17 = j.v[6]
		}
		end = j.v[6]
	}
	if at17 > -50 || at17 < -80 {
		t.Errorf("flap at %.1f degrees at 1.7 s, want near -70", at17)
	}
	if math.Abs(end) > 2 {
		t.Errorf("flap at %.1f degrees at the end, want 0", end)
	}
}

func TestExamplePendulum(t *testing.T) {
	// A ball of radius r = 10 mm on a hinge L = 1 m above its centre, let
	// go at theta0 = 60 degrees. Large-amplitude pendulum (e.g. Goldstein,
	// Classical Mechanics, or any text on elliptic integrals): T = 4
	// sqrt(I / (m g L)) K(k^2), k = sin(theta0 / 2), with the complete
	// elliptic integral of the first kind from gonum's mathext.CompleteK and
	// I = m L^2 + 2/5 m r^2 for the ball about the pivot. Within 0.5 percent
	// (the requirement); the period is timed between crossings of the
	// bottom, interpolated in 1 ms samples.
	const L, r, theta0 = 1.0, 0.01, 60.0
	dir := mustRun(t, "../../testdata/mechanisms/pendulum.toml", "--sample", "0.001")
	var ts, angles []float64
	for _, j := range readJoints(t, dir) {
		ts = append(ts, j.t)
		angles = append(angles, j.v[6])
	}
	// The joint's angle counts from the release: the bottom is at -60 or +60.
	bottom := -theta0
	if angles[len(angles)/8] > 0 {
		bottom = theta0
	}
	var cross []float64
	for i := 1; i < len(angles); i++ {
		a, b := angles[i-1]-bottom, angles[i]-bottom
		if a < 0 && b >= 0 || a > 0 && b <= 0 {
			cross = append(cross, ts[i-1]+(ts[i]-ts[i-1])*a/(a-b))
		}
	}
	if len(cross) < 3 {
		t.Fatalf("only %d crossings of the bottom", len(cross))
	}
	period := cross[2] - cross[0]
	k := math.Sin(theta0 / 2 * math.Pi / 180)
	want := 4 * math.Sqrt((L*L+0.4*r*r)/(g*L)) * mathext.CompleteK(k*k)
	if e := relErr(period, want); e > 0.005 {
		t.Errorf("period %.5f s, want %.5f s (error %.3g)", period, want, e)
	}
	t.Logf("period %.5f s, want %.5f s (error %.2g)", period, want, relErr(period, want))
}

func TestExamplePusher(t *testing.T) {
	// A driven plate follows pusher-path.csv: still for 0.5 s, 120 mm along
	// +x in 1 s, still again. The carton 30 mm ahead is pushed for the last
	// 90 mm at v = 120 mm/s and then coasts v^2 / (2 mu_k g) against
	// Coulomb friction mu_k 0.4 (any dynamics text). Within 0.3 mm: the
	// contact slop (0.2 mm) plus the step in which the pusher stops.
	const mu, v, tol = 0.4, 0.12, 0.3
	dir := mustRun(t, "../../testdata/mechanisms/pusher.toml")
	s := readSummary(t, dir)
	if len(s.Bodies) != 1 || s.Bodies[0].Name != "carton" || !s.Settled {
		t.Fatalf("summary %+v", s)
	}
	want := 80 + 90 + v*v/(2*mu*g)*1e3
	if got := s.Bodies[0].Position[0]; math.Abs(got-want) > tol {
		t.Errorf("carton ends at x = %.3f mm, want %.3f", got, want)
	}
	// It settles only once the path has ended (at 2.5 s) and it has rested.
	if *s.SettledAt < 2.5 {
		t.Errorf("settled at %g s, before the pusher's path ended", *s.SettledAt)
	}
}
