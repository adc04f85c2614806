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
	"strconv"
	"strings"
	"sync"

	"tidesift/rank"
)

// WriteJSON writes the machine-readable ranking document: the JSON form of r
// as its struct tags define it (the contract), indented by two spaces and
// ended by a newline. Map keys are sorted, so equal Results give equal bytes.
//
// A NaN or ±Inf number (a quantity a sample could not compute) is written as
// null rather than failing the whole document as encoding/json would; a
// consumer reads null as "not available". Otherwise the output is byte for
// byte what json.MarshalIndent(r, "", "  ") gives, plus the newline.
func WriteJSON(w io.Writer, r *rank.Result) error {
	if r == nil {
		return errors.New("write json: no ranking result")
	}
	e := jsonEncoder{buf: make([]byte, 0, 4096+2048*len(r.Targets))}
	if err := e.value(reflect.ValueOf(r).Elem(), 0); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	e.buf = append(e.buf, '\n')
	if _, err := w.Write(e.buf); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	return nil
}

var (
	jsonMarshalerType = reflect.TypeFor[json.Marshaler]()
	textMarshalerType = reflect.TypeFor[encoding.TextMarshaler]()
)

// jsonEncoder follows encoding/json's rules for the kinds a Result holds
// (structs with tags, "-", omitempty, embedded structs, string-keyed maps,
// slices, pointers, marshalers), indents as json.MarshalIndent does, and
// writes null for non-finite floats.
type jsonEncoder struct {
	buf []byte
}

func (e *jsonEncoder) newline(depth int) {
	e.buf = append(e.buf, '\n')
	for range depth {
		e.buf = append(e.buf, ' ', ' ')
	}
}

func (e *jsonEncoder) value(v reflect.Value, depth int) error {
	if !v.IsValid() {
		e.buf = append(e.buf, "null"...)
		return nil
	}
	t := v.Type()
	if t.Implements(jsonMarshalerType) || t.Implements(textMarshalerType) {
		if (v.Kind() == reflect.Pointer || v.Kind() == reflect.Interface) && v.IsNil() {
			e.buf = append(e.buf, "null"...)
			return nil
		}
		return e.marshal(v.Interface(), depth)
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		e.float(v.Float(), t.Bits())
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		e.buf = strconv.AppendInt(e.buf, v.Int(), 10)
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		e.buf = strconv.AppendUint(e.buf, v.Uint(), 10)
	case reflect.Bool:
		e.buf = strconv.AppendBool(e.buf, v.Bool())
	case reflect.String:
		return e.marshal(v.String(), depth)
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			e.buf = append(e.buf, "null"...)
			return nil
		}
		return e.value(v.Elem(), depth)
	case reflect.Struct:
		e.buf = append(e.buf, '{')
		n, err := e.fields(v, depth, 0)
		if err != nil {
			return err
		}
		if n > 0 {
			e.newline(depth)
		}
		e.buf = append(e.buf, '}')
	case reflect.Map:
		if v.IsNil() {
			e.buf = append(e.buf, "null"...)
			return nil
		}
		if t.Key().Kind() != reflect.String {
			return e.marshal(v.Interface(), depth)
		}
		keys := v.MapKeys()
		sort.Slice(keys, func(i, j int) bool { return keys[i].String() < keys[j].String() })
		e.buf = append(e.buf, '{')
		for i, k := range keys {
			if i > 0 {
				e.buf = append(e.buf, ',')
			}
			e.newline(depth + 1)
			if err := e.marshal(k.String(), depth+1); err != nil {
				return err
			}
			e.buf = append(e.buf, ':', ' ')
			if err := e.value(v.MapIndex(k), depth+1); err != nil {
				return fmt.Errorf("%s: %w", k.String(), err)
			}
		}
		if len(keys) > 0 {
			e.newline(depth)
		}
		e.buf = append(e.buf, '}')
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && v.IsNil() {
			e.buf = append(e.buf, "null"...)
			return nil
		}
		if t.Elem().Kind() == reflect.Uint8 {
			return e.marshal(v.Interface(), depth)
		}
		e.buf = append(e.buf, '[')
		for i := 0; i < v.Len(); i++ {
			if i > 0 {
				e.buf = append(e.buf, ',')
			}
			e.newline(depth + 1)
			if err := e.value(v.Index(i), depth+1); err != nil {
				return fmt.Errorf("[%d]: %w", i, err)
			}
		}
		if v.Len() > 0 {
			e.newline(depth)
		}
		e.buf = append(e.buf, ']')
	default:
		return e.marshal(v.Interface(), depth)
	}
	return nil
}

