package model

import (
	"sort"
	"strconv"
	"strings"

	"github.com/pelletier/go-toml/v2/unstable"
)

// pos is a position in the source: 1-based line and byte column. The zero
// value means unknown.
type pos struct{ line, col int }

// before reports whether p comes strictly before q.
func (p pos) before(q pos) bool {
	return p.line < q.line || p.line == q.line && p.col < q.col
}

type entry struct {
	path string
	at   pos
}

// index maps every key path of a TOML document to the position where it is
// defined. Paths are dotted, with a 1-based index after each entry of an
// array ("region[2].circle.radius", "output.probe[1]"), the same form
// Error.Key uses. The decoder uses the index to place errors it finds after
// decoding (missing keys, invalid values) and to give the TOML library's own
// errors a full key path.
type index struct {
	at      map[string]pos
	entries []entry // sorted by position
	lines   []int   // byte offset of the start of every line
	arrays  map[string]int
}

// buildIndex walks the document with the TOML library's syntax-tree parser.
// It is called only on documents the decoder has accepted, and it never
// fails: on a parser error it keeps what it has indexed so far.
func buildIndex(src []byte) *index {
	ix := &index{at: map[string]pos{}, arrays: map[string]int{}, lines: []int{0}}
	for i, c := range src {
		if c == '\n' {
			ix.lines = append(ix.lines, i+1)
		}
	}
	var p unstable.Parser
	p.Reset(src)
	table := ""
	for p.NextExpression() {
		e := p.Expression()
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			parts, first := keyParts(e)
			if len(parts) == 0 {
				continue
			}
			at := ix.position(first)
			table = ""
			for n, k := range parts {
				path := join(table, k)
				if n == len(parts)-1 && e.Kind == unstable.ArrayTable {
					ix.add(path, at)
					ix.arrays[path]++
					path += "[" + strconv.Itoa(ix.arrays[path]) + "]"
				} else if c := ix.arrays[path]; c > 0 {
					path += "[" + strconv.Itoa(c) + "]"
				}
				table = path
				ix.add(path, at)
			}
		case unstable.KeyValue:
			ix.keyValue(table, e)
		}
	}
	sort.SliceStable(ix.entries, func(i, j int) bool { return ix.entries[i].at.before(ix.entries[j].at) })
	return ix
}

// keyParts returns the parts of a node's key and the offset of its first
// part.
func keyParts(n *unstable.Node) ([]string, int) {
	var parts []string
	first := -1
	it := n.Key()
	for it.Next() {
		k := it.Node()
		if first < 0 {
			first = int(k.Raw.Offset)
		}
		parts = append(parts, string(k.Data))
	}
	return parts, first
}

// keyValue indexes a key = value expression under the table path.
func (ix *index) keyValue(table string, kv *unstable.Node) {
	parts, first := keyParts(kv)
	path := table
	for _, k := range parts {
		path = join(path, k)
		ix.add(path, ix.position(first))
	}
	ix.value(path, kv.Value())
}

// value indexes the inside of an inline table or array stored at path.
func (ix *index) value(path string, v *unstable.Node) {
	switch v.Kind {
	case unstable.InlineTable:
		it := v.Children()
		for it.Next() {
			if c := it.Node(); c.Kind == unstable.KeyValue {
				ix.keyValue(path, c)
			}
		}
	case unstable.Array:
		it := v.Children()
		n := 0
		for it.Next() {
			c := it.Node()
			n++
			ep := path + "[" + strconv.Itoa(n) + "]"
			if off := firstOffset(c); off >= 0 {
				ix.add(ep, ix.position(off))
			}
			ix.value(ep, c)
		}
	}
}

// firstOffset returns the offset of the first node under n that has a
// source range, or −1.
func firstOffset(n *unstable.Node) int {
	if n.Raw.Length > 0 {
		return int(n.Raw.Offset)
	}
	it := n.Children()
	for it.Next() {
		if off := firstOffset(it.Node()); off >= 0 {
			return off
		}
	}
	return -1
}

// position converts a byte offset to a line and column.
func (ix *index) position(off int) pos {
	if off < 0 {
		return pos{}
	}
	l := sort.SearchInts(ix.lines, off+1) - 1
	return pos{line: l + 1, col: off - ix.lines[l] + 1}
}

func (ix *index) add(path string, at pos) {
	if _, ok := ix.at[path]; ok {
		return
	}
	ix.at[path] = at
	ix.entries = append(ix.entries, entry{path, at})
}

// has reports whether key path is defined in the document.
func (ix *index) has(path string) bool {
	_, ok := ix.at[path]
	return ok
}

// find returns the position of path, or of its nearest defined ancestor
// (so a missing key is reported at its table), or the zero pos.
func (ix *index) find(path string) pos {
	for path != "" {
		if p, ok := ix.at[path]; ok {
			return p
		}
		path = parent(path)
	}
	return pos{}
}

// near returns the path of the last key defined at or before position at:
// the key a library error at that position belongs to.
func (ix *index) near(at pos) string {
	i := sort.Search(len(ix.entries), func(i int) bool { return at.before(ix.entries[i].at) })
	if i == 0 {
		return ""
	}
	return ix.entries[i-1].path
}

// join appends key to the dotted path table.
func join(table, key string) string {
	if table == "" {
		return key
	}
	return table + "." + key
}

// parent strips the last part of a path: "a[2].b" → "a[2]", "a[2]" → "a",
// "a" → "".
func parent(path string) string {
	if strings.HasSuffix(path, "]") {
		if i := strings.LastIndexByte(path, '['); i > 0 {
			return path[:i]
		}
	}
	if i := strings.LastIndexByte(path, '.'); i >= 0 {
		return path[:i]
	}
	return ""
}

// lastPart returns the last key of a path without any index.
func lastPart(path string) string {
	for strings.HasSuffix(path, "]") {
		i := strings.LastIndexByte(path, '[')
		if i < 0 {
			break
		}
		path = path[:i]
	}
	if i := strings.LastIndexByte(path, '.'); i >= 0 {
		return path[i+1:]
	}
	return path
}
