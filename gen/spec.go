package gen

import (
	"errors"
	"fmt"
	"go/token"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	toml "github.com/pelletier/go-toml/v2"

	"github.com/thalweg-go/thalweg/rules"
)

// Spec is one parsed spec file: where it is, which package directory it
// names and its minimizers.
type Spec struct {
	Path       string // as the user named it
	PackageDir string // the Go package directory
	Minimizers []*Minimizer
	pos        *positions
	problems   int // problems of the file as a whole, outside any minimizer
}

// Minimizer is one [[minimizer]] entry after validation: the structural
// keys, the chosen entries and the parameter values the spec sets. Fields
// that need the objective's shape to check (start, dim, expect.x) are kept
// raw until the objective is resolved.
type Minimizer struct {
	Index     int
	Name      string
	Objective string
	Gradient  string
	Jacobian  string // the analytic Jacobian of a residual objective
	Instance  string
	Output    string // file name beside the objective
	Dim       int    // 0 when the spec leaves it out
	Residuals int    // M of a residual objective that takes a slice; 0 when the spec leaves it out

	// The chosen entries; nil when the spec names an unknown one.
	Derivative, Direction, Rule, Test *rules.Entry
	// DirectionGiven and RuleGiven say the spec names them: a residual
	// objective's defaults differ (see resolveResiduals).
	DirectionGiven, RuleGiven bool
	// Given holds the parameter values the spec sets.
	Given map[*rules.Param]float64

	Expect *Expect
	Start  []float64 // set once the objective's shape is known
	// Lower and Upper are the box of [minimizer.bounds], ±Inf for open
	// sides, set once the objective's shape is known; nil without bounds.
	Lower, Upper []float64
	// Scale is the typical magnitude of each unknown (scale), set once the
	// objective's shape is known; nil when the spec leaves it out.
	Scale []float64

	start     any
	scale     any
	expectX   any
	bounds    map[string]any // [minimizer.bounds] as decoded, nil without it
	keyPrefix string         // "minimizer.N"
	problems  int            // problems found in this entry
}

// Valid reports whether the entry had no problem of its own.
func (m *Minimizer) Valid() bool { return m.problems == 0 }

// Expect is what the generated test asserts about the run from start: the
// minimizer X (when given) within Tolerance, and the final status (when
// given; otherwise any converged one).
type Expect struct {
	X         []float64
	Tolerance float64
	Status    *rules.Status
}

// structuralKeys are the keys of a [[minimizer]] table that the registry
// does not describe: they name things in the user's package and shape the
// generated code, and spec.go validates each itself.
var structuralKeys = []string{"name", "objective", "gradient", "jacobian", "start", "scale", "dim", "residuals", "instance", "output"}

// subtables are the tables a [[minimizer]] may hold, with their fixed
// keys; the registry adds the choices and parameters of "step" and "stop".
var subtables = map[string][]string{
	"step":   nil,
	"stop":   nil,
	"bounds": {"lower", "upper"},
	"expect": {"x", "tolerance", "status"},
}

// ParseSpec reads and validates a spec file. Errors carry the spec's
// positions; all errors of the file are reported together. When the file
// decodes, the spec is returned beside its problems, with each
// minimizer's Valid saying whether it had any of its own.
func ParseSpec(path string) (*Spec, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, Problems{{Pos{path, 1, 1}, err.Error()}}.Err()
	}
	return parseSpecData(path, data)
}

// Sizes past which a spec is refused: the whole file, and a minimizer's
// name (which also names its files, whose names most file systems limit
// to 255 bytes).
const (
	maxSpecBytes = 256 << 10
	maxNameBytes = 100
)

