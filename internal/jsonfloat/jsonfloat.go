// Package jsonfloat encodes and decodes kofn's result structs as JSON
// exactly as encoding/json does, except for the float64 values that
// encoding/json rejects: +Inf, -Inf and NaN are written as the strings
// "+Inf", "-Inf" and "NaN" and read back from them. Finite values are JSON
// numbers in their shortest round-trip form.
//
// What it follows from encoding/json: field names from the json tag or the
// Go name, "-" to skip a field, omitempty (false, 0, "", a nil pointer or
// interface, an empty slice, map or array) and omitzero, types with their
// own MarshalJSON / UnmarshalJSON or MarshalText / UnmarshalText (enums)
// keep them, unknown keys are ignored on decoding and key matching falls
// back to a case-insensitive match. What it leaves out: embedded structs
// are not flattened and the ",string" option is not supported; no kofn
// result uses either.
//
// A result type uses it as
//
//	func (r Result) MarshalJSON() ([]byte, error) {
//		type plain Result // drops the methods, avoiding recursion
//		return jsonfloat.Marshal(plain(r))
//	}
//
//	func (r *Result) UnmarshalJSON(b []byte) error {
//		type plain Result
//		return jsonfloat.Unmarshal(b, (*plain)(r))
//	}
package jsonfloat

import (
	"bytes"
	"encoding"
	"encoding/json"
	"errors"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
)

// Marshal returns the JSON encoding of v, with non-finite floats encoded
// as the strings described in the package comment.
func Marshal(v any) ([]byte, error) {
	var buf bytes.Buffer
	if err := encode(&buf, reflect.ValueOf(v), true); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Float returns the JSON text of one float64 under the package's encoding.
func Float(f float64) string {
	switch {
	case math.IsInf(f, 1):
		return `"+Inf"`
	case math.IsInf(f, -1):
		return `"-Inf"`
	case math.IsNaN(f):
		return `"NaN"`
	}
	return strconv.FormatFloat(f, 'g', -1, 64)
}

var (
	marshalerType       = reflect.TypeFor[json.Marshaler]()
	unmarshalerType     = reflect.TypeFor[json.Unmarshaler]()
	textUnmarshalerType = reflect.TypeFor[encoding.TextUnmarshaler]()
)

// field is one encoded struct field.
type field struct {
	index     int
	name      string
	omitEmpty bool
	omitZero  bool
}

// fields returns the encoded fields of struct type t, in order.
func fields(t reflect.Type) []field {
	var fs []field
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		if !sf.IsExported() {
			continue
		}
		name, opts, _ := strings.Cut(sf.Tag.Get("json"), ",")
		if name == "-" && opts == "" {
			continue
		}
		if name == "" {
			name = sf.Name
		}
		f := field{index: i, name: name}
		for _, o := range strings.Split(opts, ",") {
			f.omitEmpty = f.omitEmpty || o == "omitempty"
			f.omitZero = f.omitZero || o == "omitzero"
		}
		fs = append(fs, f)
	}
	return fs
}

// isEmpty is encoding/json's omitempty test.
func isEmpty(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Array, reflect.Map, reflect.Slice, reflect.String:
		return v.Len() == 0
	case reflect.Bool, reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr,
		reflect.Float32, reflect.Float64, reflect.Interface, reflect.Pointer:
		return v.IsZero()
	}
	return false
}

// isZero is encoding/json's omitzero test.
func isZero(v reflect.Value) bool {
	if z, ok := v.Interface().(interface{ IsZero() bool }); ok {
		if v.Kind() == reflect.Pointer && v.IsNil() {
			return true
		}
		return z.IsZero()
	}
	return v.IsZero()
}

func encode(buf *bytes.Buffer, v reflect.Value, top bool) error {
	if !v.IsValid() {
		buf.WriteString("null")
		return nil
	}
	if !top && v.Type().Implements(marshalerType) && (v.Kind() != reflect.Pointer || !v.IsNil()) {
		b, err := json.Marshal(v.Interface())
		if err != nil {
			return err
		}
		buf.Write(b)
		return nil
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		buf.WriteString(Float(v.Float()))
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		return encode(buf, v.Elem(), false)
	case reflect.Struct:
		buf.WriteByte('{')
		first := true
		for _, f := range fields(v.Type()) {
			fv := v.Field(f.index)
			if f.omitEmpty && isEmpty(fv) || f.omitZero && isZero(fv) {
				continue
			}
			if !first {
				buf.WriteByte(',')
			}
			first = false
			key, _ := json.Marshal(f.name)
			buf.Write(key)
			buf.WriteByte(':')
			if err := encode(buf, fv, false); err != nil {
				return err
			}
		}
		buf.WriteByte('}')
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		if v.Type().Elem().Kind() == reflect.Uint8 { // []byte as base64, as encoding/json
			b, err := json.Marshal(v.Interface())
			buf.Write(b)
			return err
		}
		buf.WriteByte('[')
		for i := 0; i < v.Len(); i++ {
			if i > 0 {
				buf.WriteByte(',')
			}
			if err := encode(buf, v.Index(i), false); err != nil {
				return err
			}
		}
		buf.WriteByte(']')
	case reflect.Map:
		if v.Type().Key().Kind() != reflect.String {
			b, err := json.Marshal(v.Interface())
			buf.Write(b)
			return err
		}
		if v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		keys := v.MapKeys()
		slices.SortFunc(keys, func(a, b reflect.Value) int { return strings.Compare(a.String(), b.String()) })
		buf.WriteByte('{')
		for i, k := range keys {
			if i > 0 {
				buf.WriteByte(',')
			}
			kb, _ := json.Marshal(k.String())
			buf.Write(kb)
			buf.WriteByte(':')
			if err := encode(buf, v.MapIndex(k), false); err != nil {
				return err
			}
		}
		buf.WriteByte('}')
	default:
		b, err := json.Marshal(v.Interface())
		if err != nil {
			return err
		}
		buf.Write(b)
	}
	return nil
}

