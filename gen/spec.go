package gen

import (
	"bytes"
	"errors"
	"fmt"
	"go/token"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"

	toml "github.com/pelletier/go-toml/v2"

	"github.com/thalweg-go/thalweg/rules"
)

// specFile is the TOML document as decoded; pointers tell a key that was
// left out from one set to zero.
type specFile struct {
	Package   *string         `toml:"package"`
	Minimizer []minimizerSpec `toml:"minimizer"`
}

type minimizerSpec struct {
	Name       string      `toml:"name"`
	Objective  string      `toml:"objective"`
	Derivative *string     `toml:"derivative"`
	Gradient   *string     `toml:"gradient"`
	Direction  *string     `toml:"direction"`
	Memory     *int64      `toml:"memory"`
	Start      any         `toml:"start"`
	Dim        *int64      `toml:"dim"`
	Instance   *string     `toml:"instance"`
	Output     *string     `toml:"output"`
	Step       stepSpec    `toml:"step"`
	Stop       stopSpec    `toml:"stop"`
	Bounds     *boundsSpec `toml:"bounds"`
	Expect     *expectSpec `toml:"expect"`
}

type stepSpec struct {
	Rule        *string  `toml:"rule"`
	Initial     *float64 `toml:"initial"`
	Shrink      *float64 `toml:"shrink"`
	Decrease    *float64 `toml:"decrease"`
	Trials      *int64   `toml:"trials"`
	Curvature   *float64 `toml:"curvature"`
	Interpolate *bool    `toml:"interpolate"`
}

type stopSpec struct {
	Gradient    *float64 `toml:"gradient"`
	Step        *float64 `toml:"step"`
	Iterations  *int64   `toml:"iterations"`
	Evaluations *int64   `toml:"evaluations"`
}

type boundsSpec struct {
	Lower any `toml:"lower"`
	Upper any `toml:"upper"`
}

type expectSpec struct {
	X         any      `toml:"x"`
	Tolerance *float64 `toml:"tolerance"`
	Status    *string  `toml:"status"`
}

// Spec is one parsed spec file: where it is, which package directory it
// names and its minimizers, each with every default filled in.
type Spec struct {
	Path       string // as the user named it
	PackageDir string // the Go package directory
	Minimizers []*Minimizer
	pos        *positions
}

// Minimizer is one [[minimizer]] entry after validation. Fields that need
// the objective's shape to check (start, dim, expect) are kept raw.
type Minimizer struct {
	Index       int
	Name        string
	Objective   string
	Derivative  string
	Gradient    string
	Direction   string
	Memory      int
	Dim         int // 0 when the spec leaves it out
	Instance    string
	Output      string // file name beside the objective
	Rule        string
	Initial     float64
	Shrink      float64
	Decrease    float64
	Trials      int
	Curvature   float64
	Interpolate bool
	Stop        StopLimits
	stopSet     map[string]bool // stop keys given in the spec; the rest default by element type
	Expect      *Expect
	Start       []float64 // set once the objective's shape is known

	start     any
	expectX   any
	keyPrefix string // "minimizer.N"
}

// StopLimits are a minimizer's default stop limits.
type StopLimits struct {
	Gradient, Step          float64
	Iterations, Evaluations int
}

// Expect is what the generated test asserts about the run from start: the
// minimizer X (when given) within Tolerance, and the final status (when
// given; otherwise any converged one).
type Expect struct {
	X         []float64
	Tolerance float64
	Status    *statusInfo
}

// ParseSpec reads and validates a spec file. Errors carry the spec's
// positions; all errors of the file are reported together. When the file
// decodes, the spec is returned beside its Problems, as far as it is valid.
func ParseSpec(path string) (*Spec, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, Problems{{Pos{path, 1, 1}, err.Error()}}.Err()
	}
	return parseSpecData(path, data)
}

