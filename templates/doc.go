// Package templates holds the algorithm kernels that thalweg specializes.
//
// Every kernel here is ordinary Go, written once for float64 vectors of a
// stand-in dimension and a stand-in objective, and unit-tested in place.
// The gen package parses these files, keeps the declarations a spec needs
// and rewrites their syntax tree: elem becomes the objective's float type,
// vec its array type, calls to the stand-in objective and gradient become
// calls to the user's functions, the dispatchers below are replaced by the
// one rule the spec chose, and every package-level name gains the
// minimizer's prefix.
//
// Rules for authors of this package, which gen relies on:
//   - the objective is called only as recv.objective(x) for its value
//     alone (differences), as recv.evaluate(x, g) where its gradient may
//     be wanted too (a combined objective writes it into g in the same
//     call), and the gradient only as the statement recv.gradient(x, g),
//     all with *vec operands;
//   - a dispatcher (derivative, direction, lineSearch, acceptable,
//     backtrackTrial, curvatureMet, settle, …) switches on a selector in params.go, and every
//     alternative it names has the same signature;
//   - conversions between elem and float64 are written out for float32's
//     sake; gen drops them when elem is float64;
//   - the files other than source.go import nothing but math, and use only
//     what gen/kernelmath.go declares of it: gen type-checks them against
//     that declaration (a test compares it with the real package) rather
//     than load math, or embed, from source.
package templates
