package gen

import "fmt"

// stackFigures are the most bytes of goroutine stack the entry points of
// a minimizer use, the objective's own frames excluded: run for NAME and
// NAMEWithLimits (the run's state lives in their frames), advance for
// NAMESolver.Advance (the state lives in the solver, wherever the caller
// keeps it), start for Start, StartFrom, SetLimits and Forget.
type stackFigures struct{ run, advance, start int }

// stack computes the figures from the size of a vector (v bytes) and of
// the direction's state. The coefficients are upper bounds fitted to the
// frame sizes the compiler reports (go build -gcflags=-S, the $frame of
// each TEXT line plus a return address, summed over the deepest call
// chain) for every direction and derivative source at 1 to 64 unknowns,
// float32 and float64, bounded or not, on amd64 and arm64; TestStackFigures
// checks them against a fresh measurement:
//
//   - run: 1536 + 40v, 16v more with bounds, plus the direction's state;
//   - advance: 1024 + 16v, 8v more with bounds;
//   - start: 128 + 6v, 9v more with bounds;
//   - a residual objective of M residuals adds 2M·v + 2M·e to run,
//     1.5M·v + M·e to advance and, with bounds, (M + 2N² + 6N + 24)·e to
//     start, e the size of one number (fitted to 2 and 8 unknowns, 5 and
//     60 residuals).
//
// About 11 vectors of the run's state, the line search's trial point and
// gradient and its copies, and the differences' probes and intervals make
// up the per-vector terms; spilled scalars and the kernels' bookkeeping
// the constant.
func (p *Plan) stack() stackFigures {
	v := p.Dim * p.ElemBytes()
	state := 0
	if p.Direction.State != nil {
		state, _ = p.Direction.State(p.Dim, p.ElemBytes(), p.Value)
	}
	f := stackFigures{run: 1536 + 40*v + state, advance: 1024 + 16*v, start: 128 + 6*v}
	if p.Bounded {
		f.run += 16 * v
		f.advance += 8 * v
		f.start += 9 * v
	}
	if m := p.Shape.Residuals; m > 0 {
		// A residual objective: the Jacobian (M·N numbers) and the
		// residual vectors of its differences in the frames, the
		// residual model (M + 2N² + 9N + 8 numbers) in the run's state.
		e := p.ElemBytes()
		f.run += 2*m*v + 2*m*e
		f.advance += 3*m*v/2 + m*e
		if p.Bounded {
			f.start += (m + 2*p.Dim*p.Dim + 6*p.Dim + 24) * e
		}
	}
	return f
}

// stackDoc states the figures in the solver's doc comment.
func stackDoc(p *Plan) string {
	f := p.stack()
	name := p.M.Name
	unknowns := "unknowns"
	if p.Dim == 1 {
		unknowns = "unknown"
	}
	return fmt.Sprintf("Stack, for %d %s of %s (the compiler's frame sizes summed over the deepest call chain, go build -gcflags=-S, amd64 and arm64; the objective's own frames excluded): %s and %sWithLimits use at most %d bytes, the run's state included; Advance at most %d bytes besides the solver itself, which lives wherever the caller declares it; Start, StartFrom, SetLimits and Forget at most %d bytes.",
		p.Dim, unknowns, p.Shape.Elem, name, name, f.run, f.advance, f.start)
}
