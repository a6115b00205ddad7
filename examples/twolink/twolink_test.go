package twolink

import (
	"math"
	"testing"
)

// lawOfCosines is the elbow-bent-positive solution of the two-link
// inverse kinematics for a reachable target, in float64: the law of
// cosines gives cos θ₂ = (x² + y² − l₁² − l₂²)/(2l₁l₂), and θ₁ = atan2(y, x) −
// atan2(l₂ sin θ₂, l₁ + l₂ cos θ₂) (Spong, Hutchinson & Vidyasagar, Robot
// Modeling and Control, 2006, §5.3; from memory).
func lawOfCosines(l1, l2, x, y float64) [2]float64 {
	c2 := (x*x + y*y - l1*l1 - l2*l2) / (2 * l1 * l2)
	t2 := math.Acos(c2)
	return [2]float64{math.Atan2(y, x) - math.Atan2(l2*math.Sin(t2), l1+l2*math.Cos(t2)), t2}
}

// elbowToward is the nearest feasible pose with the shoulder held at θ₁:
// the forearm points from the elbow at l₁(cos θ₁, sin θ₁) towards the
// target, θ₂ = atan2(target − elbow) − θ₁ (a closed form of our own: the
// nearest point of a circle to a point lies on the line through its
// centre).
func elbowToward(l1, theta1, x, y float64) [2]float64 {
	ex, ey := l1*math.Cos(theta1), l1*math.Sin(theta1)
	return [2]float64{theta1, wrap(math.Atan2(y-ey, x-ex) - theta1)}
}

// wrap is θ moved by a whole turn into (−π, π].
func wrap(theta float64) float64 {
	return -math.Remainder(-theta, 2*math.Pi)
}

// shoulderToward is the nearest feasible pose with the elbow held at θ₂:
// the arm is then a rigid link of length r = ‖(l₁ + l₂cos θ₂, l₂sin θ₂)‖
// turning about the shoulder, pointed at the target: θ₁ = atan2(y, x) −
// atan2(l₂ sin θ₂, l₁ + l₂ cos θ₂).
func shoulderToward(l1, l2, theta2, x, y float64) [2]float64 {
	return [2]float64{math.Atan2(y, x) - math.Atan2(l2*math.Sin(theta2), l1+l2*math.Cos(theta2)), theta2}
}

// jointTolerance: the spec's gradient test stops at |∂f/∂θ| ≤ 1e-6 rad⁻¹·m²,
// that is ‖Jᵀr‖ ≤ 1e-6 with r the gripper's miss; J's smallest singular
// value in the tested workspace is above 0.02 m (the elbow bent at least
// 0.15 rad), so the joint error is at most about 1e-6/0.02² = 2.5e-3 rad,
// and float32's own rounding of positions near 0.5 m (3e-8 m) adds far
// less.
const jointTolerance = 2.5e-3

func near(got [2]float32, want [2]float64) bool {
	return math.Abs(float64(got[0])-want[0]) <= jointTolerance && math.Abs(float64(got[1])-want[1]) <= jointTolerance
}

// Reachable targets on a grid of the workspace within the limits: the
// minimizer lands on the law-of-cosines pose.
func TestReachableTargetsMatchTheLawOfCosines(t *testing.T) {
	l1, l2 := float64(Cell.Upper), float64(Cell.Fore)
	checked := 0
	for r := 0.12; r <= 0.53; r += 0.05 {
		for phi := -0.2; phi <= 2.5; phi += 0.15 {
			x, y := r*math.Cos(phi), r*math.Sin(phi)
			want := lawOfCosines(l1, l2, x, y)
			if want[0] < ShoulderMin+0.05 || want[0] > ShoulderMax-0.05 || want[1] < ElbowMin+0.05 || want[1] > ElbowMax-0.05 {
				continue // on or near a limit: see the tests below
			}
			arm := &Arm{Upper: Cell.Upper, Fore: Cell.Fore, Target: [2]float32{float32(x), float32(y)}}
			got := Reach(arm, [2]float32{0.5, 1.2})
			if !got.Status.Converged() || !near(got.X, want) {
				t.Errorf("target (%.3f, %.3f): %v at %v, law of cosines %v", x, y, got.Status, got.X, want)
			}
			checked++
		}
	}
	if checked < 50 {
		t.Errorf("only %d targets checked", checked)
	}
}

