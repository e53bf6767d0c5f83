// Package bench holds the project's speed and memory benchmarks. Run them
// with
//
//	go test ./bench -run '^$' -bench . -benchmem
//
// Targets named in issues are measured here, never in timed unit tests.
package bench
