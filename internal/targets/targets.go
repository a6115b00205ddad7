// Package targets runs Go tests for the architectures that generated code
// must be correct on, each under emulation: Linux user-mode QEMU
// (Debian's qemu-user-static) for the Linux targets, and Go's own
// go_js_wasm_exec with the machine's Node.js for js/wasm. The go command
// cross-compiles each test binary and runs it through `go test -exec`, so
// no binfmt registration is needed.
//
// The targets differ from the usual amd64 workstation in ways that
// matter to floating-point kernels: arm64, ppc64le, s390x and riscv64 may
// fuse x*y + z into one fused multiply-add (the Go spec allows it), 32-bit
// arm with GOARM=5 computes in software floating point, and wasm has its
// own code generator. The host's amd64 v3 level (FMA3) fuses too; Fused
// describes that run.
package targets

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
)

// Target is one GOOS/GOARCH (and GOARM) combination and the program that
// runs its binaries here.
type Target struct {
	Name     string   // as reported, e.g. "linux/arm GOARM=5"
	Env      []string // GOOS, GOARCH and GOARM settings
	emulator string   // qemu-user-static program, "" for js/wasm or the host
	wasm     bool     // run through $GOROOT/lib/wasm/go_js_wasm_exec
	fused    bool     // amd64 v3: native when the host can, else emulated with -cpu max
}

// All lists the emulated targets, in the order CI runs them.
var All = []Target{
	{Name: "linux/arm64", Env: []string{"GOOS=linux", "GOARCH=arm64"}, emulator: "qemu-aarch64-static"},
	{Name: "linux/riscv64", Env: []string{"GOOS=linux", "GOARCH=riscv64"}, emulator: "qemu-riscv64-static"},
	{Name: "linux/ppc64le", Env: []string{"GOOS=linux", "GOARCH=ppc64le"}, emulator: "qemu-ppc64le-static"},
	{Name: "linux/s390x", Env: []string{"GOOS=linux", "GOARCH=s390x"}, emulator: "qemu-s390x-static"},
	{Name: "linux/arm GOARM=7", Env: []string{"GOOS=linux", "GOARCH=arm", "GOARM=7"}, emulator: "qemu-arm-static"},
	{Name: "linux/arm GOARM=5", Env: []string{"GOOS=linux", "GOARCH=arm", "GOARM=5"}, emulator: "qemu-arm-static"},
	{Name: "js/wasm", Env: []string{"GOOS=js", "GOARCH=wasm"}, wasm: true},
}

// Fused is linux/amd64 at microarchitecture level v3, where the compiler
// fuses multiply-adds into FMA3 instructions as it does on arm64: the run
// that reproduces fusion defects on an amd64 workstation between CI runs.
// It runs natively when the host processor has FMA3, AVX2 and BMI2, and
// under qemu-x86_64-static -cpu max otherwise.
var Fused = Target{Name: "linux/amd64 GOAMD64=v3", Env: []string{"GOOS=linux", "GOARCH=amd64", "GOAMD64=v3"}, emulator: "qemu-x86_64-static", fused: true}

// hostRunsV3 reports whether this host runs linux/amd64 v3 binaries
// natively.
func hostRunsV3() bool {
	if runtime.GOOS != "linux" || runtime.GOARCH != "amd64" {
		return false
	}
	data, err := os.ReadFile("/proc/cpuinfo")
	if err != nil {
		return false
	}
	for _, line := range strings.Split(string(data), "\n") {
		key, value, ok := strings.Cut(line, ":")
		if !ok || strings.TrimSpace(key) != "flags" {
			continue
		}
		have := map[string]bool{}
		for _, flag := range strings.Fields(value) {
			have[flag] = true
		}
		return have["fma"] && have["avx2"] && have["bmi2"]
	}
	return false
}

// Exec returns the command `go test -exec` runs the target's binaries
// with ("" to run them directly), or an error saying what to install.
func (t Target) Exec() (string, error) {
	switch {
	case t.fused && hostRunsV3():
		return "", nil
	case t.fused:
		path, err := exec.LookPath(t.emulator)
		if err != nil {
			return "", fmt.Errorf("%s: the host cannot run amd64 v3 binaries and %s is missing: install Debian's qemu-user-static (apt-get install qemu-user-static)", t.Name, t.emulator)
		}
		return path + " -cpu max", nil
	case t.wasm:
		goroot, err := exec.Command("go", "env", "GOROOT").Output()
		if err != nil {
			return "", fmt.Errorf("go env GOROOT: %v", err)
		}
		runner := filepath.Join(strings.TrimSpace(string(goroot)), "lib", "wasm", "go_js_wasm_exec")
		if _, err := os.Stat(runner); err != nil {
			return "", fmt.Errorf("%s: %v", t.Name, err)
		}
		if _, err := exec.LookPath("node"); err != nil {
			return "", fmt.Errorf("%s needs Node.js (node) on PATH to run go_js_wasm_exec", t.Name)
		}
		return runner, nil
	case t.emulator != "":
		path, err := exec.LookPath(t.emulator)
		if err != nil {
			return "", fmt.Errorf("%s needs %s: install Debian's qemu-user-static (apt-get install qemu-user-static)", t.Name, t.emulator)
		}
		return path, nil
	}
	return "", nil
}

// Track reads every file below the directories, so that the go command's
// test cache, which keys a test's result on the files the test itself
// opened, reruns a test that drives `go test` in a subprocess whenever
// those files change.
func Track(dirs ...string) error {
	for _, dir := range dirs {
		err := filepath.WalkDir(dir, func(path string, d os.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			_, err = os.ReadFile(path)
			return err
		})
		if err != nil {
			return err
		}
	}
	return nil
}

// Test runs `go test args...` in dir for the target and returns the
// combined output; err is non-nil when the go command fails or the
// target's runner is missing.
func (t Target) Test(dir string, args ...string) (string, error) {
	runner, err := t.Exec()
	if err != nil {
		return "", err
	}
	full := []string{"test"}
	if runner != "" {
		full = append(full, "-exec", runner)
	}
	full = append(full, args...)
	cmd := exec.Command("go", full...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOWORK=off", "GOTOOLCHAIN=local", "CGO_ENABLED=0")
	cmd.Env = append(cmd.Env, t.Env...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		return string(out), fmt.Errorf("%s: go %s: %v", t.Name, strings.Join(full, " "), err)
	}
	return string(out), nil
}
