package sweep

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"clatter/engine/report"
	"clatter/shapes/resting"
)

// Names of the files a sweep writes.
const (
	TrialsFile   = "trials.csv"
	CasesFile    = "cases.csv"
	MetaFile     = "sweep.json"
	FailuresFile = "failures.csv"
)

const toolName = "clatter"

// Meta is the content of sweep.json: the study as run. Lengths and masses
// are in the scene's units (Units).
type Meta struct {
	Tool    string `json:"tool"`
	Version string `json:"version"`
	// Build is the program that ran the study.
	Build Build `json:"build"`
	// Scene is the scene file's name and the SHA-256 of its bytes; Inputs
	// those of every other file it reads (meshes, pose tables), named
	// relative to it.
	Scene  FileDigest   `json:"scene"`
	Inputs []FileDigest `json:"inputs"`
	Units  report.Units `json:"units"`
	Seed   uint64       `json:"seed"`
	// Trials is the number of trials of each case; Cases the number of
	// combinations of the Vary values (the last key varies fastest).
	Trials int64      `json:"trials_per_case"`
	Cases  int64      `json:"cases"`
	Vary   []VaryMeta `json:"vary"`
	// GroupFaces: cases.csv counts faces of one symmetry group as one,
	// under the group's lowest face index.
	GroupFaces bool `json:"group_faces"`
	// Duration is the longest duration of the cases, s.
	Duration float64    `json:"duration"`
	Bodies   []BodyMeta `json:"bodies"`
	// Gates are the scene's counting gates (gates.go); left out when none.
	Gates []GateMeta `json:"gates,omitempty"`
	// Shard is the part of the study this folder holds; nil for all of it.
	Shard *ShardMeta `json:"shard,omitempty"`
	// TrialsTotal is the number of trials this folder is to hold,
	// TrialsDone how many it holds, TrialsFailed how many of those failed
	// (see failures.csv).
	TrialsTotal  int64 `json:"trials_total"`
	TrialsDone   int64 `json:"trials_done"`
	TrialsFailed int64 `json:"trials_failed"`
	Complete     bool  `json:"complete"`
	// Files are the result files, written when the folder is finished.
	Files []string `json:"files"`
}

// FileDigest names a file and the SHA-256 of its bytes, in hex.
type FileDigest struct {
	File   string `json:"file"`
	SHA256 string `json:"sha256"`
}

// VaryMeta is one varied key and its values in the file's units.
type VaryMeta struct {
	Key    string    `json:"key"`
	Values []float64 `json:"values"`
	Log    bool      `json:"log"`
}

// BodyMeta is a moving body and the faces of its resting analysis.
type BodyMeta struct {
	Name  string     `json:"name"`
	Faces []FaceMeta `json:"faces"`
}

// FaceMeta is one face as `clatter inspect` lists it: its outward normal
// in the part's frame (or the axis of a curved face), area, quasi-static
// resting probability, stability, and symmetry group (the lowest index of
// the faces equal to it by symmetry).
type FaceMeta struct {
	Face        int         `json:"face"`
	Normal      *[3]float64 `json:"normal,omitempty"`
	Axis        *[3]float64 `json:"axis,omitempty"`
	Area        float64     `json:"area"`
	Probability float64     `json:"probability"`
	Stable      bool        `json:"stable"`
	Group       int         `json:"group"`
}

// ShardMeta is the shard and its global trial indices [From, To).
type ShardMeta struct {
	Index int   `json:"index"`
	Count int   `json:"count"`
	From  int64 `json:"from"`
	To    int64 `json:"to"`
}

func (m Meta) clone() Meta {
	b, _ := json.Marshal(m)
	var c Meta
	_ = json.Unmarshal(b, &c)
	return c
}

// span returns the global trial indices [lo, hi) the folder holds.
func (m *Meta) span() (lo, hi int64) {
	if m.Shard == nil {
		return 0, m.Cases * m.Trials
	}
	return m.Shard.From, m.Shard.To
}

func (m *Meta) keysHeader() string {
	var b strings.Builder
	for _, v := range m.Vary {
		b.WriteString(csvField(v.Key))
		b.WriteByte(',')
	}
	return b.String()
}

// trialsHeader is the first line of trials.csv (a fixed interface: the README documents it).
func (m *Meta) trialsHeader() string {
	return "case,trial,seed," + m.keysHeader() + "body,resting_face,settled,settled_at,x,y,z,qw,qx,qy,qz,max_impact_speed,face_down"
}

