package topology

import (
	"encoding/json"
	"fmt"
	"math"
)

// UnmarshalJSON decodes a circuit ({"kind", "stage", "parts"}) and checks
// it: the kind must realize the stage, the parts must be the kind's
// template parts in order, with positive finite values. Anything else is an
// error wrapping ErrParts (ErrKind for a kind that does not realize the
// stage; ErrStage for a malformed stage), so a decoded circuit is always one
// that AtHz, WriteSPICE and the series layer can use.
func (c *Circuit) UnmarshalJSON(b []byte) error {
	type plain Circuit // no methods: avoids recursion
	var p plain
	if err := json.Unmarshal(b, &p); err != nil {
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
