// Command benchtable runs the benchmarks registered in package bench and
// prints a table of medians: ns/op, allocs/op, B/op, the ratio of the figure
// recorded before the speed work (bench.Recorded) to this run's, the
// speed-up over another benchmark named as its baseline, and each
// benchmark's own metrics. Below the table it prints the speed-up from CPU
// time of benchmarks that report it, and the fitted exponent of time
// against size of each series (the pours of 1000 to 8000 bodies).
//
//	go run ./bench/cmd/benchtable [-run REGEXP] [-count N] [-benchtime D]
//
// Benchmarks named as a baseline by a selected benchmark are run as well, so
// that every ratio is measured in the same run.
package main

import (
	"flag"
	"fmt"
	"io"
	"os"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"

	"clatter/bench"
)

func main() {
	testing.Init() // registers -test.benchtime, which we set below
	run := flag.String("run", ".", "run only the benchmarks whose name matches this regular expression")
	count := flag.Int("count", 1, "run each benchmark this many times and report medians")
	benchtime := flag.String("benchtime", "1s", "target time per run, or a fixed count of ops as in 100x")
	list := flag.Bool("list", false, "list the registered benchmarks and exit")
	flag.Usage = func() {
		fmt.Fprintf(os.Stderr, "usage: benchtable [-run REGEXP] [-count N] [-benchtime D] [-list]\n")
		flag.PrintDefaults()
	}
	flag.Parse()
	if flag.NArg() > 0 {
		flag.Usage()
		os.Exit(2)
	}
	if err := flag.Set("test.benchtime", *benchtime); err != nil {
		fmt.Fprintf(os.Stderr, "benchtable: -benchtime %q: %v (use a duration like 2s or a count like 50x)\n", *benchtime, err)
		os.Exit(2)
	}
	re, err := regexp.Compile(*run)
	if err != nil {
		fmt.Fprintf(os.Stderr, "benchtable: -run %q: %v\n", *run, err)
		os.Exit(2)
	}
	if *count < 1 {
		fmt.Fprintf(os.Stderr, "benchtable: -count must be at least 1, got %d\n", *count)
		os.Exit(2)
	}
	all := bench.All()
	if *list {
		for _, b := range all {
			fmt.Println(b.Name)
		}
		return
	}

	selected := map[string]bool{}
	for _, b := range all {
		if re.MatchString(b.Name) {
			selected[b.Name] = true
			if b.Baseline != "" {
				selected[b.Baseline] = true
			}
		}
	}
	if len(selected) == 0 {
		fmt.Fprintf(os.Stderr, "benchtable: no benchmark matches %q; -list shows them\n", *run)
		os.Exit(2)
	}

	type row struct {
		b                 bench.Benchmark
		ns, allocs, bytes []float64
		extras            map[string][]float64
		failed            bool
	}
	var rows []*row
	for _, b := range all {
		if selected[b.Name] {
			rows = append(rows, &row{b: b, extras: map[string][]float64{}})
		}
	}
	// Rounds over all benchmarks rather than all runs of one benchmark
	// after another, so that a change in machine load hits a benchmark and
	// its baseline alike.
	for i := 0; i < *count; i++ {
		for _, rw := range rows {
			if rw.failed {
				continue
			}
			fmt.Fprintf(os.Stderr, "round %d/%d: %s\n", i+1, *count, rw.b.Name)
			r := testing.Benchmark(rw.b.Fn)
			if r.N == 0 {
				rw.failed = true
				continue
			}
			rw.ns = append(rw.ns, float64(r.T.Nanoseconds())/float64(r.N))
			rw.allocs = append(rw.allocs, float64(r.MemAllocs)/float64(r.N))
			rw.bytes = append(rw.bytes, float64(r.MemBytes)/float64(r.N))
			for k, v := range r.Extra {
				rw.extras[k] = append(rw.extras[k], v)
			}
		}
	}
	results := make([]result, len(rows))
	byName := map[string]*result{}
	for i, rw := range rows {
		res := result{b: rw.b, failed: rw.failed, extra: map[string]float64{}}
		if !rw.failed {
			res.ns, res.allocs, res.B = median(rw.ns), median(rw.allocs), median(rw.bytes)
			for k, v := range rw.extras {
				res.extra[k] = median(v)
			}
		}
		results[i] = res
		byName[rw.b.Name] = &results[i]
	}

	table := [][]string{{"benchmark", "ns/op", "allocs/op", "B/op", "vs baseline", "speed-up", "over", "metrics"}}
	for _, r := range results {
		if r.failed {
			table = append(table, []string{r.b.Name, "FAILED", "", "", "", "", "", ""})
			continue
		}
		ratio := ""
		if base := byName[r.b.Baseline]; base != nil && !base.failed && r.ns > 0 {
			ratio = fmt.Sprintf("%.3gx", base.ns/r.ns)
		}
		table = append(table, []string{r.b.Name, fmt.Sprintf("%.0f", r.ns), fmt.Sprintf("%.1f", r.allocs),
			fmt.Sprintf("%.0f", r.B), vsRecorded(r), ratio, r.b.Baseline, metrics(r.extra)})
	}
	printTable(os.Stdout, table)
	if *count > 1 {
		fmt.Printf("medians of %d runs\n", *count)
	}
	fmt.Printf("vs baseline: the recorded time per op over this run's (CPU time where marked cpu); above 1x is faster; recorded on %s\n", bench.RecordedOn)
	for _, r := range results {
		if base := byName[r.b.Baseline]; base != nil && !base.failed && !r.failed {
			if line := cpuSpeedup(r.b, base.b, r.extra, base.extra, r.ns, base.ns); line != "" {
				fmt.Println(line)
			}
		}
	}
	for _, line := range seriesFits(results) {
		fmt.Println(line)
	}
}

// A result is the medians of one benchmark's runs.
type result struct {
	b             bench.Benchmark
	ns, allocs, B float64
	extra         map[string]float64
	failed        bool
}

// printTable prints rows in columns: the first left-aligned, numbers
// right-aligned, the last two (names and metrics) left-aligned.
func printTable(w io.Writer, rows [][]string) {
	width := make([]int, len(rows[0]))
	for _, r := range rows {
		for i, c := range r {
			width[i] = max(width[i], len(c))
		}
	}
	for _, r := range rows {
		var b strings.Builder
		for i, c := range r {
			switch {
			case i == 0 || i >= len(r)-2:
				fmt.Fprintf(&b, "%-*s  ", width[i], c)
			default:
				fmt.Fprintf(&b, "%*s  ", width[i], c)
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
}

func median(v []float64) float64 {
	s := slices.Clone(v)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

func metrics(m map[string]float64) string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = fmt.Sprintf("%.4g %s", m[k], k)
	}
	return strings.Join(parts, ", ")
}
