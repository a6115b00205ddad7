package gen

import (
	"sort"
	"strconv"
	"strings"

	"github.com/pelletier/go-toml/v2/unstable"
)

// positions maps each key path of a spec ("minimizer.0.step.shrink",
// array elements as "minimizer.0.start.1") to the position of its key and
// of its value. go-toml's decoder keeps no positions for values it
// accepted, so errors found after decoding look them up here.
type positions struct {
	file   string
	keys   map[string]Pos
	values map[string]Pos
	tables map[string]Pos // plain [table] headers, by path as written
}

// indexPositions walks the spec with go-toml's unstable parser. It returns
// nil when the document does not parse; the decoder reports that error.
func indexPositions(file string, data []byte) *positions {
	ix := &positions{file: file, keys: map[string]Pos{}, values: map[string]Pos{}, tables: map[string]Pos{}}
	var p unstable.Parser
	p.Reset(data)
	arrayCounts := map[string]int{} // array-table path → elements seen
	var table []string
	// Line and column from the node's byte offset, as the parser's Shape
	// counts them (columns in bytes), by binary search over the line
	// starts: Shape scans the document from the top at every call, which
	// made a spec of many keys quadratic (100 000 keys took two minutes).
	lineStarts := []int{0}
	for i, b := range data {
		if b == '\n' {
			lineStarts = append(lineStarts, i+1)
		}
	}
	pos := func(n *unstable.Node) Pos {
		offset := int(n.Raw.Offset)
		line := sort.Search(len(lineStarts), func(i int) bool { return lineStarts[i] > offset })
		return Pos{File: file, Line: line, Col: offset - lineStarts[line-1] + 1}
	}
	// resolve inserts the current element index after every array-table
	// prefix of a header path: minimizer.step → minimizer.0.step.
	resolve := func(parts []string) []string {
		var out []string
		for i, part := range parts {
			out = append(out, part)
			prefix := strings.Join(parts[:i+1], ".")
			if n, ok := arrayCounts[prefix]; ok {
				out = append(out, strconv.Itoa(n-1))
			}
		}
		return out
	}
	var record func(path []string, value *unstable.Node, keyPos Pos)
	record = func(path []string, value *unstable.Node, keyPos Pos) {
		joined := strings.Join(path, ".")
		ix.keys[joined] = keyPos
		vpos := keyPos
		if value.Raw.Length > 0 {
			vpos = pos(value)
		}
		switch value.Kind {
		case unstable.Array:
			i := 0
			for it := value.Children(); it.Next(); i++ {
				elem := it.Node()
				if i == 0 && value.Raw.Length == 0 {
					vpos = pos(elem)
				}
				record(append(append([]string(nil), path...), strconv.Itoa(i)), elem, pos(elem))
			}
		case unstable.InlineTable:
			for it := value.Children(); it.Next(); {
				kv := it.Node()
				sub, first := keyParts(kv)
				record(append(append([]string(nil), path...), sub...), kv.Value(), pos(first))
			}
		}
		ix.values[joined] = vpos
	}
	for p.NextExpression() {
		e := p.Expression()
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			parts, first := keyParts(e)
			if e.Kind == unstable.ArrayTable {
				arrayCounts[strings.Join(parts, ".")]++
			} else {
				ix.tables[strings.Join(parts, ".")] = pos(first)
			}
			table = resolve(parts)
			ix.keys[strings.Join(table, ".")] = pos(first)
		case unstable.KeyValue:
			parts, first := keyParts(e)
			record(append(append([]string(nil), table...), parts...), e.Value(), pos(first))
		}
	}
	if p.Error() != nil {
		return nil
	}
	return ix
}

// keyParts returns the parts of a node's (possibly dotted) key and its
// first part's node.
func keyParts(n *unstable.Node) ([]string, *unstable.Node) {
	var parts []string
	var first *unstable.Node
	for it := n.Key(); it.Next(); {
		k := it.Node()
		if first == nil {
			first = k
		}
		parts = append(parts, string(k.Data))
	}
	return parts, first
}

// key returns the position of a key, falling back to its nearest
// enclosing table, then to the top of the file.
func (ix *positions) key(path string) Pos {
	for {
		if p, ok := ix.keys[path]; ok {
			return p
		}
		i := strings.LastIndexByte(path, '.')
		if i < 0 {
			return Pos{File: ix.file, Line: 1, Col: 1}
		}
		path = path[:i]
	}
}

// value returns the position of a key's value, or of the key.
func (ix *positions) value(path string) Pos {
	if p, ok := ix.values[path]; ok {
		return p
	}
	return ix.key(path)
}
