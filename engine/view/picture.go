package view

import (
	"bufio"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"

	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes"
)

// Names of the pictures a run writes.
const (
	StartPicture = "start.png"
	EndPicture   = "end.png"
)

// Picture size, pixels, and the supersampling of each pixel that smooths
// edges (a 2x2 grid averaged).
const (
	pictureWidth  = 800
	pictureHeight = 600
	supersample   = 2
)

// camera is a perspective camera looking at the scene.
type camera struct {
	eye, right, up, fwd shapes.Vec3
	focal               float64 // pixels per unit of tangent
	cx, cy              float64 // the pixel the view's axis passes through
	near                float64 // the smallest depth drawn
	w, h                int
}

// viewCamera frames the whole run: it looks down at 30 degrees, from 35
// degrees round from the -y side (a three-quarter view in which the
// three visible faces of a box all show), far enough back that a sphere
// around every body at every sample fits the picture.
func (r *Recorder) viewCamera(w, h int) camera {
	box := r.extent(false)
	if box.Min[0] > box.Max[0] {
		box = r.extent(true)
	}
	if box.Min[0] > box.Max[0] {
		box = shapes.AABB{Min: shapes.Vec3{-1, -1, -1}, Max: shapes.Vec3{1, 1, 1}}
	}
	centre := box.Center()
	radius := math.Max(box.Size().Len()/2, 1e-3)
	up := r.Up
	// A horizontal reference: world -y, or -x when up is along y.
	side := shapes.Vec3{0, -1, 0}
	if math.Abs(up.Dot(side)) > 0.9 {
		side = shapes.Vec3{-1, 0, 0}
	}
	side = side.Sub(up.Mul(up.Dot(side))).Normalize()
	across := up.Cross(side)
	az, el := 35*math.Pi/180, 30*math.Pi/180
	toEye := side.Mul(math.Cos(az) * math.Cos(el)).Add(across.Mul(-math.Sin(az) * math.Cos(el))).Add(up.Mul(math.Sin(el)))
	// As far back as a 30 degree view needs to see a sphere round the
	// box: a moderate perspective, as of a camera a few metres from a
	// bench.
	const fov = 30 * math.Pi / 180
	dist := radius / math.Sin(fov/2)
	c := camera{eye: centre.Add(toEye.Mul(dist)), w: w, h: h}
	c.fwd = toEye.Mul(-1)
	c.right = c.fwd.Cross(up).Normalize()
	c.up = c.right.Cross(c.fwd)
	c.near = nearClip * dist
	// Zoom and pan so that the corners of the box fill the picture but
	// for a margin: a sphere around the box would leave it small.
	c.focal, c.cx, c.cy = 1, 0, 0
	lo, hi := [2]float64{math.Inf(1), math.Inf(1)}, [2]float64{math.Inf(-1), math.Inf(-1)}
	for k := 0; k < 8; k++ {
		p := box.Min
		for a := 0; a < 3; a++ {
			if k>>a&1 == 1 {
				p[a] = box.Max[a]
			}
		}
		x, y, _ := c.project(p)
		lo[0], lo[1] = math.Min(lo[0], x), math.Min(lo[1], y)
		hi[0], hi[1] = math.Max(hi[0], x), math.Max(hi[1], y)
	}
	c.focal = frameFill * math.Min(float64(w)/math.Max(hi[0]-lo[0], 1e-9), float64(h)/math.Max(hi[1]-lo[1], 1e-9))
	c.cx = float64(w)/2 - c.focal*(lo[0]+hi[0])/2
	c.cy = float64(h)/2 - c.focal*(lo[1]+hi[1])/2
	return c
}

// frameFill is the part of the picture's width or height that the scene's box
// fills: room round it for a margin and the time label.
const frameFill = 0.8

// project maps a world point to pixel coordinates and its depth.
func (c *camera) project(p shapes.Vec3) (x, y, z float64) {
	d := p.Sub(c.eye)
	z = d.Dot(c.fwd)
	x = c.cx + c.focal*d.Dot(c.right)/z
	y = c.cy - c.focal*d.Dot(c.up)/z
	return x, y, z
}

