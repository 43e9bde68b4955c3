package output

import (
	"encoding/json"
	"fmt"
)

// WriteJSON writes v as indented JSON to path, atomically.
func WriteJSON(path string, v any) error {
	data, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return fmt.Errorf("summary %s: %w", path, err)
	}
	return WriteFileAtomic(path, append(data, '\n'))
}
