package templates

import "embed"

// Source is this package's own source, which gen parses and specializes.
//
// It is declared alone in this file, which gen leaves out of the kernels it
// type-checks: importing embed there would make go/types load a good part
// of the standard library from source on every run of gen.
//
//go:embed *.go
var Source embed.FS
