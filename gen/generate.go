package gen

import (
	"bytes"
	"fmt"
	"go/token"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"sort"
	"strings"
	"sync"
	"sync/atomic"
)

// Output is one file thalweg writes.
type Output struct {
	Path string // as the user would name it, relative to the working directory when below it
	Data []byte
}

// Generate runs the whole pipeline for every spec: parse and validate,
// type-check each package once, resolve every objective, plan, emit. It
// returns every file to write, or every problem found; never both.
func Generate(specPaths []string) ([]Output, error) {
	plans, err := Plans(specPaths)
	if err != nil {
		return nil, err
	}
	// The minimizers are emitted in parallel (the kernels they share are
	// only read); the outputs and the first error keep the plans' order.
	type emitted struct {
		main, tests bytes.Buffer
		names       []string
		err         error
	}
	results := make([]emitted, len(plans))
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(plans)) {
		wg.Go(func() {
			for i := int(next.Add(1) - 1); i < len(plans); i = int(next.Add(1) - 1) {
				p, r := plans[i], &results[i]
				if r.names, r.err = emitMinimizer(&r.main, p, p.kernelChoice()); r.err == nil {
					r.err = EmitTests(&r.tests, p)
				}
			}
		})
	}
	wg.Wait()
	var outs []Output
	var probs Problems
	declared := make([][]string, len(plans))
	for i, p := range plans {
		r := &results[i]
		if r.err != nil {
			return nil, fmt.Errorf("%s: %v", p.describe(), r.err)
		}
		declared[i] = r.names
		outs = append(outs, Output{p.Output, r.main.Bytes()}, Output{p.TestFile, r.tests.Bytes()})
	}
	checkCollisions(plans, declared, &probs)
	if err := probs.Err(); err != nil {
		return nil, err
	}
	return outs, nil
}

// Plans parses the specs and resolves every minimizer against its package.
// A minimizer whose spec entry has problems is not resolved, but the
// others are, so that one run reports the spec problems of some
// minimizers together with the objective problems of the rest.
func Plans(specPaths []string) ([]*Plan, error) {
	var probs Problems
	var specs []*Spec
	for _, path := range specPaths {
		spec, err := ParseSpec(path)
		if err != nil {
			ps, ok := err.(Problems)
			if !ok {
				return nil, err
			}
			probs = append(probs, ps...)
			if spec = validPart(spec); spec == nil {
				continue
			}
		}
		specs = append(specs, spec)
	}
	// The minimizer names each package is about to get, so that the
	// package may already use them.
	generates := map[string][]string{}
	for _, spec := range specs {
		dir, _ := filepath.Abs(spec.PackageDir)
		for _, m := range spec.Minimizers {
			generates[dir] = append(generates[dir], m.Name)
		}
	}
	packages := map[string]*loadedPackage{}
	var plans []*Plan
	for _, spec := range specs {
		if msg := packageDirProblem(spec.PackageDir); msg != "" {
			probs.add(spec.pos.value("package"), "%s", msg)
			continue
		}
		dir, _ := filepath.Abs(spec.PackageDir)
		lp, seen := packages[dir]
		if !seen {
			lp = loadPackage(spec.PackageDir, &probs, generates[dir]...)
			packages[dir] = lp
		}
		if lp == nil {
			if !seen {
				probs.add(spec.pos.value("package"), "no loadable Go package in %s", spec.PackageDir)
			}
			continue
		}
		for _, m := range spec.Minimizers {
			shape, ok := lp.resolve(spec, m, &probs)
			if !ok {
				continue
			}
			p := newPlan(spec, m, shape)
			p.pkg = lp
			plans = append(plans, p)
		}
	}
	if err := probs.Err(); err != nil {
		return nil, err
	}
	return plans, nil
}

// validPart keeps the minimizers of a spec with problems that had none
// of their own, so their objectives are still resolved and their problems
// reported in the same run; nil when the file as a whole has a problem
// (package, unknown top-level keys) or no minimizer is left.
func validPart(spec *Spec) *Spec {
	if spec == nil || spec.problems > 0 {
		return nil
	}
	valid := *spec
	valid.Minimizers = nil
	for _, m := range spec.Minimizers {
		if m.Valid() {
			valid.Minimizers = append(valid.Minimizers, m)
		}
	}
	if len(valid.Minimizers) == 0 {
		return nil
	}
	return &valid
}

