package gen

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// refusedSource holds one objective per construct derivative =
// "automatic" refuses. Each case below names a marker, a piece of text
// found once in it, where the error must point.
const refusedSource = `package refused

import (
	"math"
	"strings"
)

func spin() {}

func Goroutine(x *[2]float64) float64 {
	go spin()
	return x[0] * x[0]
}

func Closure(x *[2]float64) float64 {
	sq := func(t float64) float64 { return t * t }
	return sq(x[0])
}

type shape interface{ area(float64) float64 }

var someShape shape

func Interface(x *[2]float64) float64 { return someShape.area(x[0]) }

var weights = map[int]float64{0: 1}

func Map(x *[2]float64) float64 { return weights[0] * x[0] * x[0] }

func Outside(x *[2]float64) float64 {
	return x[0] * float64(len(strings.Repeat("a", 2)))
}

var last float64

func PackageState(x *[2]float64) float64 {
	last = x[0]
	return x[0] * x[0]
}

type Cache struct{ v float64 }

func (c *Cache) Field(x *[2]float64) float64 {
	c.v = x[0]
	return x[0] * x[0]
}

func Unknowns(x *[2]float64) float64 {
	x[1] = 0
	return x[0] * x[0]
}

func Deferred(x *[2]float64) float64 {
	defer spin()
	return x[0] * x[0]
}

var results = make(chan float64, 1)

func Channel(x *[2]float64) float64 {
	results <- x[0]
	return x[0] * x[0]
}

var anything any = 1.0

func TypeSwitch(x *[2]float64) float64 {
	switch anything.(type) {
	case float64:
	}
	return x[0] * x[0]
}

func NoRule(x *[2]float64) float64 { return math.Gamma(x[0]) }

var scaled = func(t float64) float64 { return 2 * t }

func FuncValue(x *[2]float64) float64 { return scaled(x[0]) }

func Whole(x *[2]float64) float64 {
	y := *x
	return y[0] * y[1]
}

func fill(x *[2]float64, out *float64) { *out = x[0] }

func Fill(x *[2]float64) float64 {
	var o float64
	fill(x, &o)
	return o * o
}

func TwoResults(x *[2]float64) float64 {
	a, b := split(x[0])
	return a * b
}

func split(t float64) (float64, float64) { return t, t }

func ptr(t *float64) float64 { return *t }

func Pointer(x *[2]float64) float64 {
	v := x[0]
	return ptr(&v)
}

func Goto(x *[2]float64) float64 {
	v := x[0]
	goto done
done:
	return v * v
}

func Composite(x *[2]float64) float64 {
	pair := [2]float64{x[0], x[1]}
	return pair[0] * pair[1]
}

func first(v []float64) float64 { return v[0] * v[0] }

func Slice(x *[2]float64) float64 { return first(x[1:]) }

func total(v ...float64) float64 { return v[0] }

func Variadic(x *[2]float64) float64 { return total(x[0], x[1]) }

func Active(x *[2]float64, r *[2]float64) {
	var a, b [2]float64
	a[0], a[1] = x[0], x[1]
	b = a
	r[0], r[1] = b[0], b[1]
}
`

