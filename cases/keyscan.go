package cases

import (
	"fmt"
	"strings"
)

// A keyLoc is a key, or a table header, found in the source text.
type keyLoc struct {
	pieces []string // the key's pieces without array indices: sphere, radius
	index  []int    // per piece: 1-based index into an array of tables, or 0
	line   int      // 1-based
}

// displayName joins the first n pieces, with the array indices of arrays of
// tables, as in "sphere[2].radius". The index of piece n-1 is shown only
// when lastIndex is true.
func (l keyLoc) displayName(n int, lastIndex bool) string {
	var b strings.Builder
	for i := range n {
		if i > 0 {
			b.WriteByte('.')
		}
		b.WriteString(quoteKeyPiece(l.pieces[i]))
		if l.index[i] > 0 && (i < n-1 || lastIndex) {
			fmt.Fprintf(&b, "[%d]", l.index[i])
		}
	}
	return b.String()
}

func quoteKeyPiece(p string) string {
	if p == "" {
		return `""`
	}
	for _, r := range p {
		if !isBareKeyChar(byte(r)) || r > 127 {
			return fmt.Sprintf("%q", p)
		}
	}
	return p
}

func isBareKeyChar(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

// scanKeys finds the line of every key and table header in a TOML document
// that the toml library has already accepted. It tracks the current
// [table] or [[array]] header (numbering the elements of arrays of
// tables), splits dotted keys, and descends into inline tables and arrays
// of inline tables. It is a locator, not a validator: on anything it does
// not understand it skips to the next line.
func scanKeys(src string) []keyLoc {
	s := &keyScanner{src: src, line: 1, arrays: make(map[string]int)}
	s.run()
	return s.out
}

type keyScanner struct {
	src    string
	pos    int
	line   int
	out    []keyLoc
	prefix []string // current table
	prefIx []int
	arrays map[string]int // plain path of an array of tables -> current element (1-based)
}

func (s *keyScanner) eof() bool { return s.pos >= len(s.src) }

func (s *keyScanner) peek() byte {
	if s.eof() {
		return 0
	}
	return s.src[s.pos]
}

func (s *keyScanner) next() byte {
	c := s.src[s.pos]
	s.pos++
	if c == '\n' {
		s.line++
	}
	return c
}

func (s *keyScanner) skipBlank() {
	for !s.eof() && (s.peek() == ' ' || s.peek() == '\t' || s.peek() == '\r') {
		s.pos++
	}
}

// skipBlankLines skips blanks, newlines and comments.
func (s *keyScanner) skipBlankLines() {
	for !s.eof() {
		switch s.peek() {
		case ' ', '\t', '\r', '\n':
			s.next()
		case '#':
			s.skipLine()
		default:
			return
		}
	}
}

// skipLine skips to the start of the next line.
func (s *keyScanner) skipLine() {
	for !s.eof() && s.peek() != '\n' {
		s.pos++
	}
	if !s.eof() {
		s.next()
	}
}

func (s *keyScanner) run() {
	for {
		s.skipBlankLines()
		if s.eof() {
			return
		}
		start := s.pos
		if s.peek() == '[' {
			s.header()
		} else {
			s.keyValue(s.prefix, s.prefIx)
		}
		s.skipBlank()
		if s.peek() == '#' || s.peek() == '\n' || s.pos == start {
			s.skipLine()
		}
	}
}

// header reads [table] or [[array]].
func (s *keyScanner) header() {
	line := s.line
	s.next()
	array := s.peek() == '['
	if array {
		s.next()
	}
	key, ok := s.key()
	if !ok {
		s.skipLine()
		return
	}
	s.skipBlank()
	for s.peek() == ']' {
		s.next()
	}
	index := make([]int, len(key))
	for i := range key {
		path := strings.Join(key[:i+1], "\x00")
		if array && i == len(key)-1 {
			s.arrays[path]++
			// A new element starts afresh any arrays nested in it.
			for p := range s.arrays {
				if strings.HasPrefix(p, path+"\x00") {
					delete(s.arrays, p)
				}
			}
		}
		index[i] = s.arrays[path]
	}
	s.prefix, s.prefIx = key, index
	s.out = append(s.out, keyLoc{pieces: key, index: index, line: line})
}

// keyValue reads key = value under the given table.
func (s *keyScanner) keyValue(prefix []string, prefIx []int) {
	line := s.line
	key, ok := s.key()
	if !ok {
		s.skipLine()
		return
	}
	s.skipBlank()
	if s.peek() != '=' {
		s.skipLine()
		return
	}
	s.next()
	pieces := append(append([]string(nil), prefix...), key...)
	index := append(append([]int(nil), prefIx...), make([]int, len(key))...)
	s.out = append(s.out, keyLoc{pieces: pieces, index: index, line: line})
	s.value(pieces, index)
}

// key reads a possibly dotted key of bare and quoted pieces.
func (s *keyScanner) key() ([]string, bool) {
	var key []string
	for {
		s.skipBlank()
		var piece string
		switch c := s.peek(); {
		case c == '"' || c == '\'':
			p, ok := s.quoted(c)
			if !ok {
				return nil, false
			}
			piece = p
		case isBareKeyChar(c):
			start := s.pos
			for !s.eof() && isBareKeyChar(s.peek()) {
				s.pos++
			}
			piece = s.src[start:s.pos]
		default:
			return nil, false
		}
		key = append(key, piece)
		s.skipBlank()
		if s.peek() != '.' {
			return key, true
		}
		s.next()
	}
}

// quoted reads a one-line basic ("...") or literal ('...') string and
// returns its content, with the common escapes of basic strings undone.
func (s *keyScanner) quoted(q byte) (string, bool) {
	s.next()
	var b strings.Builder
	for !s.eof() {
		c := s.next()
		switch {
		case c == q:
			return b.String(), true
		case c == '\n':
			return "", false
		case c == '\\' && q == '"' && !s.eof():
			e := s.next()
			switch e {
			case 'n':
				b.WriteByte('\n')
			case 't':
				b.WriteByte('\t')
			default:
				b.WriteByte(e)
			}
		default:
			b.WriteByte(c)
		}
	}
	return "", false
}

// value skips one value, recording the keys of inline tables in it. key
// and index name the key the value belongs to.
func (s *keyScanner) value(key []string, index []int) {
	s.skipBlank()
	switch c := s.peek(); c {
	case '"', '\'':
		if strings.HasPrefix(s.src[s.pos:], strings.Repeat(string(c), 3)) {
			s.multiline(c)
		} else {
			s.quoted(c)
		}
	case '[':
		s.array(key, index)
	case '{':
		s.inlineTable(key, index)
	default:
		for !s.eof() && !strings.ContainsRune(",]}#\n", rune(s.peek())) {
			s.pos++
		}
	}
}

// multiline skips a multi-line string delimited by three q's.
func (s *keyScanner) multiline(q byte) {
	s.pos += 3
	delim := strings.Repeat(string(q), 3)
	for !s.eof() {
		if strings.HasPrefix(s.src[s.pos:], delim) {
			s.pos += 3
			// Up to two more quotes may end the content.
			for i := 0; i < 2 && s.peek() == q; i++ {
				s.pos++
			}
			return
		}
		if s.next() == '\\' && q == '"' && !s.eof() {
			s.next()
		}
	}
}

// array skips an array. An array of inline tables is an array of tables:
// its elements are numbered like [[key]] elements.
func (s *keyScanner) array(key []string, index []int) {
	s.next() // [
	n := 0
	for {
		s.skipBlankLines()
		if s.eof() {
			return
		}
		switch s.peek() {
		case ']':
			s.next()
			return
		case ',':
			s.next()
			continue
		}
		start := s.pos
		if s.peek() == '{' {
			n++
			ix := append([]int(nil), index...)
			ix[len(ix)-1] = n
			s.inlineTable(key, ix)
		} else {
			s.value(key, index)
		}
		if s.pos == start {
			s.next() // make progress on anything unexpected
		}
	}
}

// inlineTable reads { k = v, ... }, recording each key under key.
func (s *keyScanner) inlineTable(key []string, index []int) {
	s.next() // {
	for {
		s.skipBlankLines()
		if s.eof() {
			return
		}
		switch s.peek() {
		case '}':
			s.next()
			return
		case ',':
			s.next()
			continue
		}
		start := s.pos
		s.keyValue(key, index)
		if s.pos == start {
			s.next()
		}
	}
}
