package geo

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
)

// jnode is one JSON value with where it starts in the input. encoding/json's Unmarshal forgets
// positions and silently keeps the last of duplicate members; surveyors need to be told where,
// so the map is read token by token into this tree first.
type jnode struct {
	off  int64  // byte offset of the value's first character
	ptr  string // RFC 6901 pointer
	kind byte   // 'o' object, 'a' array, 's' string, 'n' number, 'b' bool, 'z' null
	keys []string
	vals []*jnode // object members (in order of keys) or array elements
	str  string   // string value, or the number's text
	b    bool
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

// maxDepth bounds nesting: a map needs five levels, and deep nesting from a broken or hostile
// file must not exhaust the stack.
const maxDepth = 32

// dupKeyError is a member that appears twice in one object.
type dupKeyError struct {
	off int64
	ptr string
	key string
}

func (e *dupKeyError) Error() string { return fmt.Sprintf("member %q appears twice", e.key) }

type treeReader struct {
	data []byte
	dec  *json.Decoder
}

// parseTree reads one JSON document into a tree of positioned values.
func parseTree(data []byte) (*jnode, error) {
	t := &treeReader{data: data, dec: json.NewDecoder(bytes.NewReader(data))}
	t.dec.UseNumber()
	root, err := t.value("", 0)
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

func (t *treeReader) value(ptr string, depth int) (*jnode, error) {
	if depth > maxDepth {
		return nil, &json.SyntaxError{Offset: t.dec.InputOffset()}
	}
	n := &jnode{off: t.start(), ptr: ptr}
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
				for _, seen := range n.keys {
					if seen == k {
						return nil, &dupKeyError{off: koff, ptr: ptr + "/" + escapePointer(k), key: k}
					}
				}
				c, err := t.value(ptr+"/"+escapePointer(k), depth+1)
				if err != nil {
					return nil, err
				}
				n.keys = append(n.keys, k)
				n.vals = append(n.vals, c)
			}
		case '[':
			n.kind = 'a'
			for i := 0; t.dec.More(); i++ {
				c, err := t.value(ptr+"/"+strconv.Itoa(i), depth+1)
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