// refusals are the constructs automatic differentiation refuses: the
// objective, the marker the error points at, and what the message says.
var refusals = []struct {
	objective, marker string
	has               []string
}{
	{"Goroutine", "go spin()", []string{"a go statement (goroutines)"}},
	{"Closure", "func(t float64) float64 { return t * t }", []string{"a function literal (closures)"}},
	{"Interface", "someShape.area(x[0])", []string{"a method call through an interface"}},
	{"Map", "weights[0]", []string{"weights[0]: a map"}},
	{"Outside", "strings.Repeat", []string{"outside the package other than math"}},
	{"PackageState", "last = x[0]", []string{"a write to package state (last)"}},
	{"Cache.Field", "c.v = x[0]", []string{"a write to a struct field (c.v)"}},
	{"Unknowns", "x[1] = 0", []string{"a write to the unknowns x"}},
	{"Deferred", "defer spin()", []string{"a defer statement"}},
	{"Channel", "results <- x[0]", []string{"channel operations"}},
	{"TypeSwitch", "switch anything.(type)", []string{"a type switch (interfaces)"}},
	{"NoRule", "math.Gamma(x[0])", []string{"math.Gamma: no derivative rule", "supported: Exp"}},
	{"FuncValue", "scaled(x[0])", []string{"scaled: a call of a function value"}},
	{"Whole", "x\n", []string{"x used whole"}},
	{"Fill", "fill(x, &o)", []string{"a call whose result is not used"}},
	{"TwoResults", "a, b := split(x[0])", []string{"an assignment from a call with several results"}},
	{"Pointer", "&v", []string{"&v: an argument that depends on x and is not a float"}},
	{"Goto", "goto done", []string{"cannot differentiate goto"}},
	{"Composite", "pair := [2]float64", []string{"an assignment of a whole array that depends on x"}},
	{"Slice", "x[1:]", []string{"x[1:]: an argument that depends on x and is not a float"}},
	{"Variadic", "total(x[0], x[1])", []string{"total: a variadic call"}},
	{"Active", "b = a", []string{"an assignment of a whole array that depends on x; set its elements"}},
}

// TestAutomaticRefusals pins each refused construct's message and
// position, all reported in one run, and checks that nothing is written.
func TestAutomaticRefusals(t *testing.T) {
	dir := t.TempDir()
	for name, data := range map[string]string{"go.mod": "module refused\n\ngo 1.24\n", "obj.go": refusedSource} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	var spec strings.Builder
	for i, c := range refusals {
		start := "[1.0, 2.0]"
		fmt.Fprintf(&spec, "[[minimizer]]\nname = \"Refused%d\"\nobjective = %q\nderivative = \"automatic\"\nstart = %s\n", i, c.objective, start)
		if strings.HasPrefix(c.objective, "Cache.") {
			spec.WriteString("instance = \"NewCache\"\n")
		}
		spec.WriteString("\n")
	}
	// NewCache gives Cache.Field a receiver; the rest take none.
	if err := os.WriteFile(filepath.Join(dir, "cache.go"), []byte("package refused\n\nfunc NewCache() *Cache { return &Cache{} }\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	specPath := filepath.Join(dir, "refused.toml")
	if err := os.WriteFile(specPath, []byte(spec.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	before := dirListing(t, dir)
	_, err := Generate([]string{specPath})
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("Generate: %v, want problems", err)
	}
	goFile, _ := filepath.EvalSymlinks(filepath.Join(dir, "obj.go"))
	used := make([]bool, len(probs))
	for _, c := range refusals {
		t.Run(c.objective, func(t *testing.T) {
			at := strings.Index(refusedSource, c.marker)
			if at < 0 || strings.Count(refusedSource, c.marker) != 1 && c.marker != "x\n" {
				t.Fatalf("marker %q is not in the source once", c.marker)
			}
			switch c.objective {
			case "Whole": // the x of y := *x
				at = strings.Index(refusedSource, "y := *x") + len("y := *")
			}
			line := strings.Count(refusedSource[:at], "\n") + 1
			col := at - strings.LastIndex(refusedSource[:at], "\n")
			want := append([]string{"derivative = \"automatic\" cannot differentiate", "use derivative = \"central\""}, c.has...)
			for j, p := range probs {
				file, _ := filepath.EvalSymlinks(p.Pos.File)
				if !used[j] && file == goFile && p.Pos.Line == line && p.Pos.Col == col && hasAll(p.Msg, want) {
					used[j] = true
					return
				}
			}
			t.Errorf("no problem at obj.go:%d:%d containing %q; got:\n%v", line, col, want, err)
		})
	}
	for j, p := range probs {
		if !used[j] {
			t.Errorf("unexpected problem: %s", p.Error())
		}
	}
	if after := dirListing(t, dir); after != before {
		t.Errorf("a refused spec wrote into the package:\nbefore %s\nafter  %s", before, after)
	}
}
