package bench

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/gen"
)

var sizes = flag.Bool("sizes", false, "build the Rosenbrock 2-D bfgs minimizers for linux/arm (GOARM=7) and print their code size (TestCompiledSize)")

// sizeRules are the step rules whose bfgs minimizer TestCompiledSize
// measures: armijo, and wolfe, bfgs's default.
var sizeRules = []string{"armijo", "wolfe"}

// TestCompiledSize builds, for linux/arm with GOARM=7 (a Cortex-A class
// device), a program calling the generated bfgs minimizer of Rosenbrock
// 2-D with each rule of sizeRules, and prints the code the minimizer adds:
// the sizes of the text symbols that go tool nm -size lists under the
// minimizer's names (its exported API and its prefixed kernels).
//
//	go -C bench test -run TestCompiledSize -sizes -v
func TestCompiledSize(t *testing.T) {
	if !*sizes {
		t.Skip("the sizes are measured with -sizes")
	}
	dir := t.TempDir()
	var spec, calls strings.Builder
	for _, rule := range sizeRules {
		name := "Size" + strings.ToUpper(rule[:1]) + rule[1:]
		fmt.Fprintf(&spec, "[[minimizer]]\nname = %q\nobjective = \"Rosen2\"\nderivative = \"analytic\"\ngradient = \"Rosen2Grad\"\ndirection = \"bfgs\"\nstart = [-1.2, 1.0]\n[minimizer.step]\nrule = %q\n\n", name, rule)
		fmt.Fprintf(&calls, "\tsink += bench.%s([2]float64{-1.2, 1}).F\n", name)
	}
	files := map[string]string{
		"go.mod":      "module example.com/size\n\ngo 1.26\n",
		"problems.go": problemsSource(),
		"size.toml":   spec.String(),
		"cmd/main.go": "package main\n\nimport bench \"example.com/size\"\n\nvar sink float64\n\nfunc main() {\n" + calls.String() + "\tprintln(sink)\n}\n",
	}
	for name, data := range files {
		path := filepath.Join(dir, name)
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	outs, err := gen.Generate([]string{filepath.Join(dir, "size.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range outs {
		if err := os.WriteFile(o.Path, o.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	bin := filepath.Join(dir, "size.bin")
	build := exec.Command("go", "build", "-o", bin, "./cmd")
	build.Dir = dir
	build.Env = append(os.Environ(), "GOOS=linux", "GOARCH=arm", "GOARM=7", "GOWORK=off", "CGO_ENABLED=0")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	out, err := exec.Command("go", "tool", "nm", "-size", bin).Output()
	if err != nil {
		t.Fatalf("go tool nm: %v", err)
	}
	var b strings.Builder
	b.WriteString("\nCode size of the generated bfgs minimizer of Rosenbrock 2-D, linux/arm GOARM=7 (text symbols under the minimizer's names, go tool nm -size):\n\n| step rule | bytes | symbols |\n|---|---:|---:|\n")
	for _, rule := range sizeRules {
		name := "Size" + strings.ToUpper(rule[:1]) + rule[1:]
		total, count := minimizerText(out, name)
		if count == 0 {
			t.Fatalf("%s: no symbol in the binary", name)
		}
		fmt.Fprintf(&b, "| %s | %d | %d |\n", rule, total, count)
	}
	t.Log(b.String())
	fmt.Print(b.String())
}

// minimizerText sums the sizes of the text symbols of package
// example.com/size that belong to minimizer name: its exported API
// (name, nameSolver, …) and its kernels (gen.MinimizerPrefix(name)…).
func minimizerText(nm []byte, name string) (total, count int) {
	prefix := gen.MinimizerPrefix(name)
	for _, line := range strings.Split(string(nm), "\n") {
		f := strings.Fields(line)
		if len(f) < 4 || (f[2] != "T" && f[2] != "t") {
			continue
		}
		sym, ok := strings.CutPrefix(f[3], "example.com/size.")
		if !ok {
			continue
		}
		sym = strings.TrimPrefix(strings.TrimPrefix(sym, "(*"), "(")
		if !strings.HasPrefix(sym, name) && !strings.HasPrefix(sym, prefix) {
			continue
		}
		n, err := strconv.Atoi(f[1])
		if err != nil {
			continue
		}
		total += n
		count++
	}
	return total, count
}
