package gen

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/golden")

// TestGolden regenerates every spec under testdata/golden and compares
// the output with the committed files byte for byte; -update rewrites
// them. A stale golden file fails with a diff.
func TestGolden(t *testing.T) {
	specs, err := filepath.Glob(filepath.Join("..", "testdata", "golden", "*", "*.toml"))
	if err != nil || len(specs) == 0 {
		t.Fatalf("no golden specs: %v", err)
	}
	outs, err := Generate(specs)
	if err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := Write(outs); err != nil {
			t.Fatal(err)
		}
		return
	}
	for _, o := range outs {
		want, err := os.ReadFile(o.Path)
		if err != nil {
			t.Errorf("%s: %v (run go test ./gen -update)", o.Path, err)
			continue
		}
		if !bytes.Equal(want, o.Data) {
			t.Errorf("%s is stale (run go test ./gen -update); diff:\n%s", o.Path, diff(t, want, o.Data))
		}
	}
}

// diff shows the difference with diff -u when the system has it.
func diff(t *testing.T, want, got []byte) string {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "golden"), filepath.Join(dir, "generated")
	os.WriteFile(a, want, 0o644)
	os.WriteFile(b, got, 0o644)
	out, _ := exec.Command("diff", "-u", a, b).CombinedOutput()
	if len(out) == 0 {
		return fmt.Sprintf("(no diff tool; %d bytes committed, %d generated)", len(want), len(got))
	}
	return string(out)
}

// Unrolled copies of a loop body print its comments once, with the first
// copy; the later copies must not open on a blank line where the comments
// stood (they did, in every golden minimizer with a declaring body).
func TestNoBlankLineOpensABlock(t *testing.T) {
	specs, err := filepath.Glob(filepath.Join("..", "testdata", "golden", "*", "*.toml"))
	if err != nil || len(specs) == 0 {
		t.Fatalf("no golden specs: %v", err)
	}
	outs, err := Generate(specs)
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range outs {
		lines := strings.Split(string(o.Data), "\n")
		for i := 1; i < len(lines); i++ {
			if lines[i] == "" && strings.HasSuffix(lines[i-1], "{") {
				t.Errorf("%s:%d: a blank line opens the block of line %d: %q", filepath.Base(o.Path), i+1, i, lines[i-1])
			}
		}
	}
}