func parseSpecData(path string, data []byte) (*Spec, error) {
	var probs Problems
	var doc specFile
	ix := indexPositions(path, data)
	dec := toml.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&doc); err != nil {
		var strict *toml.StrictMissingError
		var decode *toml.DecodeError
		switch {
		case errors.As(err, &strict):
			for _, e := range strict.Errors {
				line, col := e.Position()
				pos := Pos{path, line, col}
				key := strings.Join(e.Key(), ".")
				if ix != nil {
					if full, ok := ix.pathAt(pos); ok {
						key = full
					}
				}
				probs.add(pos, "unknown key %q", key)
			}
		case errors.As(err, &decode):
			line, col := decode.Position()
			return nil, Problems{{Pos{path, line, col}, decodeMessage(decode)}}.Err()
		default:
			return nil, Problems{{Pos{path, 1, 1}, err.Error()}}.Err()
		}
	}
	if ix == nil { // cannot happen after a successful decode; keep errors positioned anyway
		ix = &positions{file: path, keys: map[string]Pos{}, values: map[string]Pos{}, tables: map[string]Pos{}}
	}
	if pos, ok := ix.tables["minimizer"]; ok {
		return nil, Problems{{pos, "write [[minimizer]], an array of tables, not [minimizer]"}}.Err()
	}
	spec := &Spec{Path: path, pos: ix}
	dir := filepath.Dir(path)
	spec.PackageDir = dir
	if doc.Package != nil {
		pkg := *doc.Package
		if pkg == "" || filepath.IsAbs(pkg) {
			probs.add(ix.value("package"), "package must be a directory relative to the spec file, got %q", pkg)
		} else {
			spec.PackageDir = filepath.Join(dir, filepath.FromSlash(pkg))
		}
	}
	if len(doc.Minimizer) == 0 {
		probs.add(Pos{path, 1, 1}, "no [[minimizer]] table: a spec names at least one minimizer")
	}
	names := map[string]bool{}
	outputs := map[string]string{}
	for i := range doc.Minimizer {
		m := validateMinimizer(&doc.Minimizer[i], i, ix, &probs)
		if m.Name != "" {
			if names[m.Name] {
				probs.add(ix.value(m.keyPrefix+".name"), "minimizer %s is named twice in this spec", m.Name)
			}
			names[m.Name] = true
		}
		if other, ok := outputs[m.Output]; ok && m.Output != "" {
			probs.add(ix.value(m.keyPrefix+".output"), "minimizers %s and %s would both write %s", other, m.Name, m.Output)
		}
		outputs[m.Output] = m.Name
		spec.Minimizers = append(spec.Minimizers, m)
	}
	return spec, probs.Err()
}

var decodeTypePattern = regexp.MustCompile(`cannot decode TOML (\w+) into .* of type (\S+)$`)

// decodeMessage rewrites go-toml's type-mismatch message, which names
// thalweg's Go fields, in the spec's terms.
func decodeMessage(e *toml.DecodeError) string {
	msg := strings.TrimPrefix(e.Error(), "toml: ")
	m := decodeTypePattern.FindStringSubmatch(msg)
	if m == nil || len(e.Key()) == 0 {
		return msg
	}
	want := map[string]string{"float64": "a number", "int64": "a whole number", "string": "a string", "bool": "true or false"}[m[2]]
	if want == "" {
		want = "a " + m[2]
	}
	key := e.Key()
	if key[0] == "minimizer" {
		key = key[1:]
	}
	return fmt.Sprintf("%s must be %s, not a TOML %s", strings.Join(key, "."), want, m[1])
}