// Unmarshal decodes data into the value v points to, as encoding/json
// does, reading the strings "+Inf", "-Inf" and "NaN" into float fields.
func Unmarshal(data []byte, v any) error {
	rv := reflect.ValueOf(v)
	if rv.Kind() != reflect.Pointer || rv.IsNil() {
		return errors.New("jsonfloat: Unmarshal needs a non-nil pointer")
	}
	return decode(bytes.TrimSpace(data), rv.Elem(), true)
}

// ParseFloat reads one JSON value written by Float.
func ParseFloat(raw []byte) (float64, error) {
	raw = bytes.TrimSpace(raw)
	if len(raw) > 0 && raw[0] == '"' {
		var s string
		if err := json.Unmarshal(raw, &s); err != nil {
			return 0, err
		}
		switch s {
		case "+Inf":
			return math.Inf(1), nil
		case "-Inf":
			return math.Inf(-1), nil
		case "NaN":
			return math.NaN(), nil
		}
		return 0, errors.New("jsonfloat: " + strconv.Quote(s) + " is not a number (only \"+Inf\", \"-Inf\" and \"NaN\" are accepted as strings)")
	}
	f, err := strconv.ParseFloat(string(raw), 64)
	if err != nil {
		return 0, errors.New("jsonfloat: " + strconv.Quote(string(raw)) + " is not a number")
	}
	return f, nil
}

func decode(raw []byte, v reflect.Value, top bool) error {
	if string(raw) == "null" {
		switch v.Kind() {
		case reflect.Pointer, reflect.Slice, reflect.Map, reflect.Interface:
			v.SetZero()
		}
		return nil
	}
	if !top && v.CanAddr() {
		pt := v.Addr().Type()
		if pt.Implements(unmarshalerType) || pt.Implements(textUnmarshalerType) {
			return json.Unmarshal(raw, v.Addr().Interface())
		}
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f, err := ParseFloat(raw)
		if err != nil {
			return err
		}
		v.SetFloat(f)
		return nil
	case reflect.Pointer:
		if v.IsNil() {
			v.Set(reflect.New(v.Type().Elem()))
		}
		return decode(raw, v.Elem(), false)
	case reflect.Struct:
		var obj map[string]json.RawMessage
		if err := json.Unmarshal(raw, &obj); err != nil {
			return err
		}
		for _, f := range fields(v.Type()) {
			r, ok := obj[f.name]
			if !ok {
				for k, kr := range obj {
					if strings.EqualFold(k, f.name) {
						r, ok = kr, true
						break
					}
				}
			}
			if !ok {
				continue
			}
			if err := decode(r, v.Field(f.index), false); err != nil {
				return errors.New("jsonfloat: field " + f.name + ": " + err.Error())
			}
		}
		return nil
	case reflect.Slice:
		if v.Type().Elem().Kind() == reflect.Uint8 {
			return json.Unmarshal(raw, v.Addr().Interface())
		}
		var items []json.RawMessage
		if err := json.Unmarshal(raw, &items); err != nil {
			return err
		}
		s := reflect.MakeSlice(v.Type(), len(items), len(items))
		for i, it := range items {
			if err := decode(it, s.Index(i), false); err != nil {
				return err
			}
		}
		v.Set(s)
		return nil
	case reflect.Array:
		var items []json.RawMessage
		if err := json.Unmarshal(raw, &items); err != nil {
			return err
		}
		for i := 0; i < v.Len(); i++ {
			if i < len(items) {
				if err := decode(items[i], v.Index(i), false); err != nil {
					return err
				}
			} else {
				v.Index(i).SetZero()
			}
		}
		return nil
	case reflect.Map:
		if v.Type().Key().Kind() != reflect.String {
			break
		}
		var obj map[string]json.RawMessage
		if err := json.Unmarshal(raw, &obj); err != nil {
			return err
		}
		if v.IsNil() {
			v.Set(reflect.MakeMapWithSize(v.Type(), len(obj)))
		}
		for k, r := range obj {
			e := reflect.New(v.Type().Elem()).Elem()
			if err := decode(r, e, false); err != nil {
				return err
			}
			v.SetMapIndex(reflect.ValueOf(k).Convert(v.Type().Key()), e)
		}
		return nil
	}
	if !v.CanAddr() {
		return errors.New("jsonfloat: cannot decode into " + v.Type().String())
	}
	return json.Unmarshal(raw, v.Addr().Interface())
}
