package main

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes/mesh"
	"clatter/shapes/resting"
)

var cmdInspect = &command{
	name:    "inspect",
	summary: "mass properties and resting faces of an STL part",
	usage:   "clatter inspect PART.stl [--units mm] [--density VALUE] [--json] [--quiet]\n       clatter inspect SCENE.toml --body NAME [--json]",
	help: `
Reads an STL part (binary or ASCII), welds it, and prints its mass
properties (volume, mass, centre of mass, inertia about the centre of mass
in the part's axes, principal moments and axes) and the faces of its convex
hull it can come to rest on: for each face whether the part can stand on it,
how far the support may tilt before it tips over, and the quasi-static
probability of landing on it (the part dropped in a uniformly random
orientation, without bouncing; Wiegley, Rao and Goldberg 1992).

The faces are numbered in the hull's order (for a box: +x, -x, +y, -y, +z,
-z); summary.json of clatter run reports resting faces by the same numbers.
In --json, inertia is a 3 x 3 matrix by rows and principal_axes lists the
three axes (unit vectors in the part's axes, ascending moments) as rows. The table lists them most
likely first; --json prints them all in order.

Lengths are in the --units of the file, masses in kg, inertia in kg
times the length unit squared, tip angles in degrees. A mesh that is not
closed gets the mass properties of its convex hull, with a warning.

With --body NAME, inspect reads a scene file instead and prints that
moving body's mass properties as the simulation uses them (its
center_of_mass and inertia if the scene gives them; a shape of pieces
combined by the parallel-axis theorem), in the scene's units; its
package faces, numbered as the drop-test standards number a package's
faces (1 top +z, 2 right side -y, 3 bottom -z, 4 left side +y, 5 near
end -x, 6 far end +x, on its box of bounds); and the resting faces of
its hull.

Options:
  --units UNIT     length unit of the file's numbers: mm (default), cm, m, in
  --density VALUE  a number in kg/m3, or a value with its unit such as
                   "1.05 g/cm3" (default 1000 kg/m3)
  --body NAME      inspect this body of a scene file
  --json           print the result as JSON
  --quiet, -q      no informational messages`,
}

// defaultDensity is water's, a neutral guess for a part of unknown material.
const defaultDensity = 1000.0

type inspectFace struct {
	Normal      [3]float64 `json:"normal"`
	Area        float64    `json:"area"`
	Stable      bool       `json:"stable"`
	TipAngle    float64    `json:"tip_angle"`
	Probability float64    `json:"probability"`
	RollsTo     int        `json:"rolls_to"`
	Height      float64    `json:"height"`
	// PackageFace is the drop-test number of the face of the box of
	// bounds this face lies on (inspect --body only).
	PackageFace *int `json:"package_face,omitempty"`
}

type inspectJSON struct {
	Units struct {
		Length string `json:"length"`
		Mass   string `json:"mass"`
	} `json:"units"`
	File             string        `json:"file"`
	Triangles        int           `json:"triangles"`
	Closed           bool          `json:"closed"`
	Solid            bool          `json:"solid"`
	Density          float64       `json:"density"`
	Volume           float64       `json:"volume"`
	Mass             float64       `json:"mass"`
	CenterOfMass     [3]float64    `json:"center_of_mass"`
	Inertia          [3][3]float64 `json:"inertia"`
	PrincipalMoments [3]float64    `json:"principal_moments"`
	PrincipalAxes    [3][3]float64 `json:"principal_axes"`
	Hull             struct {
		Vertices [][3]float64 `json:"vertices"`
		Faces    [][]int32    `json:"faces"`
	} `json:"hull"`
	Faces    []inspectFace `json:"faces"`
	Warnings []string      `json:"warnings"`
}

