// Package results holds what the outside checks share: the platform their
// results tables were recorded on, the byte-for-byte comparison of a
// table there, and distances in units in the last place.
package results

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"strings"
	"testing"
)

// Recorded is the platform the committed results tables come from.
const Recorded = "linux/amd64 (GOAMD64=v1)"

// OnRecordingPlatform reports whether this test binary runs where the
// tables were recorded, and if not, where. Elsewhere the last bits of a
// run may differ and with them, near a stop test, whole iterations: Go may
// fuse x*y + z into one fused multiply-add on arm64, ppc64le, s390x,
// riscv64 and amd64 v3 (not at the default GOAMD64=v1), and math.Exp is
// assembly on amd64, arm64 and s390x and math.Log on amd64 and s390x, but
// both are pure Go elsewhere, with other roundings.
func OnRecordingPlatform() (bool, string) {
	level := "v1"
	if info, ok := debug.ReadBuildInfo(); ok {
		for _, s := range info.Settings {
			if s.Key == "GOAMD64" {
				level = s.Value
			}
		}
	}
	here := runtime.GOOS + "/" + runtime.GOARCH
	if runtime.GOARCH == "amd64" {
		here += " (GOAMD64=" + level + ")"
	}
	return here == Recorded, here
}

// Compare writes got to file when update is set; otherwise, on the
// recording platform, it fails with the differing lines when the file
// differs from got. Elsewhere it only logs that the table differs: the
// assertions of each run hold on every platform, the table's bytes only
// where it was recorded.
func Compare(t *testing.T, file string, got []byte, update bool, regenerate string) {
	t.Helper()
	if update {
		if err := os.WriteFile(file, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(file)
	if err != nil {
		t.Fatalf("%v (run `%s` to write it)", err, regenerate)
	}
	if bytes.Equal(got, want) {
		return
	}
	if ok, here := OnRecordingPlatform(); !ok {
		t.Logf("%s differs on %s; it is compared on %s only", file, here, Recorded)
		return
	}
	t.Errorf("%s is stale (run `%s` after review):\n%s", file, regenerate, lineDiff(want, got))
}

// lineDiff lists the lines that differ, with their line numbers.
func lineDiff(want, got []byte) string {
	w, g := strings.Split(string(want), "\n"), strings.Split(string(got), "\n")
	var b strings.Builder
	for i := 0; i < len(w) || i < len(g); i++ {
		var x, y string
		if i < len(w) {
			x = w[i]
		}
		if i < len(g) {
			y = g[i]
		}
		if x != y {
			fmt.Fprintf(&b, "line %d:\n- %s\n+ %s\n", i+1, x, y)
		}
	}
	return b.String()
}

// UlpsApart returns how many float64 values lie between a and b, plus
// one (0 when a == b; the maximum for a NaN).
func UlpsApart(a, b float64) uint64 {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.MaxUint64
	}
	ia, ib := ordered(a), ordered(b)
	if ia > ib {
		return uint64(ia - ib)
	}
	return uint64(ib - ia)
}

// ordered maps a float64 to an integer whose order is the floats' order.
func ordered(v float64) int64 {
	bits := int64(math.Float64bits(v))
	if bits < 0 {
		return math.MinInt64 - bits
	}
	return bits
}