// Picture draws the state at sample k with flat shading. It is a small
// z-buffer rasteriser (the depth buffer of Catmull, "A subdivision
// algorithm for computer display of curved surfaces", 1974; triangles
// scanned by edge functions, Pineda, "A parallel algorithm for polygon
// rasterization", SIGGRAPH 1988): the
// scenes are a few thousand triangles of solid colour, for which this is
// shorter than a 2-D vector library's painter's sort and, unlike it,
// right where bodies touch or a floor runs under them.
func (r *Recorder) Picture(k int) *image.RGBA {
	r.finish()
	w, h := pictureWidth*supersample, pictureHeight*supersample
	cam := r.viewCamera(w, h)
	// The light comes from above, behind the viewer's left shoulder.
	light := cam.up.Mul(0.8).Add(cam.fwd.Mul(-0.45)).Add(cam.right.Mul(-0.4)).Normalize()
	big := image.NewRGBA(image.Rect(0, 0, w, h))
	depth := make([]float32, w*h) // 1/z: larger is nearer; 0 is empty
	for y := 0; y < h; y++ {
		// A pale gradient, darker toward the bottom.
		g := uint8(250 - 30*y/h)
		for x := 0; x < w; x++ {
			big.SetRGBA(x, y, color.RGBA{g, g, uint8(min(255, int(g)+4)), 0xff})
		}
	}
	for i, b := range r.Bodies {
		pose := r.Poses[k][i]
		for _, p := range b.Parts {
			for _, t := range p.Tris {
				wt := Tri{pose.Apply(t[0]), pose.Apply(t[1]), pose.Apply(t[2])}
				n := wt.normal()
				if n == (shapes.Vec3{}) {
					continue
				}
				if n.Dot(cam.eye.Sub(wt[0])) < 0 {
					n = n.Mul(-1) // the back of an open surface
				}
				shade := 0.5 + 0.55*math.Max(0, n.Dot(light))
				col := color.RGBA{scale(p.Colour.R, shade), scale(p.Colour.G, shade), scale(p.Colour.B, shade), 0xff}
				fill(big, depth, &cam, wt, col)
			}
		}
	}
	traced := r.trace(big, depth, &cam, k)
	out := downsample(big, supersample)
	text := fmt.Sprintf("t = %.4g s", r.Times[k])
	if traced {
		text += "    lines: the paths of the moving bodies"
	}
	if r.Tile > 0 {
		u := r.s.Units
		text += fmt.Sprintf("    floor squares %g %s", report.Tidy(u.FromSI(r.Tile, scene.Length)), u.Length)
	}
	label(out, text)
	return out
}

// traceWidth is the width of a path, in pixels of the supersampled
// picture.
const traceWidth = 3

// trace draws, for each moving body, the path of its centre of mass
// through the samples up to k, as a line
// in a darker shade of its colour, hidden where a body is in front of it.
// It returns whether it drew any.
func (r *Recorder) trace(img *image.RGBA, depth []float32, c *camera, k int) bool {
	drew := false
	for i, b := range r.Bodies {
		if !b.Moves || len(b.Parts) == 0 || k == 0 {
			continue
		}
		p := b.Parts[0].Colour
		col := color.RGBA{scale(p.R, 0.55), scale(p.G, 0.55), scale(p.B, 0.55), 0xff}
		for j := 1; j <= k; j++ {
			x0, y0, z0 := c.project(r.Poses[j-1][i].Apply(b.centre))
			x1, y1, z1 := c.project(r.Poses[j][i].Apply(b.centre))
			if z0 < c.near || z1 < c.near {
				continue
			}
			n := int(math.Ceil(math.Max(math.Abs(x1-x0), math.Abs(y1-y0))))
			for s := 0; s <= n; s++ {
				u := float64(s) / math.Max(float64(n), 1)
				x, y := x0+u*(x1-x0), y0+u*(y1-y0)
				// 1/z interpolates linearly on the screen; the line is
				// drawn a little nearer than the surface it lies on.
				iz := float32((1/z0*(1-u) + 1/z1*u) * (1 + 1e-3))
				for dy := -traceWidth / 2; dy <= traceWidth/2; dy++ {
					for dx := -traceWidth / 2; dx <= traceWidth/2; dx++ {
						px, py := int(x)+dx, int(y)+dy
						if px < 0 || py < 0 || px >= c.w || py >= c.h || iz < depth[py*c.w+px] {
							continue
						}
						img.SetRGBA(px, py, col)
						drew = true
					}
				}
			}
		}
	}
	return drew
}

