package gen

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// FuzzParseSpec feeds arbitrary bytes to the spec parser and validator:
// it never panics, and every rejection is a list of problems each placed
// at a line and column inside the file. The seeds are every spec under
// testdata (the bad ones included) and the examples; findings are kept
// in testdata/fuzz/FuzzParseSpec.
func FuzzParseSpec(f *testing.F) {
	for _, pattern := range []string{"../testdata/bad/*.toml", "../testdata/golden/*/*.toml", "../examples/*/*.toml"} {
		paths, err := filepath.Glob(pattern)
		if err != nil {
			f.Fatal(err)
		}
		for _, path := range paths {
			data, err := os.ReadFile(path)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(data)
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		const path = "fuzz.toml"
		spec, err := parseSpecData(path, data)
		if err == nil {
			if spec == nil {
				t.Fatal("no spec and no error")
			}
			return
		}
		var probs Problems
		if !errors.As(err, &probs) || len(probs) == 0 {
			t.Fatalf("error without positions: %v", err)
		}
		lines := bytes.Count(data, []byte("\n")) + 1
		for _, p := range probs {
			if p.Pos.File != path || p.Pos.Line < 1 || p.Pos.Line > lines || p.Pos.Col < 1 || p.Msg == "" {
				t.Errorf("problem %q at %s, outside the %d lines of the spec", p.Msg, p.Pos, lines)
			}
		}
	})
}