func parseSpecData(path string, data []byte) (*Spec, error) {
	if len(data) > maxSpecBytes {
		// The TOML decoder's duplicate-key check is quadratic in the
		// number of keys; a spec is a few kilobytes (checks/mgh's 120
		// minimizers take 22 KiB).
		return nil, Problems{{Pos{path, 1, 1}, fmt.Sprintf("the spec is %d bytes; thalweg reads specs of at most %d bytes (%d KiB)", len(data), maxSpecBytes, maxSpecBytes>>10)}}.Err()
	}
	var doc map[string]any
	if err := toml.Unmarshal(data, &doc); err != nil {
		var decode *toml.DecodeError
		if errors.As(err, &decode) {
			line, col := decode.Position()
			return nil, Problems{{Pos{path, line, col}, strings.TrimPrefix(decode.Error(), "toml: ")}}.Err()
		}
		return nil, Problems{{Pos{path, 1, 1}, err.Error()}}.Err()
	}
	ix := indexPositions(path, data)
	if ix == nil { // cannot happen after a successful decode; keep errors positioned anyway
		ix = &positions{file: path, keys: map[string]Pos{}, values: map[string]Pos{}, tables: map[string]Pos{}}
	}
	if pos, ok := ix.tables["minimizer"]; ok {
		return nil, Problems{{pos, "write [[minimizer]], an array of tables, not [minimizer]"}}.Err()
	}
	r := &specReader{ix: ix}
	r.unknownKeys("", doc, []string{"package", "minimizer"})
	spec := &Spec{Path: path, pos: ix, PackageDir: filepath.Dir(path)}
	if pkg, ok := r.text(doc, "", "package"); ok {
		if pkg == "" || filepath.IsAbs(pkg) {
			r.add(ix.value("package"), "package must be a directory relative to the spec file, got %q", pkg)
		} else {
			spec.PackageDir = filepath.Join(filepath.Dir(path), filepath.FromSlash(pkg))
		}
	}
	entries, _ := doc["minimizer"].([]any)
	if len(entries) == 0 {
		r.add(Pos{path, 1, 1}, "no [[minimizer]] table: a spec names at least one minimizer")
	}
	names := map[string]bool{}
	outputs := map[string]string{}
	for i, e := range entries {
		table, ok := e.(map[string]any)
		if !ok {
			r.add(ix.value(fmt.Sprintf("minimizer.%d", i)), "minimizer must be a table, not a TOML %s", tomlType(e))
			continue
		}
		before := len(r.probs)
		m := r.minimizer(table, i)
		if m.Name != "" {
			if names[m.Name] {
				r.add(ix.value(m.keyPrefix+".name"), "minimizer %s is named twice in this spec", m.Name)
			}
			names[m.Name] = true
			if other, ok := outputs[m.Output]; ok {
				r.add(ix.value(m.keyPrefix+".output"), "minimizers %s and %s would both write %s", other, m.Name, m.Output)
			}
			outputs[m.Output] = m.Name
		}
		m.problems = len(r.probs) - before
		spec.Minimizers = append(spec.Minimizers, m)
	}
	inMinimizers := 0
	for _, m := range spec.Minimizers {
		inMinimizers += m.problems
	}
	spec.problems = len(r.probs) - inMinimizers
	return spec, r.probs.Err()
}

// specReader reads the decoded document, reporting every problem at its
// position.
type specReader struct {
	ix    *positions
	probs Problems
}

func (r *specReader) add(pos Pos, format string, args ...any) {
	r.probs.add(pos, format, args...)
}

// tomlType names a decoded value's TOML type.
func tomlType(v any) string {
	switch v.(type) {
	case string:
		return "string"
	case int64:
		return "integer"
	case float64:
		return "float"
	case bool:
		return "boolean"
	case []any:
		return "array"
	case map[string]any:
		return "table"
	case time.Time, toml.LocalDate, toml.LocalDateTime, toml.LocalTime:
		return "date or time"
	}
	return fmt.Sprintf("%T", v)
}

// unknownKeys reports every key of table (at path, with array indexes)
// that is not in known, suggesting the closest known key.
func (r *specReader) unknownKeys(path string, table map[string]any, known []string) {
	keys := make([]string, 0, len(table))
	for k := range table {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if contains(known, k) {
			continue
		}
		full := joinPath(path, k)
		msg := fmt.Sprintf("unknown key %q", withoutIndexes(full))
		if near, ok := closest(k, known); ok {
			msg += fmt.Sprintf("; did you mean %q?", near)
		}
		r.add(r.ix.key(full), "%s", msg)
	}
}

func joinPath(path, key string) string {
	switch {
	case path == "":
		return key
	case key == "":
		return path
	}
	return path + "." + key
}

// withoutIndexes drops array indexes from a key path: minimizer.0.step →
// minimizer.step.
func withoutIndexes(path string) string {
	var parts []string
	for _, part := range strings.Split(path, ".") {
		if strings.Trim(part, "0123456789") != "" {
			parts = append(parts, part)
		}
	}
	return strings.Join(parts, ".")
}

