package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
)

// JSON encodes v indented, with a trailing newline. A non-finite number in
// v is an error, not invalid JSON.
func JSON(v any) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	if err := enc.Encode(v); err != nil {
		return nil, fmt.Errorf("encoding the result: %w", err)
	}
	return b.Bytes(), nil
}

// WriteJSON writes v as JSON to w.
func WriteJSON(w io.Writer, v any) error {
	b, err := JSON(v)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}