// validateMinimizer checks everything about one entry that does not need
// the objective's shape, and fills in defaults from the rules tables.
func validateMinimizer(ms *minimizerSpec, i int, ix *positions, probs *Problems) *Minimizer {
	key := fmt.Sprintf("minimizer.%d", i)
	at := func(k string) Pos { return ix.value(key + "." + k) }
	m := &Minimizer{Index: i, keyPrefix: key, Name: ms.Name, Objective: ms.Objective, start: ms.Start, stopSet: map[string]bool{}}

	switch {
	case ms.Name == "" && ix.keys[key+".name"] != (Pos{}):
		probs.add(at("name"), "name must not be empty: it is the exported Go name of the minimizer")
	case ms.Name == "":
		probs.add(ix.key(key), "name is required: the exported Go name of the minimizer")
	case !token.IsIdentifier(ms.Name) || !token.IsExported(ms.Name):
		probs.add(at("name"), "name %q is not an exported Go identifier", ms.Name)
	}
	switch {
	case ms.Objective == "" && ix.keys[key+".objective"] != (Pos{}):
		probs.add(at("objective"), "objective must not be empty: \"Func\" or \"Type.Method\" in the package")
	case ms.Objective == "":
		probs.add(ix.key(key), "objective is required: \"Func\" or \"Type.Method\" in the package")
	case !validReference(ms.Objective):
		probs.add(at("objective"), "objective %q is not \"Func\" or \"Type.Method\"", ms.Objective)
	}

	m.Derivative = choose(ms.Derivative, rules.DefaultDerivative, rules.Derivatives(), "derivative", at, probs)
	m.Direction = choose(ms.Direction, rules.DefaultDirection, rules.Directions(), "direction", at, probs)
	m.Rule = choose(ms.Step.Rule, rules.DefaultStepRule, rules.StepRules(), "step.rule", at, probs)

	if ms.Gradient != nil {
		m.Gradient = *ms.Gradient
	}
	switch {
	case m.Derivative == "":
		// unknown derivative, already reported
	case m.Derivative == "analytic" && ms.Gradient == nil:
		probs.add(at("derivative"), "derivative = \"analytic\" needs a gradient key naming the gradient function")
	case m.Derivative != "analytic" && ms.Gradient != nil:
		probs.add(ix.key(key+".gradient"), "gradient is only used with derivative = \"analytic\" (derivative is %q)", m.Derivative)
	case ms.Gradient != nil && !validReference(m.Gradient):
		probs.add(at("gradient"), "gradient %q is not \"Func\" or \"Type.Method\"", m.Gradient)
	}

	m.Memory = int(rules.Memory.Default)
	if ms.Memory != nil {
		if m.Direction == "" {
			// unknown direction, already reported
		} else if m.Direction != "lbfgs" {
			probs.add(ix.key(key+".memory"), "memory is only used with direction = \"lbfgs\" (direction is %q)", m.Direction)
		} else if checkParam(rules.Memory, float64(*ms.Memory), key+".memory", ix, probs) {
			m.Memory = int(*ms.Memory)
		}
	}
	if ms.Dim != nil {
		if *ms.Dim < 1 || *ms.Dim > 1<<16 {
			probs.add(at("dim"), "dim must be between 1 and 65536, got %d", *ms.Dim)
		} else {
			m.Dim = int(*ms.Dim)
		}
	}
	if ms.Instance != nil {
		m.Instance = *ms.Instance
		if !validReference(m.Instance) || strings.Contains(m.Instance, ".") {
			probs.add(at("instance"), "instance %q is not the name of a package-level variable or function", m.Instance)
		}
	}
	m.Output = snakeCase(ms.Name) + "_min.go"
	if ms.Output != nil {
		m.Output = *ms.Output
		switch {
		case m.Output != filepath.Base(m.Output) || strings.ContainsAny(m.Output, `/\`):
			probs.add(at("output"), "output %q must be a file name in the objective's package directory, without folders", m.Output)
		case !strings.HasSuffix(m.Output, ".go") || strings.HasSuffix(m.Output, "_test.go"):
			probs.add(at("output"), "output %q must end in .go and not in _test.go", m.Output)
		case strings.HasPrefix(m.Output, "_") || strings.HasPrefix(m.Output, "."):
			probs.add(at("output"), "output %q starts with %q: the go tool ignores such files", m.Output, m.Output[:1])
		case buildConstrained(m.Output):
			probs.add(at("output"), "output %q ends in a GOOS or GOARCH suffix: the go tool would build it only there", m.Output)
		}
	}

	m.Stop, m.Trials = validateStep(ms, m, key, ix, probs)
	if ms.Bounds != nil {
		probs.add(ix.key(key+".bounds"), "[minimizer.bounds] is not supported yet")
	}
	if ms.Expect != nil {
		m.expectX = ms.Expect.X
		m.Expect = &Expect{Tolerance: 1e-6}
		if ms.Expect.X == nil && ms.Expect.Status == nil {
			probs.add(ix.key(key+".expect"), "expect needs x, the expected minimizer, or status, the expected end")
		}
		if ms.Expect.Status != nil {
			for i := range statuses {
				if statuses[i].text == *ms.Expect.Status {
					m.Expect.Status = &statuses[i]
				}
			}
			if m.Expect.Status == nil {
				var texts []string
				for _, s := range statuses {
					texts = append(texts, s.text)
				}
				probs.add(at("expect.status"), "expect.status %q is not one of %s", *ms.Expect.Status, quoteList(texts))
			}
		}
		if ms.Expect.Tolerance != nil {
			t := *ms.Expect.Tolerance
			if !(t > 0) || math.IsInf(t, 1) {
				probs.add(at("expect.tolerance"), "expect.tolerance must be a positive number, got %v", t)
			}
			m.Expect.Tolerance = t
		}
	}
	if ms.Start == nil {
		probs.add(ix.key(key), "start is required: a typical starting point")
	}
	return m
}

// validateStep checks [minimizer.step] and [minimizer.stop] against the
// parameters the chosen rule reads.
func validateStep(ms *minimizerSpec, m *Minimizer, key string, ix *positions, probs *Problems) (StopLimits, int) {
	rule, _ := rules.Lookup(rules.StepRules(), m.Rule)
	param := func(p rules.Param, given *float64, out *float64) {
		*out = p.Default
		if given == nil {
			return
		}
		k := key + ".step." + p.Key
		if _, used := rule.Param(p.Key); !used && rule.Name != "" {
			probs.add(ix.key(k), "step.%s is not used by rule %q", p.Key, rule.Name)
			return
		}
		if checkParam(p, *given, k, ix, probs) {
			*out = *given
		}
	}
	param(rules.Initial, ms.Step.Initial, &m.Initial)
	param(rules.Shrink, ms.Step.Shrink, &m.Shrink)
	param(rules.Decrease, ms.Step.Decrease, &m.Decrease)
	c2 := rules.Curvature
	c2.Default = rules.CurvatureDefault(m.Direction)
	param(c2, ms.Step.Curvature, &m.Curvature)
	var trials float64
	param(rules.Trials, int64Ptr(ms.Step.Trials), &trials)
	if ms.Step.Interpolate != nil {
		if _, used := rule.Param("interpolate"); !used && rule.Name != "" {
			probs.add(ix.key(key+".step.interpolate"), "step.interpolate is not used by rule %q", rule.Name)
		} else {
			m.Interpolate = *ms.Step.Interpolate
		}
	}
	if _, wolfe := rule.Param("curvature"); wolfe && !(m.Curvature > m.Decrease) {
		if ms.Step.Curvature != nil {
			probs.add(ix.value(key+".step.curvature"), "step.curvature (c2 = %v) must exceed step.decrease (c1 = %v)", m.Curvature, m.Decrease)
		} else {
			probs.add(ix.value(key+".step.decrease"), "step.decrease (c1 = %v) must be below the curvature constant c2 = %v, the default for direction %q; lower decrease or set step.curvature", m.Decrease, m.Curvature, m.Direction)
		}
	}

	var stop StopLimits
	var iterations, evaluations float64
	limit := func(p rules.Param, given *float64, out *float64) {
		*out = p.Default
		if given != nil {
			m.stopSet[p.Key] = true
			if checkParam(p, *given, key+".stop."+p.Key, ix, probs) {
				*out = *given
			}
		}
	}
	limit(rules.StopGradient, ms.Stop.Gradient, &stop.Gradient)
	limit(rules.StopStep, ms.Stop.Step, &stop.Step)
	limit(rules.StopIterations, int64Ptr(ms.Stop.Iterations), &iterations)
	limit(rules.StopEvaluations, int64Ptr(ms.Stop.Evaluations), &evaluations)
	stop.Iterations, stop.Evaluations = int(iterations), int(evaluations)
	return stop, int(trials)
}

func int64Ptr(v *int64) *float64 {
	if v == nil {
		return nil
	}
	f := float64(*v)
	return &f
}

// checkParam reports a value outside its parameter's range.
func checkParam(p rules.Param, v float64, key string, ix *positions, probs *Problems) bool {
	if p.Contains(v) {
		return true
	}
	name := strings.SplitN(key, ".", 3)[2]
	probs.add(ix.value(key), "%s must be in %s, got %v", name, p.Range(), v)
	return false
}

// choose validates an enumerated key against a rules list.
func choose(given *string, def string, list []rules.Entry, key string, at func(string) Pos, probs *Problems) string {
	if given == nil {
		return def
	}
	if _, ok := rules.Lookup(list, *given); !ok {
		probs.add(at(key), "%s %q is not one of %s", key, *given, quoteList(rules.Names(list)))
		return ""
	}
	return *given
}

func quoteList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	return strings.Join(q, ", ")
}

// validReference accepts "Name" or "Type.Name" of Go identifiers.
func validReference(s string) bool {
	parts := strings.Split(s, ".")
	if len(parts) > 2 {
		return false
	}
	for _, p := range parts {
		if !token.IsIdentifier(p) {
			return false
		}
	}
	return true
}

// snakeCase turns FitCurve into fit_curve and URLFit into url_fit.
func snakeCase(name string) string {
	var b strings.Builder
	runes := []rune(name)
	for i, r := range runes {
		upper := r >= 'A' && r <= 'Z'
		if upper && i > 0 {
			prevLower := runes[i-1] >= 'a' && runes[i-1] <= 'z' || runes[i-1] >= '0' && runes[i-1] <= '9'
			nextLower := i+1 < len(runes) && runes[i+1] >= 'a' && runes[i+1] <= 'z'
			if prevLower || nextLower {
				b.WriteByte('_')
			}
		}
		if upper {
			r += 'a' - 'A'
		}
		b.WriteRune(r)
	}
	return b.String()
}

// numbers reads a TOML number or array of numbers; scalar reports which.
func numbers(v any) (vals []float64, scalar, ok bool) {
	switch x := v.(type) {
	case int64:
		return []float64{float64(x)}, true, true
	case float64:
		return []float64{x}, true, true
	case []any:
		for _, e := range x {
			n, s, ok := numbers(e)
			if !ok || !s {
				return nil, false, false
			}
			vals = append(vals, n[0])
		}
		return vals, false, true
	}
	return nil, false, false
}

// buildConstrained reports whether a file name ends in _GOOS, _GOARCH or
// _GOOS_GOARCH, which the go tool treats as a build constraint.
func buildConstrained(name string) bool {
	parts := strings.Split(strings.TrimSuffix(name, ".go"), "_")
	n := len(parts)
	if n >= 2 && (knownOS[parts[n-1]] || knownArch[parts[n-1]]) {
		return true
	}
	return n >= 3 && knownOS[parts[n-2]] && knownArch[parts[n-1]]
}

// The GOOS and GOARCH values the go tool knows (go/build's syslist).
var knownOS = setOf("aix android darwin dragonfly freebsd hurd illumos ios js linux nacl netbsd openbsd plan9 solaris wasip1 windows zos")
var knownArch = setOf("386 amd64 amd64p32 arm armbe arm64 arm64be loong64 mips mipsle mips64 mips64le mips64p32 mips64p32le ppc ppc64 ppc64le riscv riscv64 s390 s390x sparc sparc64 wasm")

func setOf(words string) map[string]bool {
	m := map[string]bool{}
	for _, w := range strings.Fields(words) {
		m[w] = true
	}
	return m
}
