package gen

import "testing"

func TestEditDistance(t *testing.T) {
	for _, c := range []struct {
		a, b string
		want int
	}{
		{"", "", 0},
		{"", "abc", 3},
		{"abc", "", 3},
		{"Loss", "Loss", 0},
		{"Loss", "Los", 1},   // deletion
		{"Loss", "Losss", 1}, // insertion
		{"Loss", "Lose", 1},  // substitution
		{"Loss", "Lsos", 1},  // adjacent swap
		{"kitten", "sitting", 3},
		{"ca", "abc", 3}, // optimal string alignment: no edit of a swapped pair
		{"Gradient", "Gardient", 1},
		{"été", "ete", 2}, // runes, not bytes
	} {
		if got := editDistance([]rune(c.a), []rune(c.b)); got != c.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d", c.a, c.b, got, c.want)
		}
		if got := editDistance([]rune(c.b), []rune(c.a)); got != c.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d (symmetry)", c.b, c.a, got, c.want)
		}
	}
}

func TestClosest(t *testing.T) {
	names := []string{"GainCost", "Calibrate", "rawReadings", "NewPlant", "Loss", "F", "Cost"}
	for _, c := range []struct {
		word string
		want string // "" for no suggestion
	}{
		{"GainCots", "GainCost"},       // a swap
		{"gaincost", "GainCost"},       // case only
		{"Calibrat", "Calibrate"},      // a deletion
		{"Callibrate", "Calibrate"},    // an insertion
		{"RawReading", "rawReadings"},  // case and a deletion
		{"NewPlan", "NewPlant"},        // distance 1 of 7 letters
		{"Loos", "Loss"},               // 2 of 4: the floor of the limit
		{"Lxyz", ""},                   // 3 of 4: too far
		{"f", "F"},                     // one letter: case only
		{"G", ""},                      // one letter: any substitution is too far
		{"Cast", "Cost"},               // 1 of 4
		{"GainCostFunction", ""},       // 8 of 16: above len/3 = 5
		{"Calibratexxxx", "Calibrate"}, // 4 of 13: within len/3 = 4
		{"", ""},
	} {
		got, ok := closest(c.word, names)
		if ok != (c.want != "") || got != c.want {
			t.Errorf("closest(%q) = %q, %v; want %q", c.word, got, ok, c.want)
		}
	}
	if got, ok := closest("Loss", nil); ok {
		t.Errorf("closest with no candidates = %q", got)
	}
	// Ties: the candidate that also matches case wins, then sorted order.
	if got, _ := closest("cost", []string{"COST", "cost2", "Cost"}); got != "Cost" {
		t.Errorf("closest(cost) among COST, cost2, Cost = %q, want Cost", got)
	}
	if got, _ := closest("Lab", []string{"Lad", "Lac"}); got != "Lac" {
		t.Errorf("closest(Lab) among Lad, Lac = %q, want Lac", got)
	}
	if got := didYouMean("GainCots", names); got != "; did you mean GainCost?" {
		t.Errorf("didYouMean = %q", got)
	}
	if got := didYouMean("Nothing", names); got != "" {
		t.Errorf("didYouMean with nothing close = %q", got)
	}
}
