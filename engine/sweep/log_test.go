package sweep

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

func TestSplitCSV(t *testing.T) {
	// Against encoding/csv (RFC 4180) read afresh as the reference, and
	// refusals of what it would refuse too, through one csvLine (whose
	// Reader must start each line afresh, also after a refusal).
	var split csvLine
	for _, line := range []string{
		`0,1,2,a,b`,
		`0,1,"a,b",c`,
		`"he said ""hi""",x`,
		`,,`,
		`""`,
		`x,""`,
	} {
		want, err := csv.NewReader(strings.NewReader(line)).Read()
		if err != nil {
			t.Fatal(err)
		}
		got, ok := split.split([]byte(line))
		if !ok || !reflect.DeepEqual(got, want) {
			t.Errorf("split(%q) = %q %v, want %q", line, got, ok, want)
		}
	}
	for _, bad := range []string{`"open`, `a"b,c`, `"a"b`, ``} {
		if _, ok := split.split([]byte(bad)); ok {
			t.Errorf("split(%q) accepted a malformed line", bad)
		}
	}
	if got, ok := split.split([]byte(`a,"b,c"`)); !ok || !reflect.DeepEqual(got, []string{"a", "b,c"}) {
		t.Errorf("after the refusals, split(%q) = %q %v", `a,"b,c"`, got, ok)
	}
}

func TestCSVFieldRoundTrip(t *testing.T) {
	// Each field written by csvField reads back, between others, as itself
	// through encoding/csv (RFC 4180).
	for _, f := range []string{"box", "", "a,b", `say "hi"`, " lead", "cr\rin", `\.`} {
		line := "x," + csvField(f) + ",y"
		got, err := csv.NewReader(strings.NewReader(line)).Read()
		if err != nil || !reflect.DeepEqual(got, []string{"x", f, "y"}) {
			t.Errorf("csvField(%q) in %q reads back as %q (%v)", f, line, got, err)
		}
	}
}

// twoBodies is a table of trials with two moving bodies, a and b, of a
// study of 3 cases x 4 trials, one varied key.
func twoBodies() *table {
	m := &Meta{Cases: 3, Trials: 4, Vary: []VaryMeta{{Key: "k"}}, Bodies: []BodyMeta{{Name: "a"}, {Name: "b"}}}
	return trialsTable(m)
}

func row(c, tr int, body string) string {
	return fmt.Sprintf("%d,%d,99,0.5,%s,1,true,0.4,1,2,3,1,0,0,0,7,1\n", c, tr, body)
}

func TestScanDropsDamage(t *testing.T) {
	tb := twoBodies()
	good := []string{row(0, 0, "a") + row(0, 0, "b"), row(2, 3, "a") + row(2, 3, "b"), row(1, 2, "a") + row(1, 2, "b")}
	for _, c := range []struct {
		name    string
		body    string
		want    []string // the complete trials found, in file order
		torn    bool
		dropped int
	}{
		{"clean", good[0] + good[1] + good[2], good, false, 0},
		{"torn last line", good[0] + good[1] + row(1, 2, "a") + "1,2,99,0.5,b,1,tr", []string{good[0], good[1]}, true, 1},
		{"torn after a complete trial", good[0] + "2,3,9", []string{good[0]}, true, 0},
		{"half a trial in the middle", good[0] + row(2, 3, "a") + good[2], []string{good[0], good[2]}, false, 1},
		{"bodies out of order", good[0] + row(2, 3, "b") + row(2, 3, "a") + good[2], []string{good[0], good[2]}, false, 2},
		{"a garbled line", good[0] + "0,0,\"oops\n" + good[1], []string{good[0], good[1]}, false, 1},
		{"a trial outside the study", good[0] + row(3, 0, "a") + row(3, 0, "b") + good[1], []string{good[0], good[1]}, false, 2},
		{"a trial twice", good[0] + good[0], []string{good[0], good[0]}, false, 0},
	} {
		var got []string
		n, err := tb.scan(strings.NewReader(tb.header+"\n"+c.body), true, func(g group) error {
			got = append(got, string(g.data))
			return nil
		})
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if !reflect.DeepEqual(got, c.want) || n.torn != c.torn || n.dropped != c.dropped {
			t.Errorf("%s: trials %q torn %v dropped %d; want %q torn %v dropped %d", c.name, got, n.torn, n.dropped, c.want, c.torn, c.dropped)
		}
		if c.torn && !strings.HasSuffix(c.body[:n.end-int64(len(tb.header))-1], "\n") {
			t.Errorf("%s: end %d is not just past a line break", c.name, n.end)
		}
	}
	if _, err := tb.scan(strings.NewReader("case,trial\n"+good[0]), true, func(group) error { return nil }); err == nil {
		t.Error("a file of another layout was read")
	}
}

func TestSortSpills(t *testing.T) {
	// The same trials sorted in memory and in runs of a few trials each,
	// merged from temporary files: the same bytes, and no file left.
	tb := twoBodies()
	var body strings.Builder
	order := []int{7, 3, 11, 0, 5, 3, 9, 1, 10, 2, 8, 6, 4}
	for _, g := range order {
		body.WriteString(row(g/4, g%4, "a") + row(g/4, g%4, "b"))
	}
	sortWith := func(limit int) (string, int) {
		dir := t.TempDir()
		old := sortLimit
		sortLimit = limit
		defer func() { sortLimit = old }()
		if err := os.WriteFile(filepath.Join(dir, TrialsFile), []byte(tb.header+"\n"+body.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		var dropped int
		n, err := sortInto(dir, TrialsFile, tb, []string{dir}, 0, 12, &dropped, nil)
		if err != nil || n != 12 {
			t.Fatalf("limit %d: %d trials, %v", limit, n, err)
		}
		out, err := os.ReadFile(filepath.Join(dir, TrialsFile))
		if err != nil {
			t.Fatal(err)
		}
		ents, _ := os.ReadDir(dir)
		return string(out), len(ents)
	}
	mem, _ := sortWith(1 << 20)
	spilled, files := sortWith(3 * len(row(0, 0, "a")))
	if mem != spilled {
		t.Errorf("sorted in runs:\n%s\nin memory:\n%s", spilled, mem)
	}
	if files != 1 {
		t.Errorf("%d files left in the folder, want trials.csv alone", files)
	}
	var want bytes.Buffer
	want.WriteString(tb.header + "\n")
	for g := 0; g < 12; g++ {
		want.WriteString(row(g/4, g%4, "a") + row(g/4, g%4, "b"))
	}
	if mem != want.String() {
		t.Errorf("sorted:\n%s\nwant:\n%s", mem, want.String())
	}
}