func scale(c uint8, s float64) uint8 { return uint8(math.Min(255, float64(c)*s)) }

// nearClip is the smallest depth drawn, as a fraction of the camera's
// distance from the scene: triangles reaching nearer (only a floor patch
// can) are left out rather than drawn inside out.
const nearClip = 1e-3

// fill draws one triangle into img where it is nearer than depth.
func fill(img *image.RGBA, depth []float32, c *camera, t Tri, col color.RGBA) {
	var x, y, iz [3]float64
	for i, v := range t {
		var z float64
		x[i], y[i], z = c.project(v)
		if z < c.near {
			return
		}
		iz[i] = 1 / z
	}
	area := (x[1]-x[0])*(y[2]-y[0]) - (x[2]-x[0])*(y[1]-y[0])
	if area == 0 {
		return
	}
	x0 := max(0, int(math.Floor(math.Min(x[0], math.Min(x[1], x[2])))))
	x1 := min(c.w-1, int(math.Ceil(math.Max(x[0], math.Max(x[1], x[2])))))
	y0 := max(0, int(math.Floor(math.Min(y[0], math.Min(y[1], y[2])))))
	y1 := min(c.h-1, int(math.Ceil(math.Max(y[0], math.Max(y[1], y[2])))))
	for py := y0; py <= y1; py++ {
		sy := float64(py) + 0.5
		for px := x0; px <= x1; px++ {
			sx := float64(px) + 0.5
			// Barycentric weights from the edge functions.
			w0 := ((x[1]-sx)*(y[2]-sy) - (x[2]-sx)*(y[1]-sy)) / area
			w1 := ((x[2]-sx)*(y[0]-sy) - (x[0]-sx)*(y[2]-sy)) / area
			w2 := 1 - w0 - w1
			if w0 < 0 || w1 < 0 || w2 < 0 {
				continue
			}
			// 1/z is linear in screen space, so it interpolates exactly.
			z := float32(w0*iz[0] + w1*iz[1] + w2*iz[2])
			i := py*c.w + px
			if z <= depth[i] {
				continue
			}
			depth[i] = z
			img.SetRGBA(px, py, col)
		}
	}
}

// downsample averages each f x f block of pixels.
func downsample(src *image.RGBA, f int) *image.RGBA {
	b := src.Bounds()
	dst := image.NewRGBA(image.Rect(0, 0, b.Dx()/f, b.Dy()/f))
	for y := 0; y < dst.Bounds().Dy(); y++ {
		for x := 0; x < dst.Bounds().Dx(); x++ {
			var s [3]int
			for j := 0; j < f; j++ {
				for i := 0; i < f; i++ {
					c := src.RGBAAt(x*f+i, y*f+j)
					s[0], s[1], s[2] = s[0]+int(c.R), s[1]+int(c.G), s[2]+int(c.B)
				}
			}
			n := f * f
			dst.SetRGBA(x, y, color.RGBA{uint8(s[0] / n), uint8(s[1] / n), uint8(s[2] / n), 0xff})
		}
	}
	return dst
}

// label writes the time in the top left corner.
func label(img *image.RGBA, text string) {
	d := font.Drawer{Dst: img, Src: image.NewUniform(color.RGBA{0x20, 0x20, 0x20, 0xff}), Face: basicfont.Face7x13,
		Dot: fixed.P(12, 22)}
	d.DrawString(text)
}

// WritePictures writes the first and last states as start.png and
// end.png into dir.
func (r *Recorder) WritePictures(startPath, endPath string) error {
	if len(r.Poses) == 0 {
		return fmt.Errorf("nothing was recorded")
	}
	for _, f := range []struct {
		path string
		k    int
	}{{startPath, 0}, {endPath, len(r.Poses) - 1}} {
		if err := writePNG(f.path, r.Picture(f.k)); err != nil {
			return err
		}
	}
	return nil
}

func writePNG(path string, img image.Image) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(f)
	if err := png.Encode(bw, img); err != nil {
		f.Close()
		return err
	}
	if err := bw.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
