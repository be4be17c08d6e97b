package geo

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"
)

// jnode is one JSON value with where it starts in the input. encoding/json's Unmarshal forgets
// positions and silently keeps the last of duplicate members; surveyors need to be told where,
// so the map is read token by token into this tree first. A node keeps its parent and its
// place in it rather than its JSON Pointer, so that the tree costs a few tens of bytes a value
// and the pointer is spelt only for a message.
type jnode struct {
	parent *jnode
	keys   []string
	vals   []*jnode // object members (in order of keys) or array elements
	str    string   // string value, or the number's text
	off    int64    // byte offset of the value's first character
	idx    int32    // place in the parent's vals
	kind   byte     // 'o' object, 'a' array, 's' string, 'n' number, 'b' bool, 'z' null
	b      bool
}

// pointer returns the node's RFC 6901 JSON Pointer ("" for the document).
func (n *jnode) pointer() string {
	if n == nil || n.parent == nil {
		return ""
	}
	p := n.parent
	if p.kind == 'o' {
		return p.pointer() + "/" + escapePointer(p.keys[n.idx])
	}
	return p.pointer() + "/" + strconv.Itoa(int(n.idx))
}

// member returns the object member named k (names match exactly, unlike orb's decoder).
func (n *jnode) member(k string) *jnode {
	if n == nil || n.kind != 'o' {
		return nil
	}
	for i, key := range n.keys {
		if key == k {
			return n.vals[i]
		}
	}
	return nil
}

// typeName names the JSON type for messages.
func (n *jnode) typeName() string {
	switch n.kind {
	case 'o':
		return "an object"
	case 'a':
		return "an array"
	case 's':
		return "a string"
	case 'n':
		return "a number"
	case 'b':
		return "a boolean"
	}
	return "null"
}

// maxDepth bounds nesting: a map needs six levels, and deep nesting from a broken or hostile
// file must not exhaust the stack.
const maxDepth = 32

// MaxMapValues is the most JSON values (objects, arrays, strings, numbers, booleans, nulls) a
// map may hold. A site map holds a few thousand; the bound keeps the decoded tree within about
// 100 MB whatever a file of MaxMapBytes holds.
const MaxMapValues = 1_000_000

// dupKeyError is a member that appears twice in one object.
type dupKeyError struct {
	off int64
	ptr string
	key string
}

func (e *dupKeyError) Error() string { return fmt.Sprintf("member %q appears twice", e.key) }

// limitError is a map beyond what a site map can be: too many values or too deep.
type limitError struct {
	off int64
	ptr string
	msg string
}

func (e *limitError) Error() string { return e.msg }

type treeReader struct {
	data  []byte
	dec   *json.Decoder
	count int
	// seen holds the member names of seenFor, the large object being read.
	seen    map[string]struct{}
	seenFor *jnode
}

// dupScan is the member count up to which duplicates are found by comparing with each
// earlier name; larger objects use a set, so that the check stays linear.
const dupScan = 16

// parseTree reads one JSON document into a tree of positioned values.
func parseTree(data []byte) (*jnode, error) {
	t := &treeReader{data: data, dec: json.NewDecoder(bytes.NewReader(data))}
	t.dec.UseNumber()
	root, err := t.value(nil, 0, 0)
	if err != nil {
		return nil, err
	}
	if _, err := t.dec.Token(); err != io.EOF {
		return nil, &json.SyntaxError{Offset: t.dec.InputOffset()}
	}
	return root, nil
}

// start returns the offset of the next value: past white space and the ':' or ',' that the
// decoder has not consumed yet.
func (t *treeReader) start() int64 {
	off := t.dec.InputOffset()
	for off < int64(len(t.data)) {
		switch t.data[off] {
		case ' ', '\t', '\r', '\n', ':', ',':
			off++
			continue
		}
		break
	}
	return off
}

