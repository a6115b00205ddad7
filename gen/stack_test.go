package gen

import (
	"bufio"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// textLine matches the TEXT line the compiler's -S listing opens each
// function with: its symbol and $frame-args, the frame size in bytes.
var textLine = regexp.MustCompile(`\tTEXT\t([^\s(]+(?:\([^)]*\)[^\s(]*)?)\(SB\), [^$]*\$(\d+)-(\d+)`)

// callLine matches a direct call in the listing.
var callLine = regexp.MustCompile(`\tCALL\t([^\s(]+(?:\([^)]*\)[^\s(]*)?)\(SB\)`)

// frameListing is what -S shows of a package: each function's frame size
// and the functions it calls directly.
type frameListing struct {
	frame map[string]int
	calls map[string][]string
}

// listFrames compiles the package in dir for goarch with -gcflags=-S and
// reads the frame sizes and direct calls of pkg's functions.
func listFrames(t *testing.T, dir, goarch, pkg string) *frameListing {
	t.Helper()
	cmd := exec.Command("go", "build", "-gcflags=-S", ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOOS=linux", "GOARCH="+goarch, "GOFLAGS=-mod=mod", "GOWORK=off", "GOTOOLCHAIN=local")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("GOARCH=%s go build -gcflags=-S: %v\n%.2000s", goarch, err, out)
	}
	l := &frameListing{frame: map[string]int{}, calls: map[string][]string{}}
	current := ""
	sc := bufio.NewScanner(strings.NewReader(string(out)))
	sc.Buffer(make([]byte, 1<<20), 1<<20)
	for sc.Scan() {
		line := sc.Text()
		if m := textLine.FindStringSubmatch(line); m != nil {
			current = strings.TrimPrefix(m[1], pkg+".")
			l.frame[current], _ = strconv.Atoi(m[2])
			continue
		}
		if m := callLine.FindStringSubmatch(line); m != nil && current != "" && strings.HasPrefix(m[1], pkg+".") {
			l.calls[current] = append(l.calls[current], strings.TrimPrefix(m[1], pkg+"."))
		}
	}
	return l
}

// deepest is the most stack the calls from fn can use: its frame plus a
// return address, plus the deepest of its callees that keep reports true,
// and the chain that reaches it.
func (l *frameListing) deepest(fn string, keep func(string) bool, ptr int, onPath map[string]bool) (int, []string) {
	if onPath[fn] {
		return 0, nil // no recursion in generated code; guard anyway
	}
	onPath[fn] = true
	defer delete(onPath, fn)
	best, chain := 0, []string(nil)
	for _, c := range l.calls[fn] {
		if !keep(c) {
			continue
		}
		if d, ch := l.deepest(c, keep, ptr, onPath); d > best {
			best, chain = d, ch
		}
	}
	return l.frame[fn] + ptr + best, append([]string{fn}, chain...)
}

// stackModule writes a module whose objectives take each argument form
// (scalar, array, pointer to array, slice) at several dimensions, and a
// spec with a minimizer for every direction and derivative source, some
// bounded, float32 and float64 alternating, and returns the spec's path.
func stackModule(t *testing.T, root string) string {
	t.Helper()
	var src, spec strings.Builder
	src.WriteString("package probe\n\n")
	n := 0
	for _, dim := range []int{1, 3, 24, 64} {
		for di, direction := range []string{"steepest", "bfgs", "lbfgs", "cg"} {
			for si, source := range []string{"analytic", "forward", "central"} {
				elem := "float64"
				if (di+si+dim)%2 == 1 {
					elem = "float32"
				}
				n++
				obj, grad := fmt.Sprintf("Obj%d", n), fmt.Sprintf("Obj%dGrad", n)
				form := (n + dim) % 3
				switch {
				case dim == 1:
					fmt.Fprintf(&src, "func %s(x %s) %s { return (x - 1) * (x - 1) }\n", obj, elem, elem)
					fmt.Fprintf(&src, "func %s(x %s) %s { return 2 * (x - 1) }\n", grad, elem, elem)
				case form == 0:
					fmt.Fprintf(&src, "func %s(x *[%d]%s) (s %s) {\n\tfor i, v := range x {\n\t\ts += %s(i+1) * (v - 1) * (v - 1)\n\t}\n\treturn s\n}\n", obj, dim, elem, elem, elem)
					fmt.Fprintf(&src, "func %s(x, g *[%d]%s) {\n\tfor i, v := range x {\n\t\tg[i] = 2 * %s(i+1) * (v - 1)\n\t}\n}\n", grad, dim, elem, elem)
				case form == 1:
					fmt.Fprintf(&src, "func %s(x [%d]%s) (s %s) {\n\tfor i, v := range x {\n\t\ts += %s(i+1) * (v - 1) * (v - 1)\n\t}\n\treturn s\n}\n", obj, dim, elem, elem, elem)
					fmt.Fprintf(&src, "func %s(x [%d]%s) (g [%d]%s) {\n\tfor i, v := range x {\n\t\tg[i] = 2 * %s(i+1) * (v - 1)\n\t}\n\treturn g\n}\n", grad, dim, elem, dim, elem, elem)
				default:
					fmt.Fprintf(&src, "func %s(x []%s) (s %s) {\n\tfor i, v := range x {\n\t\ts += %s(i+1) * (v - 1) * (v - 1)\n\t}\n\treturn s\n}\n", obj, elem, elem, elem)
					fmt.Fprintf(&src, "func %s(x, g []%s) {\n\tfor i, v := range x {\n\t\tg[i] = 2 * %s(i+1) * (v - 1)\n\t}\n}\n", grad, elem, elem)
				}
				fmt.Fprintf(&spec, "[[minimizer]]\nname = \"M%d\"\nobjective = %q\nderivative = %q\ndirection = %q\n", n, obj, source, direction)
				if source == "analytic" {
					fmt.Fprintf(&spec, "gradient = %q\n", grad)
				}
				if direction == "lbfgs" && dim == 64 {
					spec.WriteString("memory = 12\n")
				}
				if dim > 1 && form == 2 {
					fmt.Fprintf(&spec, "dim = %d\n", dim)
				}
				start := "0.0"
				if dim > 1 {
					start = "[" + strings.Repeat("0.0, ", dim-1) + "0.0]"
				}
				fmt.Fprintf(&spec, "start = %s\n", start)
				if direction != "cg" && n%2 == 0 {
					lower, upper := "-2.0", "3.0"
					if dim > 1 {
						lower = "[" + strings.Repeat("-2.0, ", dim-1) + "-2.0]"
						upper = "[" + strings.Repeat("3.0, ", dim-1) + "3.0]"
					}
					fmt.Fprintf(&spec, "[minimizer.bounds]\nlower = %s\nupper = %s\n", lower, upper)
				}
				switch {
				case direction != "cg" && n%3 == 0:
					spec.WriteString("[minimizer.step]\nrule = \"armijo\"\n")
				case direction == "steepest" && n%3 == 1:
					spec.WriteString("[minimizer.step]\nrule = \"wolfe\"\n")
				}
				spec.WriteString("\n")
			}
		}
	}
	// Residual objectives: the least-squares directions with every
	// Jacobian source, few and many residuals, some bounded.
	for _, dim := range []int{2, 8} {
		for _, m := range []int{5, 60} {
			for di, direction := range []string{"gauss-newton", "levenberg-marquardt"} {
				for si, source := range []string{"analytic", "columns", "forward", "central"} {
					elem := "float64"
					if (di+si+m)%2 == 1 {
						elem = "float32"
					}
					n++
					obj, jac := fmt.Sprintf("Res%d", n), fmt.Sprintf("Res%dJacobian", n)
					fmt.Fprintf(&src, "func %s(x *[%d]%s, r *[%d]%s) {\n\tfor i := range r {\n\t\tr[i] = x[i%%%d] - %s(i)\n\t}\n}\n", obj, dim, elem, m, elem, dim, elem)
					if source == "columns" {
						fmt.Fprintf(&src, "func %s(x *[%d]%s, j *[%d][%d]%s) {\n\tfor i := range j[0] {\n\t\tj[i%%%d][i] = 1\n\t}\n}\n", jac, dim, elem, dim, m, elem, dim)
					} else {
						fmt.Fprintf(&src, "func %s(x *[%d]%s, j *[%d][%d]%s) {\n\tfor i := range j {\n\t\tj[i][i%%%d] = 1\n\t}\n}\n", jac, dim, elem, m, dim, elem, dim)
					}
					fmt.Fprintf(&spec, "[[minimizer]]\nname = \"M%d\"\nobjective = %q\ndirection = %q\n", n, obj, direction)
					if source == "analytic" || source == "columns" {
						fmt.Fprintf(&spec, "derivative = \"analytic\"\njacobian = %q\n", jac)
					} else {
						fmt.Fprintf(&spec, "derivative = %q\n", source)
					}
					fmt.Fprintf(&spec, "start = [%s0.5]\n", strings.Repeat("0.5, ", dim-1))
					if n%2 == 0 {
						fmt.Fprintf(&spec, "[minimizer.bounds]\nlower = [%s-2.0]\nupper = [%s90.0]\n", strings.Repeat("-2.0, ", dim-1), strings.Repeat("90.0, ", dim-1))
					}
					spec.WriteString("\n")
				}
			}
		}
	}
	files := map[string]string{"go.mod": "module probe\n\ngo 1.24\n", "probe.go": src.String(), "probe.toml": spec.String()}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(root, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(root, "probe.toml")
}

// stackEntries are the entry points whose stack the doc comments state,
// by the figure that covers them.
func stackEntries(name string) map[string][]string {
	return map[string][]string{
		"run":     {name, name + "WithLimits"},
		"advance": {"(*" + name + "Solver).Advance"},
		"start":   {"(*" + name + "Solver).Start", "(*" + name + "Solver).StartFrom", "(*" + name + "Solver).SetLimits", "(*" + name + "Solver).Forget"},
	}
}

// TestStackFigures checks the stack figures the solver's doc comment
// states (Plan.stack) against the compiler's own: it generates a
// minimizer for every direction and derivative source at 1 to 64
// unknowns, bounded or not, float32 and float64, compiles them with
// -gcflags=-S for amd64 and arm64 (cross-compiling needs no emulation),
// reads each function's frame size from the $frame-args of its TEXT line
// and its direct calls, and sums frame plus return address over the
// deepest chain of generated functions from each entry point. Every
// stated figure must bound the measurement, and by no more than twice it
// plus 256 bytes, so that a figure grown careless fails too.
func TestStackFigures(t *testing.T) {
	if testing.Short() {
		t.Skip("compiles 48 minimizers twice; skipped with -short")
	}
	root := t.TempDir()
	spec := stackModule(t, root)
	plans, err := Plans([]string{spec})
	if err != nil {
		t.Fatal(err)
	}
	outs, err := Generate([]string{spec})
	if err != nil {
		t.Fatal(err)
	}
	if err := Write(outs); err != nil {
		t.Fatal(err)
	}
	for _, arch := range []string{"amd64", "arm64"} {
		l := listFrames(t, root, arch, "probe")
		for _, p := range plans {
			keep := func(c string) bool {
				c = strings.TrimPrefix(c, "(*")
				return strings.HasPrefix(c, p.M.Name) || strings.HasPrefix(c, p.Prefix)
			}
			stated := p.stack()
			for what, want := range map[string]int{"run": stated.run, "advance": stated.advance, "start": stated.start} {
				most, deepest := 0, ""
				for _, e := range stackEntries(p.M.Name)[what] {
					if _, ok := l.frame[e]; !ok {
						t.Fatalf("%s: no TEXT line for %s in the listing", arch, e)
					}
					if got, chain := l.deepest(e, keep, 8, map[string]bool{}); got > most {
						most, deepest = got, strings.Join(chain, " → ")
					}
				}
				if most > want || want > 2*most+256 {
					t.Errorf("%s %s (%s, %s, %s, %d×%s, %d residuals, bounded %v): %s measured %d bytes (%s), stated %d",
						arch, p.M.Name, p.Direction.Name, p.Derivative.Name, p.Rule.Name, p.Dim, p.Elem, p.Shape.Residuals, p.Bounded, what, most, deepest, want)
				}
			}
		}
	}
}
