package export

import (
	"bytes"
	"encoding"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"sort"
	"strings"

	"tidesift/rank"
)

// WriteJSON writes the machine-readable ranking document: the JSON form of r
// as its struct tags define it (the contract), indented by two spaces and
// ended by a newline. Map keys are sorted, so equal Results give equal bytes.
//
// A NaN or ±Inf number (a quantity a sample could not compute) is written as
// null rather than failing the whole document as encoding/json would; a
// consumer reads null as "not available". Otherwise the output is byte for
// byte what json.MarshalIndent gives.
func WriteJSON(w io.Writer, r *rank.Result) error {
	if r == nil {
		return errors.New("write json: no ranking result")
	}
	var raw bytes.Buffer
	if err := encodeJSON(&raw, reflect.ValueOf(r).Elem()); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	var out bytes.Buffer
	if err := json.Indent(&out, raw.Bytes(), "", "  "); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	out.WriteByte('\n')
	if _, err := out.WriteTo(w); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	return nil
}

var (
	jsonMarshalerType = reflect.TypeFor[json.Marshaler]()
	textMarshalerType = reflect.TypeFor[encoding.TextMarshaler]()
)

// encodeJSON follows encoding/json's rules for the kinds a Result holds
// (structs with tags, "-", omitempty, string-keyed maps, slices, pointers,
// marshalers) and writes null for non-finite floats.
func encodeJSON(buf *bytes.Buffer, v reflect.Value) error {
	if !v.IsValid() {
		buf.WriteString("null")
		return nil
	}
	t := v.Type()
	if t.Implements(jsonMarshalerType) || t.Implements(textMarshalerType) {
		if (v.Kind() == reflect.Pointer || v.Kind() == reflect.Interface) && v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		return marshalInto(buf, v.Interface())
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		if math.IsNaN(f) || math.IsInf(f, 0) {
			buf.WriteString("null")
			return nil
		}
		return marshalInto(buf, v.Interface())
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		return encodeJSON(buf, v.Elem())
	case reflect.Struct:
		buf.WriteByte('{')
		first := true
		if err := encodeFields(buf, v, &first); err != nil {
			return err
		}
		buf.WriteByte('}')
		return nil
	case reflect.Map:
		if v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		if t.Key().Kind() != reflect.String {
			return marshalInto(buf, v.Interface())
		}
		keys := v.MapKeys()
		sort.Slice(keys, func(i, j int) bool { return keys[i].String() < keys[j].String() })
		buf.WriteByte('{')
		for i, k := range keys {
			if i > 0 {
				buf.WriteByte(',')
			}
			if err := marshalInto(buf, k.String()); err != nil {
				return err
			}
			buf.WriteByte(':')
			if err := encodeJSON(buf, v.MapIndex(k)); err != nil {
				return fmt.Errorf("%s: %w", k.String(), err)
			}
		}
		buf.WriteByte('}')
		return nil
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && v.IsNil() {
			buf.WriteString("null")
			return nil
		}
		if t.Elem().Kind() == reflect.Uint8 {
			return marshalInto(buf, v.Interface())
		}
		buf.WriteByte('[')
		for i := 0; i < v.Len(); i++ {
			if i > 0 {
				buf.WriteByte(',')
			}
			if err := encodeJSON(buf, v.Index(i)); err != nil {
				return fmt.Errorf("[%d]: %w", i, err)
			}
		}
		buf.WriteByte(']')
		return nil
	}
	return marshalInto(buf, v.Interface())
}

func encodeFields(buf *bytes.Buffer, v reflect.Value, first *bool) error {
	t := v.Type()
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		tag := sf.Tag.Get("json")
		if tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		fv := v.Field(i)
		if sf.Anonymous && name == "" {
			ft := sf.Type
			if ft.Kind() == reflect.Pointer {
				if fv.IsNil() {
					continue
				}
				fv, ft = fv.Elem(), ft.Elem()
			}
			if ft.Kind() == reflect.Struct {
				if err := encodeFields(buf, fv, first); err != nil {
					return err
				}
				continue
			}
		}
		if !sf.IsExported() {
			continue
		}
		if name == "" {
			name = sf.Name
		}
		if strings.Contains(","+opts+",", ",omitempty,") && isEmptyValue(fv) {
			continue
		}
		if !*first {
			buf.WriteByte(',')
		}
		*first = false
		if err := marshalInto(buf, name); err != nil {
			return err
		}
		buf.WriteByte(':')
		if err := encodeJSON(buf, fv); err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
	}
	return nil
}

// isEmptyValue is encoding/json's definition of empty for omitempty.
func isEmptyValue(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Array, reflect.Map, reflect.Slice, reflect.String:
		return v.Len() == 0
	case reflect.Bool:
		return !v.Bool()
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return v.Int() == 0
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		return v.Uint() == 0
	case reflect.Float32, reflect.Float64:
		return v.Float() == 0
	case reflect.Interface, reflect.Pointer:
		return v.IsNil()
	}
	return false
}

func marshalInto(buf *bytes.Buffer, x any) error {
	b, err := json.Marshal(x)
	if err != nil {
		return err
	}
	buf.Write(b)
	return nil
}
