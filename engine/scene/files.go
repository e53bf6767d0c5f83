package scene

import (
	"path"
	"path/filepath"
	"sort"
	"strings"
)

// InputFile is a file that a scene reads besides itself: a mesh, a pose
// table. Name is its path relative to the scene file's folder (slashes),
// or as written when it lies outside it.
type InputFile struct {
	Name string
	Data []byte
}

// Inputs returns every file the scene, and every scene made from it by
// With, has read so far, sorted by name: what a study's results depend on
// besides the scene file itself.
func (s *Scene) Inputs() []InputFile {
	out := make([]InputFile, 0, len(s.cache))
	for p, d := range s.cache {
		out = append(out, InputFile{Name: s.relName(p), Data: d})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}

// relName names a resolved path relative to the scene's folder.
func (s *Scene) relName(p string) string {
	if s.opt.FS != nil {
		if r, ok := strings.CutPrefix(p, path.Clean(s.opt.Dir)+"/"); ok {
			return r
		}
		return p
	}
	if r, err := filepath.Rel(s.opt.Dir, p); err == nil && !strings.HasPrefix(r, "..") {
		return filepath.ToSlash(r)
	}
	return filepath.ToSlash(p)
}
