package gen

import (
	"os"
	"runtime/debug"
)

// shortRunGCPercent is the collector's target heap growth, in percent of
// the live heap, for a run of thalweg: at the runtime's default of 100 a
// quarter of gen's CPU time went to the collector and its allocation
// assists (a profile of BenchmarkGeneratePerMinimizer), for a heap of a
// few tens of megabytes that dies with the process.
const shortRunGCPercent = 400

// RoomyHeap lets the collector run less often for the rest of a short
// process, trading memory it does not need to keep for time. The Go
// compiler does the same for the same reason (it raises its starting heap
// goal; from memory: cmd/compile/internal/base.AdjustStartingHeap). A GOGC
// in the environment wins. It returns a function that restores the
// previous setting.
func RoomyHeap() (restore func()) {
	if _, set := os.LookupEnv("GOGC"); set {
		return func() {}
	}
	previous := debug.SetGCPercent(shortRunGCPercent)
	return func() { debug.SetGCPercent(previous) }
}
