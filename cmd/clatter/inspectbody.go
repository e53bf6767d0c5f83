package main

import (
	"fmt"
	"io"
	"math"
	"sort"
	"text/tabwriter"

	"clatter/engine/pack"
	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// bodyInspection is what `inspect SCENE.toml --body NAME` reports.
type bodyInspection struct {
	Units struct {
		Length string `json:"length"`
		Mass   string `json:"mass"`
	} `json:"units"`
	Scene            string        `json:"scene"`
	Body             string        `json:"body"`
	Shape            string        `json:"shape"`
	Pieces           int           `json:"pieces"`
	Mass             float64       `json:"mass"`
	Volume           float64       `json:"volume"`
	CenterOfMass     [3]float64    `json:"center_of_mass"`
	Inertia          [3][3]float64 `json:"inertia"`
	PrincipalMoments [3]float64    `json:"principal_moments"`
	PrincipalAxes    [3][3]float64 `json:"principal_axes"`
	// Bounds is the box of bounds in the shape's axes, on which the
	// package faces are numbered.
	Bounds       [2][3]float64 `json:"bounds"`
	PackageFaces []packageFace `json:"package_faces"`
	Faces        []inspectFace `json:"faces"`
	// RestingNote says why Faces is empty, if it is.
	RestingNote string `json:"resting_note,omitempty"`
}

// packageFace is a face of the box of bounds in drop-test numbering.
type packageFace struct {
	Face   int        `json:"face"`
	Name   string     `json:"name"`
	Normal [3]float64 `json:"normal"`
	Area   float64    `json:"area"`
}

var packageFaceNames = [7]string{"", "top", "right side", "bottom", "left side", "near end", "far end"}

// inspectBody prints the mass properties, package faces and resting faces
// of a body of a scene.
func inspectBody(e *env, file, name string, asJSON bool) int {
	s, err := scene.Load(file)
	if err != nil {
		fmt.Fprintln(e.stderr, err)
		return exitBad
	}
	i := s.BodyIndex(name)
	if i < 0 {
		var names []string
		for _, b := range s.Bodies {
			names = append(names, b.Name)
		}
		e.errorf("inspect: %s has no body %q%s", file, name, suggest(name, names))
		return exitBad
	}
	b := &s.Bodies[i]
	if b.Static {
		e.errorf("inspect: body %q is %s: it has no mass properties; inspect a moving body", name, map[bool]string{true: "driven", false: "static"}[b.Driven])
		return exitBad
	}
	out, err := inspectSceneBody(s, b, file)
	if err != nil {
		e.errorf("inspect: body %q: %v", name, err)
		return exitBad
	}
	if asJSON {
		return printInspectJSON(e, out)
	}
	writeBodyInspection(e.stdout, out)
	return exitOK
}

func inspectSceneBody(s *scene.Scene, b *scene.Body, file string) (*bodyInspection, error) {
	u := s.Units
	p := b.Props
	moments, axes, err := shapes.Principal(p.Inertia)
	if err != nil {
		return nil, err
	}
	out := &bodyInspection{Scene: file, Body: b.Name, Shape: b.Kind, Mass: report.Tidy(u.FromSI(p.Mass, scene.Mass))}
	out.Units.Length, out.Units.Mass = u.Length, u.Mass
	if c, ok := b.Shape.(*shapes.Compound); ok {
		out.Pieces = len(c.Pieces)
	}
	inertia := func(x float64) float64 { return report.Tidy(u.FromSI(x, scene.MomentOfInertia)) }
	out.Volume = report.Tidy(u.FromSI(p.Volume, scene.Dim{L: 3}))
	out.CenterOfMass = tidy3(u.VecFromSI(p.Center, scene.Length))
	for r := 0; r < 3; r++ {
		for c := 0; c < 3; c++ {
			out.Inertia[r][c] = inertia(p.Inertia.At(r, c))
			out.PrincipalAxes[c][r] = report.Tidy(axes.At(r, c))
		}
		out.PrincipalMoments[r] = inertia(moments[r])
	}
	cleanMatrix(&out.Inertia)
	cleanMatrix(&out.PrincipalAxes)
	bounds := b.Shape.Bounds()
	out.Bounds = [2][3]float64{tidy3(u.VecFromSI(bounds.Min, scene.Length)), tidy3(u.VecFromSI(bounds.Max, scene.Length))}
	size := bounds.Size()
	for f := pack.Face(1); f <= 6; f++ {
		n := f.Normal()
		area := 1.0
		for a := 0; a < 3; a++ {
			if n[a] == 0 {
				area *= size[a]
			}
		}
		out.PackageFaces = append(out.PackageFaces, packageFace{Face: int(f), Name: packageFaceNames[f], Normal: [3]float64(n),
			Area: report.Tidy(u.FromSI(area, scene.Dim{L: 2}))})
	}
	faces, err := resting.OfShape(b.Shape, p.Center)
	if err != nil {
		out.RestingNote = err.Error()
	}
	L := u.L
	for _, f := range faces {
		out.Faces = append(out.Faces, inspectFace{
			Normal:      tidy3(f.Normal),
			Area:        report.Tidy(f.Area / (L * L)),
			Stable:      f.Stable,
			TipAngle:    report.Tidy(f.TipAngleRad * 180 / math.Pi),
			Probability: report.Tidy(f.Probability),
			RollsTo:     f.RollsTo,
			Height:      report.Tidy(f.Height / L),
			PackageFace: packageNumber(f),
		})
	}
	return out, nil
}

// packageNumber returns the package face a hull face lies on: a hull face
// whose normal is a package face's lies in its plane of the box of
// bounds, the hull's extreme in that direction.
func packageNumber(f resting.Face) *int {
	for k := pack.Face(1); k <= 6; k++ {
		if f.Normal.Dot(k.Normal()) >= 1-1e-9 {
			n := int(k)
			return &n
		}
	}
	return nil
}

func tidy3(v [3]float64) [3]float64 {
	return [3]float64{report.Tidy(v[0]), report.Tidy(v[1]), report.Tidy(v[2])}
}

func writeBodyInspection(w io.Writer, p *bodyInspection) {
	L, M := p.Units.Length, p.Units.Mass
	shape := p.Shape
	if p.Pieces > 0 {
		shape = fmt.Sprintf("%d pieces", p.Pieces)
	}
	fmt.Fprintf(w, "body              %s of %s (%s; lengths in %s, masses in %s)\n", p.Body, p.Scene, shape, L, M)
	fmt.Fprintf(w, "mass              %.6g %s (volume %.6g %s3)\n", p.Mass, M, p.Volume, L)
	fmt.Fprintf(w, "centre of mass    %s %s (shape axes, from the shape's origin)\n", fmtVec(p.CenterOfMass[:]), L)
	fmt.Fprintf(w, "inertia about the centre of mass, shape axes (%s %s2):\n", M, L)
	for r := 0; r < 3; r++ {
		fmt.Fprintf(w, "                  %12.6g %12.6g %12.6g\n", p.Inertia[r][0], p.Inertia[r][1], p.Inertia[r][2])
	}
	fmt.Fprintf(w, "principal moments %s %s %s2\n", fmtVec(p.PrincipalMoments[:]), M, L)
	for i, a := range p.PrincipalAxes {
		fmt.Fprintf(w, "principal axis %d  (%s)\n", i+1, fmtVec(a[:]))
	}
	fmt.Fprintf(w, "box of bounds     %s to %s %s\n", fmtVec(p.Bounds[0][:]), fmtVec(p.Bounds[1][:]), L)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "package faces (drop-test numbering, ASTM D5276 and ISTA; on the box of bounds)")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "face\tname\tnormal (shape axes)\tarea (%s2)\n", L)
	for _, f := range p.PackageFaces {
		fmt.Fprintf(tw, "%d\t%s\t(%s)\t%.5g\n", f.Face, f.Name, fmtNormal(f.Normal), f.Area)
	}
	tw.Flush()
	fmt.Fprintln(w)
	if len(p.Faces) == 0 {
		fmt.Fprintf(w, "resting faces: none listed (%s)\n", p.RestingNote)
	} else {
		order := make([]int, len(p.Faces))
		for i := range order {
			order[i] = i
		}
		sort.SliceStable(order, func(a, b int) bool { return p.Faces[order[a]].Probability > p.Faces[order[b]].Probability })
		fmt.Fprintln(w, "resting faces of the hull, most likely first (quasi-static: dropped in a random orientation, no bounce)")
		tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintf(tw, "face\tpackage face\tnormal (shape axes)\tarea (%s2)\tcentre of mass height (%s)\ttip angle (deg)\tprobability\t\n", L, L)
		for _, i := range order {
			f := p.Faces[i]
			pf := "-"
			if f.PackageFace != nil {
				pf = fmt.Sprint(*f.PackageFace)
			}
			if f.Stable {
				fmt.Fprintf(tw, "%d\t%s\t(%s)\t%.5g\t%.5g\t%.2f\t%.4f\t\n", i, pf, fmtNormal(f.Normal), f.Area, f.Height, f.TipAngle, f.Probability)
			}
		}
		tw.Flush()
		if p.Pieces > 0 {
			fmt.Fprintln(w, "a part of pieces can also rest on faces of its pieces that its hull hides (in a groove, across a gap); clatter run finds them")
		}
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, safetyNote)
}