// packageDirProblem says why dir cannot hold the objective's package.
func packageDirProblem(dir string) string {
	info, err := os.Stat(dir)
	if err != nil || !info.IsDir() {
		return fmt.Sprintf("package directory %s does not exist", displayPath(dir))
	}
	matches, _ := filepath.Glob(filepath.Join(dir, "*.go"))
	for _, m := range matches {
		if !strings.HasSuffix(m, "_test.go") {
			return ""
		}
	}
	return fmt.Sprintf("package directory %s has no Go files", displayPath(dir))
}

// checkCollisions reports generated names or files that clash with the
// user's code or with another minimizer's; declaredBy[i] are the
// package-level names of plans[i]'s minimizer file.
func checkCollisions(plans []*Plan, declaredBy [][]string, probs *Problems) {
	owner := map[string]*Plan{} // absolute output path → plan
	names := map[string]*Plan{} // package dir + name → plan
	clashed := map[[2]*Plan]bool{}
	userNames := map[*loadedPackage]map[string]token.Pos{}
	otherNames := map[*loadedPackage]map[string]otherDeclaration{}
	specs := map[string]bool{} // the specs of this run, by absolute path
	for _, p := range plans {
		abs, _ := filepath.Abs(p.Spec.Path)
		specs[abs] = true
	}
	for i, p := range plans {
		for _, path := range []string{p.Output, p.TestFile} {
			abs, _ := filepath.Abs(path)
			if other, ok := owner[abs]; ok {
				probs.add(p.Spec.pos.key(p.M.keyPrefix), "%s and %s would both write %s", other.describe(), p.describe(), path)
			}
			owner[abs] = p
		}
		declared := slices.Sorted(slices.Values(declaredBy[i]))
		takenReported := false
		if userNames[p.pkg] == nil {
			userNames[p.pkg] = p.pkg.names(false)
			otherNames[p.pkg] = p.pkg.otherSpecsNames(specs)
		}
		// The generated files import math and testing: a package-level
		// name of either would clash with the import.
		for _, n := range []string{"math", "testing"} {
			if pos, ok := userNames[p.pkg][n]; ok {
				probs.add(p.pkg.position(pos), "%s is declared in package %s; the generated files import package %s, so rename it", n, p.Shape.Package, n)
			}
		}
		for _, n := range declared {
			key := p.pkg.dir + "\x00" + n
			if other, ok := names[key]; ok && other != p && !clashed[[2]*Plan{other, p}] {
				clashed[[2]*Plan{other, p}] = true
				probs.add(p.Spec.pos.value(p.M.keyPrefix+".name"), "%s and %s both generate %s (and more) in package %s: rename one", other.describe(), p.describe(), n, p.Shape.Package)
			}
			names[key] = p
			if pos, ok := userNames[p.pkg][n]; ok {
				probs.add(p.pkg.position(pos), "%s is already declared in package %s; minimizer %s generates a declaration of that name (rename one of them)", n, p.Shape.Package, p.M.Name)
			}
			if other, ok := otherNames[p.pkg][n]; ok && !takenReported {
				takenReported = true // once per minimizer: the other names follow from the first
				probs.add(p.pkg.position(other.pos), "%s (and more) is already declared here, in a file thalweg generated from %s; minimizer %s of %s generates a declaration of that name: rename one of the minimizers, or delete this file if its spec no longer asks for it", n, other.spec, p.M.Name, displayPath(p.Spec.Path))
			}
		}
	}
}

// Write writes the outputs, as WriteChanged does.
func Write(outs []Output) error {
	_, err := WriteChanged(outs)
	return err
}