// casesHeader is the first line of cases.csv (a fixed interface: the README documents it).
func (m *Meta) casesHeader() string {
	return "case," + m.keysHeader() + "body,resting_face,count,trials,fraction,low,high"
}

const failuresHeader = "case,trial,seed,error"

// JSON returns sweep.json's bytes.
func (m *Meta) JSON() []byte {
	b, err := report.MarshalIndent(m)
	if err != nil {
		// Every number is finite (rounded by report.Tidy), so this does
		// not happen; keep a valid document regardless.
		return []byte(fmt.Sprintf("{\"error\": %q}\n", err.Error()))
	}
	return b
}

// ReadMeta reads a folder's sweep.json.
func ReadMeta(dir string) (*Meta, error) {
	p := filepath.Join(dir, MetaFile)
	b, err := os.ReadFile(p)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return nil, badf("%s has no %s: it is not the folder of a sweep", dir, MetaFile)
		}
		return nil, badf("cannot read %s: %v", p, unwrapPath(err))
	}
	var m Meta
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, badf("%s is not a sweep's %s: %v", p, MetaFile, err)
	}
	if m.Tool != toolName || m.Cases < 1 || m.Trials < 1 || len(m.Bodies) == 0 {
		return nil, badf("%s is not a sweep's %s", p, MetaFile)
	}
	if lo, hi := m.span(); lo < 0 || hi < lo || hi > m.Cases*m.Trials {
		return nil, badf("%s: the shard's trials [%d, %d) are outside the study's %d", p, lo, hi, m.Cases*m.Trials)
	}
	return &m, nil
}

// writeMeta writes sweep.json through a temporary file.
func writeMeta(dir string, m *Meta) error {
	return writeAtomic(filepath.Join(dir, MetaFile), m.JSON())
}

// sameStudy says how b differs from a in what makes two folders parts of
// one study: the tool version and build, the scene and every file it
// reads, the seed, and the layout of cases and trials that follows from
// them. It returns "" when they agree.
func sameStudy(a, b *Meta) string {
	if why := a.Build.differs(b.Build); why != "" {
		return why
	}
	if why := inputsDiffer(a.Inputs, b.Inputs); why != "" {
		return why
	}
	switch {
	case a.Tool != b.Tool || a.Version != b.Version:
		return fmt.Sprintf("it was made by %s version %q, not %q", b.Tool, b.Version, a.Version)
	case a.Seed != b.Seed:
		return fmt.Sprintf("its seed is %d, not %d", b.Seed, a.Seed)
	case a.Scene.SHA256 != b.Scene.SHA256:
		return fmt.Sprintf("its scene %s has SHA-256 %.12s..., not %.12s... (%s): a different scene or a changed file", b.Scene.File, b.Scene.SHA256, a.Scene.SHA256, a.Scene.File)
	case a.Trials != b.Trials || a.Cases != b.Cases || a.GroupFaces != b.GroupFaces || a.trialsHeader() != b.trialsHeader():
		return "its cases and trials are laid out differently"
	}
	return ""
}

// groupFaceTol is the relative difference within which two faces' areas,
// heights and probabilities count as equal for grouping: far above the
// rounding of the hull's and the analysis's arithmetic (about 1e-14),
// far below the differences between faces that are not symmetric.
const groupFaceTol = 1e-6

// groupFaces returns, for each face, the lowest index of the faces equal
// to it by symmetry: the same kind (flat or curved), stability, area,
// centre-of-mass height and quasi-static probability.
func groupFaces(faces []resting.Face) []int {
	g := make([]int, len(faces))
	near := func(a, b, scale float64) bool { return math.Abs(a-b) <= groupFaceTol*scale }
	maxArea, maxHeight := 0.0, 0.0
	for _, f := range faces {
		maxArea = math.Max(maxArea, f.Area)
		maxHeight = math.Max(maxHeight, f.Height)
	}
	for i, f := range faces {
		g[i] = i
		for j := 0; j < i; j++ {
			o := faces[j]
			if g[j] == j && o.Curved() == f.Curved() && o.Stable == f.Stable &&
				near(o.Area, f.Area, maxArea) && near(o.Height, f.Height, maxHeight) && near(o.Probability, f.Probability, 1) {
				g[i] = j
				break
			}
		}
	}
	return g
}
