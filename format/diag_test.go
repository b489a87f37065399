package format

import "testing"

// A position says no more than is known: a problem with a whole file
// names the file alone, not a line 1 that is not at fault.
func TestPosString(t *testing.T) {
	tests := []struct {
		pos  Pos
		want string
	}{
		{Pos{"items.toml", 12, 7}, "items.toml:12:7"},
		{Pos{"items.toml", 12, 0}, "items.toml:12"},
		{Pos{"items.toml", 0, 0}, "items.toml"},
		{Pos{"items.toml", 0, 5}, "items.toml"},
		{Pos{"items.toml", -1, -1}, "items.toml"},
	}
	for _, tt := range tests {
		if got := tt.pos.String(); got != tt.want {
			t.Errorf("%#v.String() = %q, want %q", tt.pos, got, tt.want)
		}
		if got, want := (Diag{Pos: tt.pos, Msg: "too large"}).String(), tt.want+": too large"; got != want {
			t.Errorf("Diag.String() = %q, want %q", got, want)
		}
	}
}
