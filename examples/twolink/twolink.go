// Package twolink is thalweg's worked example of a minimizer inside a
// control loop: a pick-and-place arm of our own invention, two links in a
// plane, whose controller turns the gripper's target point into joint
// angles on every tick of a 1 kHz loop, in float32, with the joints' limits
// as bounds and a fixed budget of objective calls per tick. The arm's
// dimensions, limits and targets are invented for the demo.
//
// Forward kinematics of a planar two-link arm (any robotics text, e.g.
// Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, 2006, §3):
//
//	p(θ) = (l₁cos θ₁ + l₂cos(θ₁ + θ₂), l₁sin θ₁ + l₂sin(θ₁ + θ₂)).
//
// The controller minimizes ½‖p(θ) − target‖² over the joints' box: the
// exact pose when the target is reachable within the limits, else the
// feasible pose whose gripper comes nearest.
package twolink

//go:generate go tool thalweg gen twolink.toml

import "math"

// Arm is the arm and the target of the current tick. The controller
// updates Target between ticks; the solver reads it on every call.
type Arm struct {
	Upper, Fore float32    // link lengths l₁ and l₂, in metres
	Target      [2]float32 // where the gripper should be, in metres
}

// Joint limits in radians, the same as in twolink.toml's bounds: the
// shoulder turns from −0.5 to 2.0, the elbow bends one way only, from 0.1
// (almost straight, where the arm loses a degree of freedom) to 2.6.
const (
	ShoulderMin, ShoulderMax = -0.5, 2.0
	ElbowMin, ElbowMax       = 0.1, 2.6
)

// Cell is the arm of the demo cell: links of 0.30 m and 0.25 m, gripper
// target 0.35 m out and 0.20 m up.
var Cell = &Arm{Upper: 0.30, Fore: 0.25, Target: [2]float32{0.35, 0.20}}

// Gripper is the gripper's position for joint angles θ.
func (a *Arm) Gripper(theta [2]float32) [2]float32 {
	s1, c1 := math.Sincos(float64(theta[0]))
	s12, c12 := math.Sincos(float64(theta[0] + theta[1]))
	return [2]float32{
		a.Upper*float32(c1) + a.Fore*float32(c12),
		a.Upper*float32(s1) + a.Fore*float32(s12),
	}
}

// Miss is ½‖p(θ) − target‖², in square metres.
func (a *Arm) Miss(theta [2]float32) float32 {
	p := a.Gripper(theta)
	dx, dy := p[0]-a.Target[0], p[1]-a.Target[1]
	return (dx*dx + dy*dy) / 2
}

// MissGrad is Miss's gradient, Jᵀ(p − target) with J the arm's Jacobian.
func (a *Arm) MissGrad(theta [2]float32) [2]float32 {
	s1, c1 := math.Sincos(float64(theta[0]))
	s12, c12 := math.Sincos(float64(theta[0] + theta[1]))
	dx := a.Upper*float32(c1) + a.Fore*float32(c12) - a.Target[0]
	dy := a.Upper*float32(s1) + a.Fore*float32(s12) - a.Target[1]
	// ∂p/∂θ₂ = l₂(−sin(θ₁+θ₂), cos(θ₁+θ₂)); ∂p/∂θ₁ adds l₁(−sin θ₁, cos θ₁).
	j2x, j2y := -a.Fore*float32(s12), a.Fore*float32(c12)
	j1x, j1y := -a.Upper*float32(s1)+j2x, a.Upper*float32(c1)+j2y
	return [2]float32{j1x*dx + j1y*dy, j2x*dx + j2y*dy}
}

// TickBudget is the objective calls the controller may spend per tick:
// two of the solver's worst-case iterations (ReachTickMinimum each), a few
// microseconds on the cell's processor, within a 1 ms tick.
const TickBudget = 2 * ReachTickMinimum

// Controller turns targets into joint commands, a tick at a time. It owns
// the solver, so the BFGS matrix learned on one tick helps the next.
type Controller struct {
	Arm     Arm
	Command [2]float32 // the joint angles last sent to the drives
	solver  ReachSolver
	last    ReachResult
	started bool
}

// NewController starts from the arm's parked pose.
func NewController(arm Arm, parked [2]float32) *Controller {
	c := &Controller{Arm: arm, Command: parked}
	c.solver.Start(parked)
	return c
}

// Tick takes this tick's target and spends at most TickBudget objective
// calls on it. A new target restarts the run from the last result with
// the direction's memory kept (StartFrom: the objective changed). The
// command changes only to a converged pose within the joint limits; a
// run still going or one that failed keeps the previous command, so the
// drives never receive an unchecked angle. It reports whether the command
// is fresh for this target, and the calls spent.
func (c *Controller) Tick(target [2]float32) (fresh bool, calls int) {
	before := c.last.Evaluations // the run's calls so far
	if target != c.Arm.Target {
		c.Arm.Target = target
		if c.started {
			c.solver.StartFrom(c.last)
		}
		before = 0 // a new run counts from zero
	}
	c.last = c.solver.Advance(&c.Arm, TickBudget)
	c.started = true
	calls = c.last.Evaluations - before
	x := c.last.X
	if !c.last.Status.Converged() || !(x[0] >= ShoulderMin && x[0] <= ShoulderMax && x[1] >= ElbowMin && x[1] <= ElbowMax) {
		return false, calls
	}
	c.Command = x
	return true, calls
}
