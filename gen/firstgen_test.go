package gen

import (
	"path/filepath"
	"strings"
	"testing"
)

// A package may call its minimizer, and name its result and status types,
// before the first generation: gen ignores "undefined" errors about names
// that begin with a minimizer's name, and only those.
func TestFirstGenerationOfAPackageThatUsesIt(t *testing.T) {
	dir := t.TempDir()
	writeTestFile(t, filepath.Join(dir, "go.mod"), "module p\n\ngo 1.24\n")
	writeTestFile(t, filepath.Join(dir, "p.go"), `package p

func Bowl(x [2]float64) float64 { return x[0]*x[0] + x[1]*x[1] }

func Use() (FitBowlResult, bool) {
	r := FitBowl([2]float64{1, 1})
	return r, r.Status == FitBowlGradientSmall
}
`)
	spec := filepath.Join(dir, "p.toml")
	writeTestFile(t, spec, "[[minimizer]]\nname = \"FitBowl\"\nobjective = \"Bowl\"\nstart = [1.0, 2.0]\n")
	if _, err := Generate([]string{spec}); err != nil {
		t.Fatalf("generating for a package that already calls the minimizer: %v", err)
	}
	// Any other undefined name is still the user's error.
	writeTestFile(t, filepath.Join(dir, "q.go"), "package p\n\nfunc Other() float64 { return Missing() }\n")
	_, err := Generate([]string{spec})
	if err == nil || !strings.Contains(err.Error(), "q.go:3:31: undefined: Missing") {
		t.Errorf("an unrelated undefined name: %v, want it reported at q.go:3:31", err)
	}
}
