package pack

import (
	"fmt"
	"sort"
	"strconv"
	"strings"

	"clatter/shapes"
)

// Face is a package face number, 1 to 6 (see the package comment).
type Face int

// axisOf gives, per face 1..6, the body axis its outward normal lies on
// and the sign: ASTM D5276 / ISTA face identification on the box of bounds.
var axisOf = [7]struct {
	axis int
	sign float64
}{{}, {2, 1}, {1, -1}, {2, -1}, {1, 1}, {0, -1}, {0, 1}}

// Normal is the face's outward normal in the body's axes.
func (f Face) Normal() shapes.Vec3 {
	var n shapes.Vec3
	n[axisOf[f].axis] = axisOf[f].sign
	return n
}

// Opposite is the face across the body: 1-3, 2-4, 5-6.
func (f Face) Opposite() Face {
	return [7]Face{0, 3, 4, 1, 2, 6, 5}[f]
}

// Feature is a face, an edge or a corner: one, two or three faces, sorted.
type Feature []Face

// Kind names the feature: "face", "edge" or "corner".
func (ft Feature) Kind() string {
	return [4]string{"", "face", "edge", "corner"}[len(ft)]
}

// String writes the feature as the scene files do: "face 3", "edge 3-5",
// "corner 2-3-5".
func (ft Feature) String() string {
	if len(ft) == 0 || len(ft) > 3 {
		return ""
	}
	s := make([]string, len(ft))
	for i, f := range ft {
		s[i] = strconv.Itoa(int(f))
	}
	return ft.Kind() + " " + strings.Join(s, "-")
}

// ParseFeature reads "face N", "edge N-M" or "corner N-M-K". The faces of
// an edge must be adjacent (not opposite), those of a corner pairwise so.
func ParseFeature(s string) (Feature, error) {
	kind, nums, ok := strings.Cut(strings.TrimSpace(s), " ")
	want := map[string]int{"face": 1, "edge": 2, "corner": 3}[kind]
	if !ok || want == 0 {
		return nil, fmt.Errorf("%q is not a face, edge or corner: write \"face 3\", \"edge 3-5\" or \"corner 2-3-5\" (faces numbered 1 top, 2 right side, 3 bottom, 4 left side, 5 near end, 6 far end)", s)
	}
	parts := strings.Split(strings.TrimSpace(nums), "-")
	if len(parts) != want {
		return nil, fmt.Errorf("%q: a %s names %d face number(s), e.g. %q", s, kind, want, Feature(([]Face{2, 3, 5})[3-want:]).String())
	}
	ft := make(Feature, 0, want)
	for _, p := range parts {
		n, err := strconv.Atoi(strings.TrimSpace(p))
		if err != nil || n < 1 || n > 6 {
			return nil, fmt.Errorf("%q: face numbers are 1 to 6, got %q", s, p)
		}
		ft = append(ft, Face(n))
	}
	sort.Slice(ft, func(i, j int) bool { return ft[i] < ft[j] })
	for i := range ft {
		for j := i + 1; j < len(ft); j++ {
			if ft[i] == ft[j] || ft[i].Opposite() == ft[j] {
				return nil, fmt.Errorf("%q: faces %d and %d do not meet (they are the same or opposite), so they make no %s", s, ft[i], ft[j], kind)
			}
		}
	}
	return ft, nil
}

// Point is the feature's point on the box of bounds nearest to p: the
// corner itself, the point of the edge's line nearest p, or the point of
// the face's plane nearest p.
func (ft Feature) Point(b shapes.AABB, p shapes.Vec3) shapes.Vec3 {
	q := p
	for _, f := range ft {
		a := axisOf[f]
		if a.sign > 0 {
			q[a.axis] = b.Max[a.axis]
		} else {
			q[a.axis] = b.Min[a.axis]
		}
	}
	return q
}