// Targets that need the shoulder beyond its upper limit, or the elbow
// straighter than its lower one (out of reach): the answer is the nearest
// feasible pose, on that limit.
func TestTargetsBeyondALimitEndOnIt(t *testing.T) {
	l1, l2 := float64(Cell.Upper), float64(Cell.Fore)
	cases := []struct {
		name string
		x, y float64
		want [2]float64
	}{
		// Behind the shoulder's upper limit: θ₁ = 2.0, forearm towards it.
		{"behind", -0.40, 0.05, elbowToward(l1, ShoulderMax, -0.40, 0.05)},
		{"behind low", -0.30, -0.05, elbowToward(l1, ShoulderMax, -0.30, -0.05)},
		// Out of reach (farther than l₁ + l₂): elbow at its straightest.
		{"far", 0.60, 0.30, shoulderToward(l1, l2, ElbowMin, 0.60, 0.30)},
		{"far up", 0.10, 0.70, shoulderToward(l1, l2, ElbowMin, 0.10, 0.70)},
	}
	for _, c := range cases {
		if c.want[1] < ElbowMin || c.want[1] > ElbowMax || c.want[0] < ShoulderMin || c.want[0] > ShoulderMax {
			t.Fatalf("%s: the closed form %v leaves the box; pick another target", c.name, c.want)
		}
		arm := &Arm{Upper: Cell.Upper, Fore: Cell.Fore, Target: [2]float32{float32(c.x), float32(c.y)}}
		got := Reach(arm, [2]float32{0.5, 1.2})
		if !got.Status.Converged() || !near(got.X, c.want) {
			t.Errorf("%s (%.2f, %.2f): %v at %v, nearest feasible pose %v", c.name, c.x, c.y, got.Status, got.X, c.want)
		}
		if got.X[0] < ShoulderMin || got.X[0] > ShoulderMax || got.X[1] < ElbowMin || got.X[1] > ElbowMax {
			t.Errorf("%s: %v outside the joint limits", c.name, got.X)
		}
	}
}

// A target held still: the controller converges within a few ticks, never
// spends more than TickBudget calls in one, sends no command before the
// run converges, and ends on the law-of-cosines pose.
func TestControllerSettlesOnAStillTarget(t *testing.T) {
	c := NewController(*Cell, [2]float32{0.5, 1.2})
	target := [2]float32{0.20, 0.35}
	want := lawOfCosines(float64(Cell.Upper), float64(Cell.Fore), 0.20, 0.35)
	for tick := 0; tick < 20; tick++ {
		fresh, calls := c.Tick(target)
		if calls > TickBudget {
			t.Fatalf("tick %d spent %d calls, budget %d", tick, calls, TickBudget)
		}
		if !fresh && c.Command != [2]float32{0.5, 1.2} {
			t.Fatalf("tick %d: the command moved to %v before the run converged", tick, c.Command)
		}
		if fresh {
			if !near(c.Command, want) {
				t.Errorf("converged at tick %d on %v, law of cosines %v", tick, c.Command, want)
			}
			return
		}
	}
	t.Errorf("no converged command after 20 ticks")
}

// A target moving 1 mm per tick along an arc through the workspace: every
// tick stays within its budget, the command keeps up (fresh on most
// ticks, with the gripper within 1 mm of the current target when fresh),
// and when the target stops the command is the law-of-cosines pose.
func TestControllerTracksAMovingTarget(t *testing.T) {
	c := NewController(*Cell, [2]float32{0.5, 1.2})
	const radius, step = 0.38, 0.001 // metres; 1 mm per tick
	ticks := int(1.2 * radius / step)
	freshTicks, most := 0, 0
	var target [2]float32
	for tick := 0; tick <= ticks; tick++ {
		phi := 0.3 + float64(tick)*step/radius // θ₁ from −0.42 to 0.78: inside the limits
		target = [2]float32{float32(radius * math.Cos(phi)), float32(radius * math.Sin(phi))}
		fresh, calls := c.Tick(target)
		most = max(most, calls)
		if calls > TickBudget {
			t.Fatalf("tick %d spent %d calls, budget %d", tick, calls, TickBudget)
		}
		if fresh {
			freshTicks++
			p := c.Arm.Gripper(c.Command)
			if miss := math.Hypot(float64(p[0]-target[0]), float64(p[1]-target[1])); miss > 1e-3 {
				t.Errorf("tick %d: a fresh command misses the target by %.2g m", tick, miss)
			}
		}
	}
	if freshTicks < ticks*9/10 {
		t.Errorf("fresh commands on %d of %d ticks", freshTicks, ticks+1)
	}
	for tick := 0; tick < 10; tick++ {
		c.Tick(target)
	}
	want := lawOfCosines(float64(Cell.Upper), float64(Cell.Fore), float64(target[0]), float64(target[1]))
	if !near(c.Command, want) {
		t.Errorf("stopped target: command %v, law of cosines %v", c.Command, want)
	}
	t.Logf("%d ticks, %d fresh, at most %d calls in one (budget %d)", ticks+1, freshTicks, most, TickBudget)
}

func TestTickAllocatesNothing(t *testing.T) {
	c := NewController(*Cell, [2]float32{0.5, 1.2})
	phi := 0.3
	if n := testing.AllocsPerRun(200, func() {
		phi += 0.002
		c.Tick([2]float32{float32(0.4 * math.Cos(phi)), float32(0.4 * math.Sin(phi))})
	}); n != 0 {
		t.Errorf("%v allocations per tick", n)
	}
}

func BenchmarkTick(b *testing.B) {
	c := NewController(*Cell, [2]float32{0.5, 1.2})
	phi := 0.3
	b.ReportAllocs()
	for b.Loop() {
		phi += 0.001
		if phi > 2 {
			phi = 0.3
		}
		c.Tick([2]float32{float32(0.4 * math.Cos(phi)), float32(0.4 * math.Sin(phi))})
	}
}
