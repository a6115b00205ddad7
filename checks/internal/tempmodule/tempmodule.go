// Package tempmodule runs the outside checks that generate their
// minimizers into a temporary module instead of committing them: it
// writes the module's files, generates every minimizer of its spec with
// thalweg's gen package, and runs go test there.
package tempmodule

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/gen"
)

// GenerateAndTest writes files (name → contents) into a temporary
// directory, generates the minimizers of the spec among them, runs
// `go test -count=1 -v` with args there and returns its output; a
// failure of either step fails t with the lines that say what failed.
func GenerateAndTest(t *testing.T, files map[string][]byte, spec string, args ...string) []byte {
	t.Helper()
	dir := t.TempDir()
	for name, data := range files {
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	outs, err := gen.Generate([]string{filepath.Join(dir, spec)})
	if err != nil {
		t.Fatalf("thalweg's gen.Generate: %v", err)
	}
	for _, o := range outs {
		if err := os.WriteFile(o.Path, o.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	cmd := exec.Command("go", append([]string{"test", "-count=1", "-v"}, append(args, ".")...)...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go test in the generated module failed: %v\n%s", err, failures(out))
	}
	return out
}

// failures keeps the lines of go test's output that say what failed.
func failures(out []byte) string {
	var kept []string
	for _, line := range strings.Split(string(out), "\n") {
		if strings.Contains(line, "--- FAIL") || strings.Contains(line, "panic") || strings.HasPrefix(line, "#") || strings.Contains(line, ".go:") {
			kept = append(kept, line)
		}
	}
	return strings.Join(kept, "\n")
}
