package gen

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
)

// runOverlay runs `go test` on the plan's package with files replaced or
// added through an overlay in a temporary directory, so nothing in the
// package changes, and returns what the tests printed. The package's own
// test files are left out of the build (they may be stale or broken, and
// only the harness runs), and so is vet.
func runOverlay(p *Plan, files map[string][]byte, run string) ([]byte, error) {
	tmp, err := os.MkdirTemp("", "thalweg-run-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(tmp)
	replace := map[string]string{}
	i := 0
	for path, data := range files {
		abs, err := filepath.Abs(path)
		if err != nil {
			return nil, err
		}
		copyPath := filepath.Join(tmp, strconv.Itoa(i)+"_"+filepath.Base(path))
		i++
		if err := os.WriteFile(copyPath, data, 0o644); err != nil {
			return nil, err
		}
		replace[abs] = copyPath
	}
	tests, _ := filepath.Glob(filepath.Join(p.Spec.PackageDir, "*_test.go"))
	for _, path := range tests {
		if abs, err := filepath.Abs(path); err == nil && replace[abs] == "" {
			replace[abs] = "" // deleted from the build
		}
	}
	overlay, err := json.Marshal(map[string]any{"Replace": replace})
	if err != nil {
		return nil, err
	}
	overlayPath := filepath.Join(tmp, "overlay.json")
	if err := os.WriteFile(overlayPath, overlay, 0o644); err != nil {
		return nil, err
	}
	cmd := exec.Command("go", "test", "-overlay="+overlayPath, "-vet=off", "-run="+run, "-count=1", "-v", ".")
	cmd.Dir = p.Spec.PackageDir
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		return nil, fmt.Errorf("building and running %s in %s failed: %v\n%s%s", p.M.Name, displayPath(p.Spec.PackageDir), err, stdout.String(), stderr.String())
	}
	return stdout.Bytes(), nil
}
