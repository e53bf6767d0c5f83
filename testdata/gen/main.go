// Command gen writes the STL test parts into testdata/parts and the broken
// files into testdata/broken. Run it from the module root:
//
//	go run ./testdata/gen
//
// The files are committed; a test in shapes/mesh checks that they match
// what this command writes, byte for byte.
package main

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"

	"clatter/testdata/gen/partgen"
)

func main() {
	dir := flag.String("dir", "testdata", "directory to write parts/ and broken/ into")
	flag.Parse()
	files, err := partgen.Files()
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	for _, f := range files {
		path := filepath.Join(*dir, filepath.FromSlash(f.Path))
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		if err := os.WriteFile(path, f.Data, 0o644); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		fmt.Printf("%-28s %6d bytes\n", path, len(f.Data))
	}
}
