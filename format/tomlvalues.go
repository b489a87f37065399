package format

import (
	"fmt"
	"strings"
	"time"
)

// Reading decoded TOML values with messages that say what was expected.

// tomlType names the kind of a decoded value for error messages.
func tomlType(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a number with a fraction"
	case bool:
		return "a boolean"
	case time.Time:
		return "a date or time"
	case []map[string]any:
		return "a list of tables"
	case []any:
		return "an array"
	case map[string]any:
		return "a table"
	}
	return fmt.Sprintf("a %T", v)
}

// asStrings reads an array of strings; it says what is wrong otherwise.
func asStrings(v any) ([]string, string) {
	arr, ok := v.([]any)
	if !ok {
		return nil, "must be an array of strings, not " + tomlType(v)
	}
	out := make([]string, len(arr))
	for i, x := range arr {
		s, ok := x.(string)
		if !ok {
			return nil, fmt.Sprintf("must be an array of strings; element %d is %s", i+1, tomlType(x))
		}
		out[i] = s
	}
	return out, ""
}

// asDate reads a date written as a TOML local date (2026-11-30) or as a
// string ("2026-11-30") and returns it as YYYY-MM-DD.
func asDate(v any) (string, string) {
	switch v := v.(type) {
	case string:
		if !validDate(v) {
			return "", fmt.Sprintf("date %q is not a calendar date written YYYY-MM-DD", clip(v))
		}
		return v, ""
	case time.Time:
		if v.Location().String() != "date-local" {
			return "", "date must be a day written YYYY-MM-DD, without a time"
		}
		return v.Format(time.DateOnly), ""
	}
	return "", "date must be a day written YYYY-MM-DD, not " + tomlType(v)
}

// validDate reports whether s is a real calendar day written YYYY-MM-DD.
func validDate(s string) bool {
	if len(s) != 10 {
		return false
	}
	t, err := time.Parse(time.DateOnly, s)
	return err == nil && t.Format(time.DateOnly) == s
}

// hasControl reports whether s holds a control character other than
// those listed in allowed.
func hasControl(s string, allowed string) bool {
	for _, r := range s {
		if (r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0)) && !strings.ContainsRune(allowed, r) {
			return true
		}
	}
	return false
}