func inspectPart(e *env, args []string) int {
	fs := newFlags(e, cmdInspect)
	unitName := fs.String("units", "mm", "")
	densityText := fs.String("density", "", "")
	asJSON := fs.Bool("json", false, "")
	bodyName := fs.String("body", "", "")
	pos, code := parse(e, cmdInspect, fs, args)
	if code >= 0 {
		return code
	}
	if *bodyName != "" && len(pos) == 1 {
		return inspectBody(e, pos[0], *bodyName, *asJSON)
	}
	if len(pos) == 1 && strings.HasSuffix(strings.ToLower(pos[0]), ".toml") {
		e.errorf("inspect: %s is a scene file: name one of its bodies, e.g. clatter inspect %s --body NAME", pos[0], pos[0])
		return exitBad
	}
	if len(pos) != 1 {
		e.errorf("inspect: give one STL file, e.g. clatter inspect testdata/parts/bracket.stl --units mm (got %d arguments)", len(pos))
		return exitBad
	}
	unit, ok := scene.LengthUnits[*unitName]
	if !ok {
		e.errorf("inspect: --units: unknown length unit %q%s", *unitName, suggest(*unitName, []string{"mm", "cm", "m", "in"}))
		return exitBad
	}
	density := defaultDensity
	if *densityText != "" {
		v, d, err := scene.ParseQuantity(*densityText)
		switch {
		case err != nil:
			e.errorf("inspect: --density: %v", err)
			return exitBad
		case d != scene.Dimensionless && d != scene.Density:
			e.errorf("inspect: --density: %q is %s, not a density (e.g. \"1.05 g/cm3\" or 1050 for kg/m3)", *densityText, d)
			return exitBad
		case !(v > 0):
			e.errorf("inspect: --density must be positive, got %q", *densityText)
			return exitBad
		}
		density = v
	}
	part, err := loadPart(pos[0], mesh.Unit(unit))
	if err != nil {
		e.errorf("inspect: %v", err)
		return exitBad
	}
	e.warn(part.Warnings)
	u, _ := scene.NewUnits(*unitName, "kg")
	out, faces, err := inspection(part, density, u, pos[0])
	if err != nil {
		e.errorf("inspect: %s: %v", pos[0], err)
		return exitBad
	}
	if *asJSON {
		return printInspectJSON(e, out)
	}
	writeInspectTable(e.stdout, out, faces, density, *densityText == "")
	return exitOK
}

// inspection computes everything inspect reports, in the output units.
func inspection(part *mesh.Part, density float64, u scene.Units, file string) (*inspectJSON, []resting.Face, error) {
	mp := part.Mass(density)
	moments, axes, err := part.Principal(density)
	if err != nil {
		return nil, nil, err
	}
	faces, err := resting.OfHull(part.Hull, mp.Center)
	if err != nil {
		return nil, nil, fmt.Errorf("no resting analysis: %v", err)
	}
	L := u.L
	out := &inspectJSON{File: file, Triangles: len(part.Mesh.Triangles), Closed: part.Topology.Closed(), Solid: part.Solid}
	out.Units.Length, out.Units.Mass = u.Length, u.Mass
	out.Density = density * L * L * L
	out.Volume = mp.Volume / (L * L * L)
	out.Mass = mp.Mass
	out.CenterOfMass = u.VecFromSI(mp.Center, scene.Length)
	for r := 0; r < 3; r++ {
		for c := 0; c < 3; c++ {
			out.Inertia[r][c] = mp.Inertia.At(r, c) / (L * L)
			out.PrincipalAxes[c][r] = axes.At(r, c) // axis c is column c
		}
		out.PrincipalMoments[r] = moments[r] / (L * L)
	}
	cleanMatrix(&out.Inertia)
	cleanMatrix(&out.PrincipalAxes)
	for _, v := range part.Hull.Vertices {
		out.Hull.Vertices = append(out.Hull.Vertices, u.VecFromSI(v, scene.Length))
	}
	for _, f := range part.Hull.Faces {
		out.Hull.Faces = append(out.Hull.Faces, f.Verts)
	}
	for _, f := range faces {
		out.Faces = append(out.Faces, inspectFace{
			Normal:      [3]float64(f.Normal),
			Area:        f.Area / (L * L),
			Stable:      f.Stable,
			TipAngle:    f.TipAngleRad * 180 / math.Pi,
			Probability: f.Probability,
			RollsTo:     f.RollsTo,
			Height:      f.Height / L,
		})
	}
	out.Warnings = append([]string{}, part.Warnings...)
	out.tidy()
	return out, faces, nil
}

// tidy rounds every number to the precision of the result files.
func (p *inspectJSON) tidy() {
	t := report.Tidy
	t3 := func(v *[3]float64) {
		for i := range v {
			v[i] = t(v[i])
		}
	}
	p.Density, p.Volume, p.Mass = t(p.Density), t(p.Volume), t(p.Mass)
	t3(&p.CenterOfMass)
	t3(&p.PrincipalMoments)
	for i := range 3 {
		t3(&p.Inertia[i])
		t3(&p.PrincipalAxes[i])
	}
	for i := range p.Hull.Vertices {
		t3(&p.Hull.Vertices[i])
	}
	for i := range p.Faces {
		f := &p.Faces[i]
		t3(&f.Normal)
		f.Area, f.TipAngle, f.Probability, f.Height = t(f.Area), t(f.TipAngle), t(f.Probability), t(f.Height)
	}
}