// specKey is how messages name a key of a minimizer: step.shrink.
func specKey(path string) string {
	return strings.TrimPrefix(withoutIndexes(path), "minimizer.")
}

// wrongType reports a value of the wrong TOML type.
func (r *specReader) wrongType(path, want string, v any) {
	r.add(r.ix.value(path), "%s must be %s, not a TOML %s", specKey(path), want, tomlType(v))
}

// text reads an optional string.
func (r *specReader) text(table map[string]any, path, key string) (string, bool) {
	v, ok := table[key]
	if !ok {
		return "", false
	}
	s, ok := v.(string)
	if !ok {
		r.wrongType(joinPath(path, key), "a string", v)
		return "", false
	}
	return s, true
}

// subtable reads an optional table.
func (r *specReader) subtable(table map[string]any, path, key string) (map[string]any, bool) {
	v, ok := table[key]
	if !ok {
		return nil, false
	}
	t, ok := v.(map[string]any)
	if !ok {
		r.wrongType(joinPath(path, key), "a table", v)
		return nil, false
	}
	return t, true
}

// minimizer validates one [[minimizer]] table: everything that does not
// need the objective's shape.
func (r *specReader) minimizer(table map[string]any, i int) *Minimizer {
	key := fmt.Sprintf("minimizer.%d", i)
	at := func(k string) Pos { return r.ix.value(key + "." + k) }
	m := &Minimizer{Index: i, keyPrefix: key, start: table["start"], scale: table["scale"], Given: map[*rules.Param]float64{}}

	// The keys each table may hold: structural ones, then the registry's.
	tables := map[string]map[string]any{"": table}
	known := map[string][]string{"": append([]string(nil), structuralKeys...)}
	for sub, keys := range subtables {
		known[""] = append(known[""], sub)
		known[sub] = append(known[sub], keys...)
		if t, ok := r.subtable(table, key, sub); ok {
			tables[sub] = t
		}
	}
	for _, c := range rules.Choices() {
		known[c.Table] = append(known[c.Table], c.Key)
	}
	for _, p := range rules.Params() {
		known[p.Table] = append(known[p.Table], p.Key)
	}
	for _, sub := range []string{"", "step", "stop", "bounds", "expect"} {
		if t, ok := tables[sub]; ok {
			r.unknownKeys(joinPath(key, sub), t, known[sub])
		}
	}

	name, named := r.text(table, key, "name")
	m.Name = name
	switch {
	case named && name == "":
		r.add(at("name"), "name must not be empty: it is the exported Go name of the minimizer")
	case !named && table["name"] == nil:
		r.add(r.ix.key(key), "name is required: the exported Go name of the minimizer")
	case named && len(name) > maxNameBytes:
		r.add(at("name"), "name is %d bytes long; at most %d, since it also names the output file and every generated declaration", len(name), maxNameBytes)
		m.Name = ""
	case named && (!token.IsIdentifier(name) || !token.IsExported(name)):
		r.add(at("name"), "name %q is not an exported Go identifier", name)
		m.Name = ""
	}
	objective, given := r.text(table, key, "objective")
	m.Objective = objective
	switch {
	case given && objective == "":
		r.add(at("objective"), "objective must not be empty: \"Func\" or \"Type.Method\" in the package")
	case !given && table["objective"] == nil:
		r.add(r.ix.key(key), "objective is required: \"Func\" or \"Type.Method\" in the package")
	case given && !validReference(objective):
		r.add(at("objective"), "objective %q is not \"Func\" or \"Type.Method\"", objective)
	}

	// The choices, then the parameters they read.
	chosen := map[*rules.Choice]*rules.Entry{}
	for _, c := range rules.Choices() {
		e := c.DefaultEntry()
		if d := chosen[rules.Direction]; c == rules.StepRule && d != nil && d.DefaultRule != nil {
			e = d.DefaultRule // the direction's own default rule
		}
		path := joinPath(joinPath(key, c.Table), c.Key)
		if v, ok := r.text(tables[c.Table], joinPath(key, c.Table), c.Key); ok {
			var found bool
			if e, found = c.Lookup(v); !found {
				msg := fmt.Sprintf("%s %q is not one of %s", c.Path(), v, quoteJoin(c.Names(), ", "))
				if near, ok := closest(v, c.Names()); ok {
					msg += fmt.Sprintf("; did you mean %q?", near)
				}
				r.add(r.ix.value(path), "%s", msg)
			}
		} else if _, present := tables[c.Table][c.Key]; present {
			e = nil // of the wrong type, already reported
		}
		if _, present := tables[c.Table][c.Key]; present {
			m.DirectionGiven = m.DirectionGiven || c == rules.Direction
			m.RuleGiven = m.RuleGiven || c == rules.StepRule
		}
		chosen[c] = e
	}
	m.Derivative, m.Direction, m.Rule, m.Test = chosen[rules.Derivative], chosen[rules.Direction], chosen[rules.StepRule], chosen[rules.GradientTest]
	if m.Rule != nil && m.Rule.Exclusive && !m.DirectionGiven {
		m.Direction = pairedWith(m.Rule)[0] // the direction the rule goes with (damping: levenberg-marquardt)
	}
	if m.Direction != nil && m.Rule != nil && m.Direction.NeedsCurvature && !m.Rule.Curvature {
		r.add(r.ix.value(key+".step.rule"), "direction %q needs a step rule with a curvature condition: with %q its directions need not descend (Nocedal & Wright 2006, §5.2); use step.rule = %q", m.Direction.Name, m.Rule.Name, m.Direction.DefaultRule.Name)
	}
	if d, rule := m.Direction, m.Rule; d != nil && rule != nil && !rules.Suits(d, rule) {
		where := r.ix.value(key + ".step.rule")
		if !m.RuleGiven {
			where = r.ix.value(key + ".direction")
		}
		switch {
		case d.Pairs != nil:
			r.add(where, "direction %q goes only with step.rule %s: %s", d.Name, quoteJoin(entryNames(d.Pairs), " or "), d.PairsWhy)
		default:
			owners := pairedWith(rule)
			r.add(where, "step.rule %q goes only with direction %s: %s", rule.Name, quoteJoin(entryNames(owners), " or "), owners[0].PairsWhy)
		}
	}
	r.params(m, tables, key)

	jacobian, hasJacobian := r.text(table, key, "jacobian")
	m.Jacobian = jacobian
	switch {
	case m.Derivative == nil:
	case m.Derivative != rules.Analytic && table["jacobian"] != nil:
		r.add(r.ix.key(key+".jacobian"), "jacobian is only used with derivative = \"analytic\" (derivative is %q)", m.Derivative.Name)
	case hasJacobian && !validReference(jacobian):
		r.add(at("jacobian"), "jacobian %q is not \"Func\" or \"Type.Method\"", jacobian)
	}
	if v, ok := table["residuals"]; ok {
		switch n, isInt := v.(int64); {
		case !isInt:
			r.wrongType(key+".residuals", "a whole number", v)
		case n < 1 || n > 1<<16:
			r.add(at("residuals"), "residuals must be between 1 and 65536, got %d", n)
		default:
			m.Residuals = int(n)
		}
	}

	gradient, hasGradient := r.text(table, key, "gradient")
	m.Gradient = gradient
	switch {
	case m.Derivative == nil:
		// unknown derivative, already reported
	case m.Derivative != rules.Analytic && table["gradient"] != nil:
		r.add(r.ix.key(key+".gradient"), "gradient is only used with derivative = \"analytic\" (derivative is %q)", m.Derivative.Name)
	case hasGradient && !validReference(gradient):
		r.add(at("gradient"), "gradient %q is not \"Func\" or \"Type.Method\"", gradient)
	}
	if v, ok := table["dim"]; ok {
		switch n, isInt := v.(int64); {
		case !isInt:
			r.wrongType(key+".dim", "a whole number", v)
		case n < 1 || n > 1<<16:
			r.add(at("dim"), "dim must be between 1 and 65536, got %d", n)
		default:
			m.Dim = int(n)
		}
	}
	if inst, ok := r.text(table, key, "instance"); ok {
		m.Instance = inst
		if !validReference(inst) || strings.Contains(inst, ".") {
			r.add(at("instance"), "instance %q is not the name of a package-level variable or function", inst)
		}
	}
	r.output(m, table, key)
	if bounds, ok := tables["bounds"]; ok {
		m.bounds = bounds
		switch {
		case bounds["lower"] == nil && bounds["upper"] == nil:
			r.add(r.ix.key(key+".bounds"), "[minimizer.bounds] needs lower, upper or both")
		case m.Direction != nil && m.Direction.NoBounds != "":
			r.add(r.ix.key(key+".bounds"), "direction %q cannot take bounds: %s", m.Direction.Name, m.Direction.NoBounds)
		}
	}
	if expect, ok := tables["expect"]; ok {
		r.expect(m, expect, key)
	}
	if table["start"] == nil {
		r.add(r.ix.key(key), "start is required: a typical starting point")
	}
	return m
}

