package main

import (
	"flag"
	"path/filepath"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/view"
)

// visuals are the optional files that show a run: the animation and the
// pictures of its start and end.
type visuals struct {
	animation, pictures bool
	rec                 *view.Recorder
}

// flags adds --animation and --pictures to a command's flags.
func (v *visuals) flags(fs *flag.FlagSet) {
	fs.BoolVar(&v.animation, "animation", false, "")
	fs.BoolVar(&v.pictures, "pictures", false, "")
}

// observe sets opt to record the run of s when a visual file is asked for.
func (v *visuals) observe(s *scene.Scene, opt *report.Options) {
	if !v.animation && !v.pictures {
		return
	}
	v.rec = view.NewRecorder(s)
	opt.Observe = v.rec.Observe
}

// write writes the files asked for into dir and returns their names.
func (v *visuals) write(dir string) ([]string, error) {
	if v.rec == nil || dir == "" {
		return nil, nil
	}
	var files []string
	if v.animation {
		if err := v.rec.WriteGLB(filepath.Join(dir, view.AnimationFile)); err != nil {
			return files, err
		}
		files = append(files, view.AnimationFile)
	}
	if v.pictures {
		if err := v.rec.WritePictures(filepath.Join(dir, view.StartPicture), filepath.Join(dir, view.EndPicture)); err != nil {
			return files, err
		}
		files = append(files, view.StartPicture, view.EndPicture)
	}
	return files, nil
}
