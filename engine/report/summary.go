package report

import (
	"bytes"
	"encoding/json"
	"math"
	"regexp"
	"strconv"

	"clatter/engine/scene"
)

// Summary is the content of summary.json. Lengths and masses are in the
// scene's units (derived quantities in the same system), time in s,
// angular velocity in rad/s, energy in J.
type Summary struct {
	Units     Units    `json:"units"`
	Time      float64  `json:"time"`
	Steps     int      `json:"steps"`
	Settled   bool     `json:"settled"`
	SettledAt *float64 `json:"settled_at"`
	Bodies    []Body   `json:"bodies"`
	Energy    Energy   `json:"energy"`
	Momentum  Momentum `json:"momentum"`
	// Joints are the scene's joints at the end, in file order (left out
	// when there are none).
	Joints []Joint `json:"joints,omitempty"`
	// Drop reports a [drop] (left out without one).
	Drop *Drop `json:"drop,omitempty"`
	// Gates are the counting gates in file order, Drives the vibration
	// drives (left out when there are none).
	Gates  []Gate  `json:"gates,omitempty"`
	Drives []Drive `json:"drives,omitempty"`
	// Error says why the run stopped early; empty for a completed run.
	Error string `json:"error,omitempty"`
}

// Units records the units of every number in the outputs.
type Units struct {
	Length          string `json:"length"`
	Mass            string `json:"mass"`
	Time            string `json:"time"`
	Angle           string `json:"angle"`
	AngularVelocity string `json:"angular_velocity"`
	Energy          string `json:"energy"`
}

// UnitsOf returns the output units of a scene.
func UnitsOf(u scene.Units) Units {
	return Units{Length: u.Length, Mass: u.Mass, Time: "s", Angle: "deg", AngularVelocity: "rad/s", Energy: "J"}
}

// Body is the final state of one moving body.
type Body struct {
	Name string `json:"name"`
	// Position of the centre of mass; Orientation [w, x, y, z] of the
	// shape's own axes; Velocity of the centre of mass; Spin in the world
	// frame, rad/s.
	Position    [3]float64 `json:"position"`
	Orientation [4]float64 `json:"orientation"`
	Velocity    [3]float64 `json:"velocity"`
	Spin        [3]float64 `json:"spin"`
	// RestingFace indexes the faces `clatter inspect` lists for the shape
	// (for a box: +x, -x, +y, -y, +z, -z), or is null when the body is not
	// resting on a face (moving, leaning, or a ball).
	RestingFace *int `json:"resting_face"`
	// FaceDown is the face whose outward normal is closest to the
	// direction of gravity at the end, resting or not (same numbering);
	// null for a ball.
	FaceDown *int `json:"face_down"`
	// Balanced is "edge" or "corner" for a body that came to rest balanced
	// with its centre of mass above an edge or a corner of its shape (any
	// disturbance tips it; RestingFace is then null), null otherwise.
	Balanced *string `json:"balanced"`
	// MaxImpactSpeed is the largest normal approach speed of its impacts.
	MaxImpactSpeed float64 `json:"max_impact_speed"`
	// PeakAcceleration is the largest net compliant contact force on the
	// body over its weight, in units of standard gravity (what an
	// accelerometer on it reads), found at every sub-step; null for a body
	// that met only rigid contacts.
	PeakAcceleration *float64 `json:"peak_acceleration"`
	// TippedAt and SlidAt are when the body first turned 2 degrees, or
	// moved 1 mm, relative to the body it stood on at the start, with that
	// support's tilt then (deg); null if it did not, or stood on nothing.
	TippedAt *TiltMark `json:"tipped_at"`
	SlidAt   *TiltMark `json:"slid_at"`
}

// Joint is the state of one joint at the end of a run and the largest
// reaction it carried at the end of any step.
type Joint struct {
	Name string `json:"name"`
	// Kind is the joint's kind as scene files name it now
	// (scene.JointKindNamed reads the names of the previous release too).
	Kind string `json:"kind"`
	// Position is a revolute joint's angle (deg), a prismatic joint's
	// travel or a link's length; Speed its rate (rad/s or length/s); null
	// for a spherical or fixed joint.
	Position *float64 `json:"position"`
	Speed    *float64 `json:"speed"`
	// MaxForce and MaxTorque are the largest magnitudes of the force and
	// torque the joint applied to its first body.
	MaxForce  float64 `json:"max_force"`
	MaxTorque float64 `json:"max_torque"`
}

// Energy is kinetic plus potential energy (relative to the world origin)
// of the moving bodies, J.
type Energy struct {
	Initial float64 `json:"initial"`
	Final   float64 `json:"final"`
}

// Momentum is the total linear momentum of the moving bodies and their
// angular momentum about the world origin.
type Momentum struct {
	Linear  VecPair `json:"linear"`
	Angular VecPair `json:"angular"`
}

// VecPair is a vector at the start and at the end of a run.
type VecPair struct {
	Initial [3]float64 `json:"initial"`
	Final   [3]float64 `json:"final"`
}

// JSON returns the summary as indented JSON with a final newline.
func (s *Summary) JSON() []byte {
	b, err := MarshalIndent(s)
	if err != nil {
		// Every number is made finite by clean before it is stored, so
		// marshalling cannot fail; keep a valid document regardless.
		return []byte("{\"error\": " + strconv.Quote(err.Error()) + "}\n")
	}
	return b
}

// numberArray matches an indented JSON array of numbers (or nulls).
var numberArray = regexp.MustCompile(`\[\s*(?:-?[0-9][0-9.eE+-]*|null)(?:,\s*(?:-?[0-9][0-9.eE+-]*|null))*\s*\]`)

var space = regexp.MustCompile(`\s+`)

// MarshalIndent writes v as JSON indented by two spaces, each array of
// numbers kept on one line, with a final newline: easy to read and to diff.
func MarshalIndent(v any) ([]byte, error) {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return nil, err
	}
	b = numberArray.ReplaceAllFunc(b, func(m []byte) []byte {
		m = space.ReplaceAll(m, nil)
		return bytes.ReplaceAll(m, []byte(","), []byte(", "))
	})
	return append(b, '\n'), nil
}

// sigDigits is the precision of the numbers written: twelve significant
// digits keep far more than any simulation resolves while dropping the
// last-bit noise of binary fractions (0.30000000000000004).
const sigDigits = 12

// clean rounds x to sigDigits and maps values that JSON cannot hold to 0
// (they occur only in the state of a diverged run, which is never
// written: its last good state is).
func clean(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	if x == 0 {
		return 0
	}
	v, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', sigDigits, 64), 64)
	if err != nil {
		return x
	}
	return v
}

// Tidy rounds x to twelve significant digits, as every number the result
// files hold, and maps NaN and infinities to 0.
func Tidy(x float64) float64 { return clean(x) }

func clean3(v [3]float64) [3]float64 { return [3]float64{clean(v[0]), clean(v[1]), clean(v[2])} }