// output checks the output file name, or derives it from the name.
func (r *specReader) output(m *Minimizer, table map[string]any, key string) {
	if m.Name != "" {
		m.Output = snakeCase(m.Name) + "_min.go"
	}
	out, ok := r.text(table, key, "output")
	if !ok {
		return
	}
	m.Output = out
	at := r.ix.value(key + ".output")
	switch {
	case len(out) > maxNameBytes+len("_test.go"):
		r.add(at, "output is %d bytes long; at most %d", len(out), maxNameBytes+len("_test.go"))
	case out != filepath.Base(out) || strings.ContainsAny(out, `/\`):
		r.add(at, "output %q must be a file name in the objective's package directory, without folders", out)
	case !strings.HasSuffix(out, ".go") || strings.HasSuffix(out, "_test.go"):
		r.add(at, "output %q must end in .go and not in _test.go", out)
	case strings.HasPrefix(out, "_") || strings.HasPrefix(out, "."):
		r.add(at, "output %q starts with %q: the go tool ignores such files", out, out[:1])
	case buildConstrained(out):
		r.add(at, "output %q ends in a GOOS or GOARCH suffix: the go tool would build it only there", out)
	}
}

// params reads every registry parameter the spec sets: its type, its
// range, whether a chosen entry reads it, and the order constraints
// between parameters (c1 < c2).
func (r *specReader) params(m *Minimizer, tables map[string]map[string]any, key string) {
	ctx := &rules.Context{Derivative: m.Derivative, Direction: m.Direction, Rule: m.Rule, Test: m.Test}
	complete := m.Derivative != nil && m.Direction != nil && m.Rule != nil && m.Test != nil
	for _, p := range rules.Params() {
		v, present := tables[p.Table][p.Key]
		if !present {
			continue
		}
		path := joinPath(joinPath(key, p.Table), p.Key)
		if complete && !ctx.Reads(p) {
			r.add(r.ix.key(path), "%s", notReadMessage(p, ctx))
			continue
		}
		if value, ok := r.paramValue(p, path, v); ok {
			m.Given[p] = value
		}
	}
	if !complete {
		return
	}
	ctx.Value = func(p *rules.Param) float64 {
		if v, ok := m.Given[p]; ok {
			return v
		}
		return ctx.DefaultValue(p)
	}
	for _, p := range rules.Params() {
		low := p.Exceeds
		if low == nil || !ctx.Reads(p) || !ctx.Reads(low) {
			continue
		}
		v, bound := ctx.Value(p), ctx.Value(low)
		if v > bound {
			continue
		}
		if _, given := m.Given[p]; given {
			r.add(r.ix.value(joinPath(joinPath(key, p.Table), p.Key)), "%s (%s = %v) must exceed %s (%s = %v)", p.Path(), p.Label, v, low.Path(), low.Label, bound)
			continue
		}
		owner := "its default"
		for _, e := range ctx.Entries() {
			if _, ok := e.Defaults[p]; ok {
				owner = fmt.Sprintf("the default for %s %q", choiceOf(e).Path(), e.Name)
			}
		}
		r.add(r.ix.value(joinPath(joinPath(key, low.Table), low.Key)), "%s (%s = %v) must be below %s (%s = %v, %s); lower %s or set %s",
			low.Path(), low.Label, bound, p.Path(), p.Label, v, owner, low.Path(), p.Path())
	}
}

// paramValue checks a parameter's TOML type and range. A whole number may
// be written as a float with an integral value (evaluations = 1e6).
func (r *specReader) paramValue(p *rules.Param, path string, v any) (float64, bool) {
	want := map[rules.Kind]string{rules.Real: "a number", rules.Whole: "a whole number", rules.Switch: "true or false"}[p.Kind]
	var value float64
	switch x := v.(type) {
	case bool:
		if p.Kind != rules.Switch {
			r.wrongType(path, want, v)
			return 0, false
		}
		if x {
			value = 1
		}
		return value, true
	case int64:
		value = float64(x)
	case float64:
		value = x
		if p.Kind == rules.Whole && x != math.Trunc(x) && !math.IsNaN(x) {
			r.add(r.ix.value(path), "%s must be a whole number, got %v", specKey(path), x)
			return 0, false
		}
	default:
		r.wrongType(path, want, v)
		return 0, false
	}
	if p.Kind == rules.Switch {
		r.wrongType(path, want, v)
		return 0, false
	}
	if !p.Contains(value) {
		r.add(r.ix.value(path), "%s must be in %s, got %v", specKey(path), p.Range(), value)
		return 0, false
	}
	return value, true
}

// notReadMessage says which entries read a parameter no chosen entry
// reads.
func notReadMessage(p *rules.Param, ctx *rules.Context) string {
	for _, c := range rules.Choices() {
		var readers []string
		for _, e := range c.Entries {
			if e.Reads(p) {
				readers = append(readers, fmt.Sprintf("%q", e.Name))
			}
		}
		if len(readers) == 0 {
			continue
		}
		current := ctx.Entries()[choiceIndex(c)]
		if c == rules.StepRule {
			return fmt.Sprintf("%s is not used by rule %q", p.Path(), current.Name)
		}
		return fmt.Sprintf("%s is only used with %s = %s (%s is %q)", p.Path(), c.Path(), strings.Join(readers, " or "), c.Path(), current.Name)
	}
	return p.Path() + " is not used"
}

// choiceIndex is a choice's place in rules.Choices and Context.Entries.
func choiceIndex(c *rules.Choice) int {
	for i, d := range rules.Choices() {
		if d == c {
			return i
		}
	}
	return -1
}

// choiceOf finds the choice an entry belongs to.
func choiceOf(e *rules.Entry) *rules.Choice {
	for _, c := range rules.Choices() {
		for _, f := range c.Entries {
			if f == e {
				return c
			}
		}
	}
	return nil
}

// expect reads [minimizer.expect].
func (r *specReader) expect(m *Minimizer, table map[string]any, key string) {
	m.expectX = table["x"]
	m.Expect = &Expect{Tolerance: 1e-6}
	if table["x"] == nil && table["status"] == nil {
		r.add(r.ix.key(key+".expect"), "expect needs x, the expected minimizer, or status, the expected end")
	}
	if text, ok := r.text(table, key+".expect", "status"); ok {
		var texts []string
		for _, s := range rules.Statuses {
			if s != rules.Running { // no whole run ends with it
				texts = append(texts, s.Text)
			}
		}
		status, found := rules.StatusByText(text)
		if !found || status == rules.Running {
			msg := fmt.Sprintf("expect.status %q is not one of %s", text, quoteJoin(texts, ", "))
			if near, ok := closest(text, texts); ok {
				msg += fmt.Sprintf("; did you mean %q?", near)
			}
			r.add(r.ix.value(key+".expect.status"), "%s", msg)
		}
		m.Expect.Status = status
	}
	if v, ok := table["tolerance"]; ok {
		var t float64
		switch x := v.(type) {
		case int64:
			t = float64(x)
		case float64:
			t = x
		default:
			r.wrongType(key+".expect.tolerance", "a number", v)
			return
		}
		if !(t > 0) || math.IsInf(t, 1) {
			r.add(r.ix.value(key+".expect.tolerance"), "expect.tolerance must be a positive number, got %v", t)
		}
		m.Expect.Tolerance = t
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
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

// entryNames lists the entries' names.
func entryNames(entries []*rules.Entry) []string {
	names := make([]string, len(entries))
	for i, e := range entries {
		names[i] = e.Name
	}
	return names
}

// pairedWith lists the directions that list the step rule among their
// pairs.
func pairedWith(rule *rules.Entry) []*rules.Entry {
	var owners []*rules.Entry
	for _, d := range rules.Direction.Entries {
		for _, p := range d.Pairs {
			if p == rule {
				owners = append(owners, d)
			}
		}
	}
	return owners
}