func (t *treeReader) value(parent *jnode, idx, depth int) (*jnode, error) {
	n := &jnode{off: t.start(), parent: parent, idx: int32(idx)}
	if depth > maxDepth {
		return nil, &limitError{off: n.off, ptr: n.pointer(),
			msg: fmt.Sprintf("values nested more than %d deep; a map needs six levels (collection, features, feature, geometry, coordinates, ring, position)", maxDepth)}
	}
	t.count++
	if t.count > MaxMapValues {
		return nil, &limitError{off: n.off, ptr: n.pointer(),
			msg: fmt.Sprintf("more than %d JSON values; a site map holds a few thousand (roof faces, obstructions and their corners)", MaxMapValues)}
	}
	tok, err := t.dec.Token()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, io.ErrUnexpectedEOF
		}
		return nil, err
	}
	switch v := tok.(type) {
	case json.Delim:
		switch v {
		case '{':
			n.kind = 'o'
			for t.dec.More() {
				koff := t.start()
				kt, err := t.dec.Token()
				if err != nil {
					return nil, err
				}
				k, ok := kt.(string)
				if !ok {
					return nil, &json.SyntaxError{Offset: koff}
				}
				if t.duplicate(n, k) {
					return nil, &dupKeyError{off: koff, ptr: n.pointer() + "/" + escapePointer(k), key: k}
				}
				n.keys = append(n.keys, k)
				c, err := t.value(n, len(n.vals), depth+1)
				if err != nil {
					return nil, err
				}
				n.vals = append(n.vals, c)
			}
		case '[':
			n.kind = 'a'
			features := depth == 1 && parent.kind == 'o' && parent.keys[idx] == "features"
			for t.dec.More() {
				if features && len(n.vals) == maxFeatures {
					// Far beyond any site: count the rest without keeping them, so that the
					// message can say how many there are.
					count, err := t.skipRest()
					if err != nil {
						return nil, err
					}
					return nil, &limitError{off: n.off, ptr: n.pointer(),
						msg: fmt.Sprintf("%d features; a site map has at most %d", maxFeatures+count, maxFeatures)}
				}
				c, err := t.value(n, len(n.vals), depth+1)
				if err != nil {
					return nil, err
				}
				n.vals = append(n.vals, c)
			}
		default:
			return nil, &json.SyntaxError{Offset: n.off}
		}
		if _, err := t.dec.Token(); err != nil { // the closing delimiter
			if errors.Is(err, io.EOF) {
				return nil, io.ErrUnexpectedEOF
			}
			return nil, err
		}
	case string:
		n.kind, n.str = 's', v
	case json.Number:
		n.kind, n.str = 'n', string(v)
	case bool:
		n.kind, n.b = 'b', v
	case nil:
		n.kind = 'z'
	}
	return n, nil
}

// skipRest reads the remaining values of the array being read, up to its closing bracket
// (left unread), and returns how many there were.
func (t *treeReader) skipRest() (int, error) {
	count := 0
	for t.dec.More() {
		var skip json.RawMessage
		if err := t.dec.Decode(&skip); err != nil {
			return 0, err
		}
		count++
	}
	return count, nil
}

// duplicate reports whether object n already has a member named k. Small objects compare
// with each name; from dupScan members on, a set of the names is kept while the object is
// read (objects nest, so the set is rebuilt when a nested object has used it).
func (t *treeReader) duplicate(n *jnode, k string) bool {
	if len(n.keys) < dupScan {
		return slices.Contains(n.keys, k)
	}
	if t.seen == nil {
		t.seen = map[string]struct{}{}
	}
	if len(t.seen) != len(n.keys) || t.seenFor != n {
		clear(t.seen)
		for _, key := range n.keys {
			t.seen[key] = struct{}{}
		}
		t.seenFor = n
	}
	if _, ok := t.seen[k]; ok {
		return true
	}
	t.seen[k] = struct{}{}
	return false
}

func escapePointer(k string) string {
	return strings.ReplaceAll(strings.ReplaceAll(k, "~", "~0"), "/", "~1")
}

// lineCol turns a byte offset into a 1-based line and a 1-based column counted in characters.
func lineCol(data []byte, off int64) (line, col int) {
	if off < 0 {
		return 0, 0
	}
	if off > int64(len(data)) {
		off = int64(len(data))
	}
	head := data[:off]
	line = 1 + bytes.Count(head, []byte{'\n'})
	last := bytes.LastIndexByte(head, '\n')
	return line, 1 + utf8.RuneCount(head[last+1:])
}