// CheckTargets refuses every output whose file exists without thalweg's
// header: thalweg never overwrites code it did not write.
func CheckTargets(outs []Output) error {
	var probs Problems
	for _, o := range outs {
		data, err := os.ReadFile(o.Path)
		switch {
		case isSymlink(o.Path):
			probs.add(Pos{displayPath(o.Path), 1, 1}, "refusing to write through a symbolic link: the output would land wherever it points, possibly outside the package")
		case os.IsNotExist(err):
		case isDirectory(o.Path):
			probs.add(Pos{displayPath(o.Path), 1, 1}, "refusing to write: the output path is a directory")
		case err != nil:
			probs.add(Pos{displayPath(o.Path), 1, 1}, "%v", err)
		case !hasHeader(data):
			probs.add(Pos{displayPath(o.Path), 1, 1}, "refusing to overwrite: the file exists and lacks thalweg's header %q", "// Code generated by thalweg from …; DO NOT EDIT.")
		case headerSpec(data) != headerSpec(o.Data):
			probs.add(Pos{displayPath(o.Path), 1, 1}, "refusing to overwrite: the file was generated from %s, not %s", headerSpec(data), headerSpec(o.Data))
		}
	}
	return probs.Err()
}

// isSymlink reports whether path is a symbolic link, dangling or not.
func isSymlink(path string) bool {
	info, err := os.Lstat(path)
	return err == nil && info.Mode()&os.ModeSymlink != 0
}

// isDirectory reports whether path names a directory.
func isDirectory(path string) bool {
	info, err := os.Stat(path)
	return err == nil && info.IsDir()
}

// Stale lists the outputs whose file is missing or differs.
func Stale(outs []Output) []string {
	var stale []string
	for _, o := range outs {
		data, err := os.ReadFile(o.Path)
		if err != nil {
			stale = append(stale, displayPath(o.Path)+": missing")
		} else if !bytes.Equal(data, o.Data) {
			stale = append(stale, displayPath(o.Path)+": stale")
		}
	}
	return stale
}

// Orphan is a file that carries the header of a spec in this run but that
// the spec no longer produces: left behind by a renamed minimizer or a
// changed output.
type Orphan struct {
	Path string // the file, beside the spec's outputs, relative to the working directory when below it
	Spec string // the spec named in its header, relative to the file's directory
}

func (o Orphan) String() string {
	return fmt.Sprintf("%s: orphan (generated from %s, no longer produced)", o.Path, o.Spec)
}

// Orphans lists, sorted by path, the .go files in the directories the
// outputs go to whose header names the spec of an output in the same
// directory but that no output writes. A file without thalweg's header is
// never an orphan, nor one generated from a spec not in outs.
func Orphans(outs []Output) ([]Orphan, error) {
	type dirSpec struct{ dir, spec string } // absolute directory, spec name
	produced := map[string]bool{}           // absolute paths of the outputs
	specs := map[dirSpec]bool{}
	dirs := map[string]string{} // absolute directory → as the outputs name it
	for _, o := range outs {
		abs, err := filepath.Abs(o.Path)
		if err != nil {
			return nil, err
		}
		produced[abs] = true
		if spec := headerSpec(o.Data); spec != "" {
			specs[dirSpec{filepath.Dir(abs), spec}] = true
			dirs[filepath.Dir(abs)] = filepath.Dir(o.Path)
		}
	}
	var orphans []Orphan
	for abs, dir := range dirs {
		entries, err := os.ReadDir(abs)
		if err != nil {
			return nil, err
		}
		for _, e := range entries {
			if !e.Type().IsRegular() || !strings.HasSuffix(e.Name(), ".go") || produced[filepath.Join(abs, e.Name())] {
				continue
			}
			path := filepath.Join(dir, e.Name())
			if spec, ok := fileHeaderSpec(path); ok && specs[dirSpec{abs, spec}] {
				orphans = append(orphans, Orphan{Path: displayPath(path), Spec: spec})
			}
		}
	}
	sort.Slice(orphans, func(i, j int) bool { return orphans[i].Path < orphans[j].Path })
	return orphans, nil
}

// Remove deletes the orphan's file, only when it still carries the
// header naming the orphan's spec.
func (o Orphan) Remove() error {
	if spec, ok := fileHeaderSpec(o.Path); !ok || spec != o.Spec {
		return Problems{{Pos{o.Path, 1, 1}, "not deleted: the file no longer carries the header of " + o.Spec}}
	}
	return os.Remove(o.Path)
}

// fileHeaderSpec reads the spec name from a file's header.
func fileHeaderSpec(path string) (string, bool) {
	data, err := os.ReadFile(path)
	if err != nil {
		return "", false
	}
	return readHeader(data)
}
