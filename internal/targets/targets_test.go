package targets

import (
	"path/filepath"
	"regexp"
	"testing"
)

// TestExamplesOnEveryTarget runs the committed examples' generated tests
// on every emulated target and with fused multiply-adds on amd64: the
// examples are what a new user copies, so they must pass on the device.
func TestExamplesOnEveryTarget(t *testing.T) {
	if testing.Short() {
		t.Skip("cross-compiles and emulates seven targets; skipped with -short")
	}
	root, err := filepath.Abs("../..")
	if err != nil {
		t.Fatal(err)
	}
	if err := Track(filepath.Join(root, "examples"), filepath.Join(root, "templates")); err != nil {
		t.Fatal(err)
	}
	for _, target := range append([]Target{Fused}, All...) {
		t.Run(target.Name, func(t *testing.T) {
			out, err := target.Test(root, "-count=1", "./examples/...")
			if err != nil {
				t.Fatalf("%v\n%s", err, out)
			}
			if !regexp.MustCompile(`(?m)^ok\s+\S+/examples/`).MatchString(out) {
				t.Fatalf("no example package reported ok:\n%s", out)
			}
			t.Logf("%s", out)
		})
	}
}
