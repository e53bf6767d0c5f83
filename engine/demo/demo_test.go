package demo

import (
	"bytes"
	"context"
	"os"
	"testing"
)

func TestEmbeddedPartIsTheTestPart(t *testing.T) {
	// The study's part is testdata/parts/bracket.stl (written by
	// testdata/gen); the embedded copy must not drift from it.
	want, err := os.ReadFile("../../testdata/parts/bracket.stl")
	if err != nil {
		t.Fatal(err)
	}
	got, err := files.ReadFile("study/" + PartFile)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Error("study/bracket.stl differs from testdata/parts/bracket.stl; copy it again")
	}
}

func TestStudy(t *testing.T) {
	dir := t.TempDir()
	st, err := Run(context.Background(), dir, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Rows) != len(Frictions)*len(Seeds) {
		t.Fatalf("%d runs", len(st.Rows))
	}
	for _, r := range st.Rows {
		if r.Err != "" || r.Face < 0 || r.SettledAt < 0 {
			t.Errorf("run %+v did not settle on a face", r)
			continue
		}
		// The part can only rest on a face it can stand on (inspect's
		// stability: the centre of mass projects inside the face).
		if !st.Faces[r.Face].Stable {
			t.Errorf("run %+v rests on unstable face %d", r, r.Face)
		}
	}
	for _, f := range []string{SceneFile, PartFile, "results.csv"} {
		if _, err := os.Stat(dir + "/" + f); err != nil {
			t.Error(err)
		}
	}
}
