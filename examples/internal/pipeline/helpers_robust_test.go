package pipeline_test

import (
	"encoding/json"
	"io"
)

// jsonEncode writes v as JSON with encoding/json (the form a front end
// that builds requests programmatically sends).
func jsonEncode(w io.Writer, v any) error { return json.NewEncoder(w).Encode(v) }
