package gen

import (
	"fmt"
	"sort"
	"strings"
)

// Pos is a place in a spec or Go source file, as the user names it.
type Pos struct {
	File      string
	Line, Col int
}

func (p Pos) String() string {
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Problem is one positioned error.
type Problem struct {
	Pos Pos
	Msg string
}

func (p Problem) Error() string { return p.Pos.String() + ": " + p.Msg }

// Problems collects every error of a run, so all are reported at once.
type Problems []Problem

func (ps *Problems) add(pos Pos, format string, args ...any) {
	*ps = append(*ps, Problem{Pos: pos, Msg: fmt.Sprintf(format, args...)})
}

// Err returns the problems as an error, sorted by position, or nil.
func (ps Problems) Err() error {
	if len(ps) == 0 {
		return nil
	}
	var sorted Problems
	seen := map[Problem]bool{}
	for _, p := range ps {
		if !seen[p] {
			seen[p] = true
			sorted = append(sorted, p)
		}
	}
	sort.SliceStable(sorted, func(i, j int) bool {
		a, b := sorted[i].Pos, sorted[j].Pos
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
	return sorted
}

func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}
