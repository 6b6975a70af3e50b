package topology

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
)

// UnmarshalJSON decodes a circuit ({"kind", "stage", "parts"}) and checks
// it: the kind must realize the stage, the parts must be the kind's
// template parts in order, with positive finite values. Anything else is an
// error wrapping ErrParts (ErrKind for a kind that does not realize the
// stage; ErrStage for a malformed stage), so a decoded circuit is always one
// that AtHz, WriteSPICE and the series layer can use.
//
// Decoding is strict, as in package filter: an unknown field is an error.
func (c *Circuit) UnmarshalJSON(b []byte) error {
	type plain Circuit // no methods: avoids recursion
	var p plain
	if err := strict(b, &p); err != nil {
		return fmt.Errorf("topology: circuit JSON: %w: %w", ErrParts, err)
	}
	v := Circuit(p)
	if _, err := v.design(); err != nil {
		return fmt.Errorf("topology: circuit JSON: %w", err)
	}
	for _, part := range v.Parts {
		if !(part.Value > 0) || math.IsInf(part.Value, 0) {
			return fmt.Errorf("topology: circuit JSON: part %s = %g not positive and finite: %w", part.Ref, part.Value, ErrParts)
		}
	}
	*c = v
	return nil
}

// UnmarshalJSON decodes a chain ({"circuits": [...]}) strictly (an unknown
// field is an error wrapping ErrParts), each circuit as Circuit.UnmarshalJSON
// checks it.
func (c *Chain) UnmarshalJSON(b []byte) error {
	type plain Chain
	var p plain
	if err := strict(b, &p); err != nil {
		if errors.Is(err, ErrParts) || errors.Is(err, ErrKind) || errors.Is(err, ErrStage) {
			return err
		}
		return fmt.Errorf("topology: chain JSON: %w: %w", ErrParts, err)
	}
	*c = Chain(p)
	return nil
}

// strict decodes b into v with unknown fields refused and nothing after the
// value.
func strict(b []byte, v any) error {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return err
	}
	if dec.More() {
		return errors.New("data after the JSON value")
	}
	return nil
}