// roundingFloor is the fraction of a matrix's largest entry below which an
// entry is rounding noise of the integrals (a few ulps), written as 0.
const roundingFloor = 1e-12

func cleanMatrix(m *[3][3]float64) {
	big := 0.0
	for _, row := range m {
		for _, x := range row {
			big = math.Max(big, math.Abs(x))
		}
	}
	for r := range m {
		for c := range m[r] {
			if math.Abs(m[r][c]) <= roundingFloor*big {
				m[r][c] = 0
			}
		}
	}
}

func writeInspectTable(w io.Writer, p *inspectJSON, faces []resting.Face, density float64, defaulted bool) {
	L := p.Units.Length
	closed := "yes (watertight)"
	if !p.Closed {
		closed = "no"
	}
	massFrom := "the solid the mesh bounds"
	if !p.Solid {
		massFrom = "its convex hull (the mesh bounds no solid)"
	}
	dens := fmt.Sprintf("%.6g kg/m3", density)
	if defaulted {
		dens += " (the default; --density sets it)"
	}
	fmt.Fprintf(w, "part              %s (lengths in %s, masses in kg)\n", p.File, L)
	fmt.Fprintf(w, "mesh              %d triangles; closed: %s; mass properties of %s\n", p.Triangles, closed, massFrom)
	fmt.Fprintf(w, "density           %s\n", dens)
	fmt.Fprintf(w, "volume            %.6g %s3\n", p.Volume, L)
	fmt.Fprintf(w, "mass              %.6g kg\n", p.Mass)
	fmt.Fprintf(w, "centre of mass    %s %s\n", fmtVec(p.CenterOfMass[:]), L)
	fmt.Fprintf(w, "inertia about the centre of mass, part axes (kg %s2):\n", L)
	for r := 0; r < 3; r++ {
		fmt.Fprintf(w, "                  %12.6g %12.6g %12.6g\n", p.Inertia[r][0], p.Inertia[r][1], p.Inertia[r][2])
	}
	fmt.Fprintf(w, "principal moments %s kg %s2\n", fmtVec(p.PrincipalMoments[:]), L)
	for i, a := range p.PrincipalAxes {
		fmt.Fprintf(w, "principal axis %d  (%s)\n", i+1, fmtVec(a[:]))
	}
	fmt.Fprintf(w, "convex hull       %d vertices, %d faces\n", len(p.Hull.Vertices), len(p.Hull.Faces))
	fmt.Fprintln(w)

	order := make([]int, len(faces))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return faces[order[a]].Probability > faces[order[b]].Probability })
	fmt.Fprintln(w, "resting faces, most likely first (quasi-static: dropped in a random orientation, no bounce)")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "face\tnormal (part axes)\tarea (%s2)\tcentre of mass height (%s)\ttip angle (deg)\tprobability\t\n", L, L)
	var unstable []string
	for i, f := range p.Faces {
		if !f.Stable {
			unstable = append(unstable, fmt.Sprintf("%d->%d", i, f.RollsTo))
		}
	}
	for _, i := range order {
		f := p.Faces[i]
		if !f.Stable {
			continue
		}
		fmt.Fprintf(tw, "%d\t(%s)\t%.5g\t%.5g\t%.2f\t%.4f\t\n", i, fmtNormal(f.Normal), f.Area, f.Height, f.TipAngle, f.Probability)
	}
	tw.Flush()
	if len(unstable) > 0 {
		fmt.Fprintf(w, "unstable faces (the part rolls off them onto the face shown): %s\n", strings.Join(unstable, " "))
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, safetyNote)
}

func fmtNormal(n [3]float64) string {
	s := make([]string, 3)
	for i, x := range n {
		if math.Abs(x) < 5e-7 {
			x = 0
		}
		s[i] = fmt.Sprintf("%.3f", x)
	}
	return strings.Join(s, ", ")
}

// printInspectJSON prints an inspection as JSON on stdout, with the caution
// on stderr, and returns the exit code.
func printInspectJSON(e *env, out any) int {
	data, err := report.MarshalIndent(out)
	if err != nil {
		e.errorf("inspect: %v", err)
		return exitFailed
	}
	e.stdout.Write(data)
	if !e.quiet {
		fmt.Fprintln(e.stderr, safetyNote)
	}
	return exitOK
}
