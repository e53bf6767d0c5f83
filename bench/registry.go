package bench

import (
	"slices"
	"strings"
	"testing"
)

// A Benchmark is one registered benchmark body. Areas define their bodies as
// exported functions in non-test files of this package and register them
// from an init function; the Benchmark* wrappers in the _test.go files call
// the same functions, so `go test -bench` and cmd/benchtable measure the
// same code.
type Benchmark struct {
	Name string           // as in the test wrapper, without the "Benchmark" prefix
	Fn   func(*testing.B) // the benchmark body
	// Baseline optionally names another registered benchmark that this one
	// is compared against: the table prints Baseline's ns/op divided by
	// this one's.
	Baseline string
	// Series and Size, if set, put this benchmark in a scaling series:
	// benchmarks of one series do the same work at different sizes (Size
	// bodies), and the table fits the exponent of ns/op against Size.
	Series string
	Size   int
	// Workers is the number of goroutines an op runs on (0 for 1). With a
	// cpu-ns metric it gives the speed-up the table reports from CPU time:
	// Workers times the baseline's CPU per op over this one's.
	Workers int
}

var registry []Benchmark

// Register adds benchmarks to the table. Names must be unique.
func Register(bs ...Benchmark) {
	for _, b := range bs {
		if Lookup(b.Name) != nil {
			panic("bench: benchmark " + b.Name + " registered twice") // a programming error, at init
		}
		registry = append(registry, b)
	}
}

// All returns the registered benchmarks sorted by name.
func All() []Benchmark {
	out := slices.Clone(registry)
	slices.SortFunc(out, func(a, b Benchmark) int { return strings.Compare(a.Name, b.Name) })
	return out
}

// Lookup returns the registered benchmark of that name, or nil.
func Lookup(name string) *Benchmark {
	for i := range registry {
		if registry[i].Name == name {
			return &registry[i]
		}
	}
	return nil
}