// float writes f as encoding/json does ('f' notation between 1e-6 and 1e21,
// 'e' with a short exponent outside), or null when it is not finite.
func (e *jsonEncoder) float(f float64, bits int) {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		e.buf = append(e.buf, "null"...)
		return
	}
	format := byte('f')
	if abs := math.Abs(f); abs != 0 {
		if bits == 64 && (abs < 1e-6 || abs >= 1e21) || bits == 32 && (float32(abs) < 1e-6 || float32(abs) >= 1e21) {
			format = 'e'
		}
	}
	e.buf = strconv.AppendFloat(e.buf, f, format, -1, bits)
	if format == 'e' {
		// Clean up e-09 to e-9, as encoding/json does.
		if n := len(e.buf); n >= 4 && e.buf[n-4] == 'e' && e.buf[n-3] == '-' && e.buf[n-2] == '0' {
			e.buf[n-2] = e.buf[n-1]
			e.buf = e.buf[:n-1]
		}
	}
}

// marshal writes x with encoding/json, re-indented to depth.
func (e *jsonEncoder) marshal(x any, depth int) error {
	b, err := json.Marshal(x)
	if err != nil {
		return err
	}
	if len(b) > 0 && (b[0] == '{' || b[0] == '[') {
		var out bytes.Buffer
		if err := json.Indent(&out, b, strings.Repeat("  ", depth), "  "); err != nil {
			return err
		}
		b = out.Bytes()
	}
	e.buf = append(e.buf, b...)
	return nil
}

// jsonField is one struct field as encoding/json sees it.
type jsonField struct {
	index     int
	name      []byte // quoted name
	omitEmpty bool
	embedded  bool // an untagged embedded struct (or pointer to one): its fields are inlined
}

var fieldCache sync.Map // reflect.Type → []jsonField

func jsonFields(t reflect.Type) []jsonField {
	if fs, ok := fieldCache.Load(t); ok {
		return fs.([]jsonField)
	}
	var fs []jsonField
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		tag := sf.Tag.Get("json")
		if tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		if sf.Anonymous && name == "" {
			ft := sf.Type
			if ft.Kind() == reflect.Pointer {
				ft = ft.Elem()
			}
			if ft.Kind() == reflect.Struct {
				fs = append(fs, jsonField{index: i, embedded: true})
				continue
			}
		}
		if !sf.IsExported() {
			continue
		}
		if name == "" {
			name = sf.Name
		}
		quoted, _ := json.Marshal(name)
		fs = append(fs, jsonField{index: i, name: quoted, omitEmpty: strings.Contains(","+opts+",", ",omitempty,")})
	}
	fieldCache.Store(t, fs)
	return fs
}

// fields writes v's fields after n already written and returns the new count.
func (e *jsonEncoder) fields(v reflect.Value, depth, n int) (int, error) {
	for _, f := range jsonFields(v.Type()) {
		fv := v.Field(f.index)
		if f.embedded {
			if fv.Kind() == reflect.Pointer {
				if fv.IsNil() {
					continue
				}
				fv = fv.Elem()
			}
			var err error
			if n, err = e.fields(fv, depth, n); err != nil {
				return n, err
			}
			continue
		}
		if f.omitEmpty && isEmptyValue(fv) {
			continue
		}
		if n > 0 {
			e.buf = append(e.buf, ',')
		}
		n++
		e.newline(depth + 1)
		e.buf = append(e.buf, f.name...)
		e.buf = append(e.buf, ':', ' ')
		if err := e.value(fv, depth+1); err != nil {
			return n, fmt.Errorf("%s: %w", f.name, err)
		}
	}
	return n, nil
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
