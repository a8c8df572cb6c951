// Package jsonfloat marshals result structs to JSON with an explicit
// encoding of the float64 values that encoding/json rejects: +Inf, -Inf and
// NaN become the strings "+Inf", "-Inf" and "NaN"; finite values are JSON
// numbers in their shortest round-trip form. Field names, order, json tags
// ("name", "-", omitempty) and nested structs, slices, maps and pointers are
// handled as encoding/json does; types with their own MarshalJSON keep it.
//
// A result type uses it as
//
//	func (r Result) MarshalJSON() ([]byte, error) {
//		type plain Result // drops the method, avoiding recursion
//		return jsonfloat.Marshal(plain(r))
//	}
package jsonfloat

import (
	"bytes"
	"encoding/json"
	"math"
	"reflect"
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

var marshalerType = reflect.TypeFor[json.Marshaler]()

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
		t := v.Type()
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
			fv := v.Field(i)
			if strings.Contains(opts, "omitempty") && fv.IsZero() {
				continue
			}
			if !first {
				buf.WriteByte(',')
			}
			first = false
			key, _ := json.Marshal(name)
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
	default:
		b, err := json.Marshal(v.Interface())
		if err != nil {
			return err
		}
		buf.Write(b)
	}
	return nil
}
