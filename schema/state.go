package schema

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"
)

// A body's values are stored together, one row of the state table per body
// and revision that changed it (schema version 2). The row's data column is
// the encoding below. One row per body state rather than one per value makes
// a large import several times faster (bench/import.sh), because SQLite's
// cost is mostly per row and per index entry, not per byte.
//
// The encoding (little-endian, varints as in encoding/binary):
//
//	byte     format (StateFormat)
//	uvarint  number of values n
//	n times, in increasing key code:
//	  uvarint  key code (the catalog's key_name table names it)
//	  byte     flags: bits 0–2 the uncertainty kind (UncKind), bit 3 set for
//	           status assumed (clear: measured), bit 4 set when a source
//	           string follows (clear: the source of the value before it,
//	           or "" for the first)
//	  8 bytes  value (IEEE 754 binary64)
//	  8 bytes  per uncertainty field of the kind: σ; +σ then −σ; min then max;
//	           or the factor (none for UncNone)
//	  uvarint  the revision that set the value
//	  [uvarint length, bytes: the source, when flagged]
//
// Equal states encode to equal bytes (the order is fixed), so a state can be
// compared with its predecessor without decoding.

// StateFormat is the first byte of every encoded state.
const StateFormat byte = 1

// Flag bits of an encoded value.
const (
	stateKindMask      = 0x07
	stateAssumed       = 0x08
	stateSourceFollows = 0x10
)

// ErrBadState is wrapped by DecodeState for bytes that are not a state.
var ErrBadState = errors.New("malformed stored state")

// StateValue is one value of an encoded state: its key's code and the
// parameter (Key is left as given; the codec stores Code).
type StateValue struct {
	Code  uint64
	Param Param
}

// AppendState appends the encoding of vals, which must be sorted by Code with
// no code twice, to dst.
func AppendState(dst []byte, vals []StateValue) []byte {
	dst = append(dst, StateFormat)
	dst = binary.AppendUvarint(dst, uint64(len(vals)))
	prevSource := ""
	for _, v := range vals {
		p := &v.Param
		dst = binary.AppendUvarint(dst, v.Code)
		flags := byte(p.Unc.Kind) & stateKindMask
		if p.Status == StatusAssumed {
			flags |= stateAssumed
		}
		if p.Source != prevSource {
			flags |= stateSourceFollows
		}
		dst = append(dst, flags)
		dst = binary.LittleEndian.AppendUint64(dst, math.Float64bits(p.Value))
		for _, x := range uncFields(p.Unc) {
			dst = binary.LittleEndian.AppendUint64(dst, math.Float64bits(x))
		}
		dst = binary.AppendUvarint(dst, uint64(p.Revision))
		if flags&stateSourceFollows != 0 {
			dst = binary.AppendUvarint(dst, uint64(len(p.Source)))
			dst = append(dst, p.Source...)
			prevSource = p.Source
		}
	}
	return dst
}

// uncFields returns the stored fields of an uncertainty, in encoding order.
func uncFields(u Uncertainty) []float64 {
	switch u.Kind {
	case UncSymmetric:
		return []float64{u.Sigma}
	case UncAsymmetric:
		return []float64{u.Plus, u.Minus}
	case UncRange:
		return []float64{u.Min, u.Max}
	case UncFactor:
		return []float64{u.Factor}
	}
	return nil
}

// uncFieldCount is len(uncFields) by kind, without building the slice.
var uncFieldCount = [...]int{UncNone: 0, UncSymmetric: 1, UncAsymmetric: 2, UncRange: 2, UncFactor: 1}

// DecodeState calls f with each value of an encoded state, in code order.
// Param.Key is left empty: the caller names the code. source returns the
// string to use for source bytes (it may intern them); nil copies them.
// A malformed state is reported as an error wrapping ErrBadState, with f
// having seen the values before the damage.
func DecodeState(b []byte, source func([]byte) string, f func(code uint64, p Param) error) error {
	if len(b) == 0 || b[0] != StateFormat {
		if len(b) == 0 {
			return fmt.Errorf("%w: empty", ErrBadState)
		}
		return fmt.Errorf("%w: format %d (want %d)", ErrBadState, b[0], StateFormat)
	}
	if source == nil {
		source = func(s []byte) string { return string(s) }
	}
	pos := 1
	uvarint := func(what string) (uint64, error) {
		x, n := binary.Uvarint(b[pos:])
		if n <= 0 {
			return 0, fmt.Errorf("%w: bad %s at byte %d", ErrBadState, what, pos)
		}
		pos += n
		return x, nil
	}
	float := func(what string) (float64, error) {
		if len(b)-pos < 8 {
			return 0, fmt.Errorf("%w: %s cut short at byte %d", ErrBadState, what, pos)
		}
		x := math.Float64frombits(binary.LittleEndian.Uint64(b[pos:]))
		pos += 8
		return x, nil
	}
	n, err := uvarint("value count")
	if err != nil {
		return err
	}
	if n > uint64(len(b)) { // each value takes at least 11 bytes
		return fmt.Errorf("%w: %d values in %d bytes", ErrBadState, n, len(b))
	}
	src := ""
	var last uint64
	for i := uint64(0); i < n; i++ {
		code, err := uvarint("key code")
		if err != nil {
			return err
		}
		if i > 0 && code <= last {
			return fmt.Errorf("%w: key code %d after %d (want increasing codes)", ErrBadState, code, last)
		}
		last = code
		if pos >= len(b) {
			return fmt.Errorf("%w: flags missing at byte %d", ErrBadState, pos)
		}
		flags := b[pos]
		pos++
		if flags&^(stateKindMask|stateAssumed|stateSourceFollows) != 0 || int(flags&stateKindMask) >= len(uncFieldCount) {
			return fmt.Errorf("%w: flags %#x at byte %d", ErrBadState, flags, pos-1)
		}
		var p Param
		p.Unc.Kind = UncKind(flags & stateKindMask)
		p.Status = StatusMeasured
		if flags&stateAssumed != 0 {
			p.Status = StatusAssumed
		}
		if p.Value, err = float("value"); err != nil {
			return err
		}
		var u [2]float64
		for j := 0; j < uncFieldCount[p.Unc.Kind]; j++ {
			if u[j], err = float("uncertainty"); err != nil {
				return err
			}
		}
		switch p.Unc.Kind {
		case UncSymmetric:
			p.Unc.Sigma = u[0]
		case UncAsymmetric:
			p.Unc.Plus, p.Unc.Minus = u[0], u[1]
		case UncRange:
			p.Unc.Min, p.Unc.Max = u[0], u[1]
		case UncFactor:
			p.Unc.Factor = u[0]
		}
		rev, err := uvarint("revision")
		if err != nil {
			return err
		}
		if rev > math.MaxInt64 {
			return fmt.Errorf("%w: revision %d out of range", ErrBadState, rev)
		}
		p.Revision = int64(rev)
		if flags&stateSourceFollows != 0 {
			l, err := uvarint("source length")
			if err != nil {
				return err
			}
			if l > uint64(len(b)-pos) {
				return fmt.Errorf("%w: source of %d bytes cut short at byte %d", ErrBadState, l, pos)
			}
			src = source(b[pos : pos+int(l)])
			pos += int(l)
		}
		p.Source = src
		if err := f(code, p); err != nil {
			return err
		}
	}
	if pos != len(b) {
		return fmt.Errorf("%w: %d bytes left over", ErrBadState, len(b)-pos)
	}
	return nil
}
