package sweep

import (
	"fmt"
	"runtime"
	"runtime/debug"
	"slices"
)

// Build identifies the program that ran a study. Results are bit-identical
// only between runs of one build on one architecture: another compiler,
// revision or instruction set (arm64 fuses multiply-adds that amd64 keeps
// apart) rounds differently, so folders of different builds are not
// resumed or merged into one.
type Build struct {
	// Module is the main module's version from the binary's build
	// information: a release tag, or "(devel)" for a build from a work tree.
	Module string `json:"module"`
	// Revision is the version control revision the binary was built from,
	// with Modified set when the work tree had changes; empty when the
	// build did not record it (go build -buildvcs=false, go test).
	Revision string `json:"revision"`
	Modified bool   `json:"modified"`
	Go       string `json:"go"`
	Arch     string `json:"arch"`
}

// CurrentBuild returns the build of the running program.
func CurrentBuild() Build {
	b := Build{Go: runtime.Version(), Arch: runtime.GOARCH}
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return b
	}
	b.Module = bi.Main.Version
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			b.Revision = s.Value
		case "vcs.modified":
			b.Modified = s.Value == "true"
		}
	}
	return b
}

// differs says how b, the build of another folder, differs from a, or "".
func (a Build) differs(b Build) string {
	switch {
	case a.Arch != b.Arch:
		return fmt.Sprintf("it was run on %s, not %s: results differ between architectures (their floating-point arithmetic rounds differently)", orNone(b.Arch), orNone(a.Arch))
	case a.Go != b.Go:
		return fmt.Sprintf("it was run by a build with %s, not %s", orNone(b.Go), orNone(a.Go))
	case a.Module != b.Module || a.Revision != b.Revision || a.Modified != b.Modified:
		return fmt.Sprintf("it was run by build %s, not %s", b.name(), a.name())
	}
	return ""
}

func (b Build) name() string {
	s := orNone(b.Module)
	if b.Revision != "" {
		s += " (revision " + b.Revision
		if b.Modified {
			s += " with local changes"
		}
		s += ")"
	}
	return s
}

func orNone(s string) string {
	if s == "" {
		return "an unrecorded one"
	}
	return s
}

// recordInputs records the digest of every file the study's scenes read
// (meshes, pose tables), named relative to the scene's folder. It runs
// after every case has been read, so that files read only by some cases
// count too.
func (st *Study) recordInputs() {
	st.meta.Inputs = []FileDigest{}
	for _, f := range st.Scene.Inputs() {
		st.meta.Inputs = append(st.meta.Inputs, FileDigest{File: f.Name, SHA256: digest(f.Data)})
	}
}

// inputsDiffer says how the input files of b differ from those of a, or "".
func inputsDiffer(a, b []FileDigest) string {
	if slices.Equal(a, b) {
		return ""
	}
	byName := map[string]string{}
	for _, d := range a {
		byName[d.File] = d.SHA256
	}
	seen := map[string]bool{}
	for _, d := range b {
		seen[d.File] = true
		h, ok := byName[d.File]
		switch {
		case !ok:
			return fmt.Sprintf("it read the file %s, which this study does not", d.File)
		case h != d.SHA256:
			return fmt.Sprintf("its file %s has SHA-256 %.12s..., not %.12s...: the file has changed", d.File, d.SHA256, h)
		}
	}
	for _, d := range a {
		if !seen[d.File] {
			return fmt.Sprintf("it did not read the file %s, which this study reads", d.File)
		}
	}
	return ""
}
