package schema

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"testing"
)

// sampleState has one value of every uncertainty kind, both statuses, a
// repeated source (encoded once) and an empty one.
func sampleState() []StateValue {
	return []StateValue{
		{Code: 1, Param: Param{Value: 1.5e22, Unc: Uncertainty{Kind: UncSymmetric, Sigma: 2e20}, Source: "invented table 1", Status: StatusMeasured, Revision: 3}},
		{Code: 2, Param: Param{Value: 1.2e6, Unc: Uncertainty{Kind: UncAsymmetric, Plus: 1e4, Minus: 2e4}, Source: "invented table 1", Status: StatusMeasured, Revision: 3}},
		{Code: 5, Param: Param{Value: 0.01, Unc: Uncertainty{Kind: UncRange, Min: 0, Max: 0.02}, Source: "", Status: StatusAssumed, Revision: 1}},
		{Code: 8, Param: Param{Value: 0.004, Unc: Uncertainty{Kind: UncFactor, Factor: 3}, Source: "a later note", Status: StatusMeasured, Revision: 300}},
		{Code: 200, Param: Param{Value: math.SmallestNonzeroFloat64, Source: "a later note", Status: StatusMeasured, Revision: 1 << 40}},
	}
}

func decodeAll(t testing.TB, b []byte) ([]StateValue, error) {
	var out []StateValue
	err := DecodeState(b, nil, func(c uint64, p Param) error {
		out = append(out, StateValue{Code: c, Param: p})
		return nil
	})
	return out, err
}

func TestStateRoundTrip(t *testing.T) {
	for _, vals := range [][]StateValue{nil, sampleState(), sampleState()[:1]} {
		b := AppendState(nil, vals)
		got, err := decodeAll(t, b)
		if err != nil {
			t.Fatalf("decode: %v", err)
		}
		if len(vals) == 0 && len(got) == 0 {
			continue
		}
		if !reflect.DeepEqual(got, vals) {
			t.Errorf("round trip:\n got %+v\nwant %+v", got, vals)
		}
		if again := AppendState(nil, got); !bytes.Equal(again, b) {
			t.Error("re-encoding the decoded state gives other bytes")
		}
	}
}

func TestStateRefusesDamage(t *testing.T) {
	good := AppendState(nil, sampleState())
	tests := []struct {
		name string
		b    []byte
	}{
		{"empty", nil},
		{"other format", append([]byte{StateFormat + 1}, good[1:]...)},
		{"cut short", good[:len(good)-3]},
		{"trailing bytes", append(append([]byte(nil), good...), 0)},
		{"huge count", []byte{StateFormat, 0xff, 0xff, 0x03}},
		{"unknown flag", func() []byte { b := AppendState(nil, sampleState()[:1]); b[3] |= 0x80; return b }()},
		{"unknown kind", func() []byte { b := AppendState(nil, sampleState()[:1]); b[3] = b[3]&^0x07 | 0x07; return b }()},
		{"codes out of order", AppendState(nil, []StateValue{sampleState()[1], sampleState()[0]})},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if _, err := decodeAll(t, tt.b); !errors.Is(err, ErrBadState) {
				t.Errorf("err = %v, want ErrBadState", err)
			}
		})
	}
}

// FuzzDecodeState: no input makes the decoder panic, and whatever it
// accepts re-encodes to the same bytes (the encoding is canonical).
func FuzzDecodeState(f *testing.F) {
	f.Add(AppendState(nil, sampleState()))
	f.Add(AppendState(nil, nil))
	f.Add([]byte{StateFormat, 1, 1, 0})
	f.Fuzz(func(t *testing.T, b []byte) {
		vals, err := decodeAll(t, b)
		if err != nil {
			return
		}
		if again := AppendState(nil, vals); !bytes.Equal(again, b) {
			// Non-canonical spellings (a longer varint, a repeated source
			// written out again) decode too; they must decode alike.
			// Compared as canonical bytes: a NaN value is not equal to
			// itself, but its bits round-trip.
			back, err := decodeAll(t, again)
			if err != nil || !bytes.Equal(AppendState(nil, back), again) {
				t.Errorf("re-encoded state decodes to %+v, %v; want %+v", back, err, vals)
			}
		}
	})
}
