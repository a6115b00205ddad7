//go:build !unix

package gen

import (
	"testing"
	"time"
)

// processCPU is not measured here.
func processCPU(testing.TB) time.Duration { return 0 }
