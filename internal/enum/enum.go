// Package enum gives every kofn enumeration the same text forms from one
// table: String, MarshalText, UnmarshalText, Parse and the list of values.
//
// An enumeration is a small integer type whose values are 0, 1, ..., k-1,
// each with one canonical name (the published name of a method, or the
// project's word for a choice) and optional extra spellings accepted by
// Parse. A package declares the table once,
//
//	var methodNames = enum.New[Method]("interval.Method", []string{"Wilson", "Clopper-Pearson"},
//		map[string]Method{"cp": ClopperPearson})
//
// and its methods delegate to it:
//
//	func (m Method) String() string                { return methodNames.String(m) }
//	func (m Method) MarshalText() ([]byte, error)  { return methodNames.MarshalText(m) }
//	func (m *Method) UnmarshalText(b []byte) error { return methodNames.UnmarshalText(m, b) }
//	func ParseMethod(s string) (Method, error)     { return methodNames.Parse("interval.ParseMethod", s) }
//	func MethodValues() []Method                   { return methodNames.Values() }
//
// Parsing ignores case and surrounding space, and treats '_' and ' ' as
// '-', so "clopper_pearson", "Clopper Pearson" and "clopper-pearson" all
// name ClopperPearson. A Set is read-only after New and safe for
// concurrent use.
package enum

import (
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"
)

// Set is the name table of one enumeration type T.
type Set[T ~int] struct {
	typ   string       // qualified type name, e.g. "interval.Method"
	names []string     // canonical names, indexed by value
	parse map[string]T // folded spelling -> value (canonical names and aliases)
}

// New returns the table of type T (typ is its qualified name, used in
// messages) whose value i is called names[i]; aliases adds further
// spellings that Parse accepts. It panics on a duplicate spelling: the
// tables are package-level literals, so that is a programming error found
// by any test of the package, never a caller's input.
func New[T ~int](typ string, names []string, aliases map[string]T) *Set[T] {
	s := &Set[T]{typ: typ, names: names, parse: make(map[string]T, len(names)+len(aliases))}
	add := func(name string, v T) {
		key := Fold(name)
		if old, dup := s.parse[key]; dup && old != v {
			panic("enum: " + typ + ": spelling " + strconv.Quote(name) + " names two values")
		}
		s.parse[key] = v
	}
	for i, n := range names {
		add(n, T(i))
	}
	for a, v := range aliases {
		add(a, v)
	}
	return s
}

// Fold is the form in which spellings are compared: lower case, trimmed,
// with '_' and ' ' read as '-'.
func Fold(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	return strings.Map(func(r rune) rune {
		if r == '_' || r == ' ' {
			return '-'
		}
		return r
	}, s)
}

// Valid reports whether v is one of the values.
func (s *Set[T]) Valid(v T) bool { return v >= 0 && int(v) < len(s.names) }

// String returns the canonical name of v, or "Type(v)" for a value
// outside the table.
func (s *Set[T]) String(v T) string {
	if s.Valid(v) {
		return s.names[v]
	}
	return s.typ + "(" + strconv.Itoa(int(v)) + ")"
}

// Names returns the canonical names in value order (a fresh slice).
func (s *Set[T]) Names() []string { return append([]string(nil), s.names...) }

// Values returns every value in order (a fresh slice).
func (s *Set[T]) Values() []T {
	vs := make([]T, len(s.names))
	for i := range vs {
		vs[i] = T(i)
	}
	return vs
}

// MarshalText encodes v by its canonical name; a value outside the table
// is an error (it would not decode).
func (s *Set[T]) MarshalText(v T) ([]byte, error) {
	if !s.Valid(v) {
		return nil, argerr.Invalid(s.typ+".MarshalText", "value", int(v), "is not a "+s.typ+"; use one of "+s.list())
	}
	return []byte(s.names[v]), nil
}

// UnmarshalText decodes any spelling Parse accepts into *v.
func (s *Set[T]) UnmarshalText(v *T, b []byte) error {
	x, err := s.Parse(s.typ+".UnmarshalText", string(b))
	if err != nil {
		return err
	}
	*v = x
	return nil
}

// Parse returns the value named str; fn names the calling function in the
// error, which lists the accepted names.
func (s *Set[T]) Parse(fn, str string) (T, error) {
	if v, ok := s.parse[Fold(str)]; ok {
		return v, nil
	}
	return 0, argerr.Invalid(fn, "s", str, "is not a "+s.typ+"; use one of "+s.list())
}

// Check returns an ErrInvalidArgument error naming argument arg of fn
// when v is not one of the values, and nil otherwise.
func (s *Set[T]) Check(fn, arg string, v T) error {
	if s.Valid(v) {
		return nil
	}
	return argerr.Invalid(fn, arg, int(v), "is not a "+s.typ+"; use one of "+s.list())
}

func (s *Set[T]) list() string { return strings.Join(s.names, ", ") }
