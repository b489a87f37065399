package brackets

import (
	"fmt"
	"strings"
	"testing"
)

// TestParse rebuilds each tree as text from the calls to join: a group
// node is numbered from n upward, and its record lists its members.
func TestParse(t *testing.T) {
	for _, tc := range []struct {
		s       string
		n       int
		want    string // groups in the order joined, then the root
		wantErr string
	}{
		{s: "3", n: 4, want: "root 3"},
		{s: "(0,1)", n: 2, want: "2=[0 1] root 2"},
		{s: "((0,1),2,(3,4))", n: 5, want: "5=[0 1] 6=[3 4] 7=[5 2 6] root 7"},
		{s: "((10,2),(0,(1,3)))", n: 11, want: "11=[10 2] 12=[1 3] 13=[0 12] 14=[11 13] root 14"},
		{s: "(0,5)", n: 5, wantErr: "bad leaf at 3"},
		{s: "(0,1", n: 2, wantErr: "want ')' at 4"},
		{s: "(0;1)", n: 2, wantErr: "want ')' at 2"},
		{s: "(0,1)2", n: 3, wantErr: "trailing text at 5"},
		{s: "", n: 1, wantErr: "bad leaf at 0"},
		{s: "(,1)", n: 2, wantErr: "bad leaf at 1"},
	} {
		t.Run(tc.s, func(t *testing.T) {
			var b strings.Builder
			next := int32(tc.n)
			root, err := Parse(tc.s, tc.n, func(kids []int32) int32 {
				fmt.Fprintf(&b, "%d=%v ", next, kids)
				next++
				return next - 1
			})
			if tc.wantErr != "" {
				if err == nil || !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("err = %v, want one saying %q", err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if got := fmt.Sprintf("%sroot %d", b.String(), root); got != tc.want {
				t.Errorf("got %q, want %q", got, tc.want)
			}
		})
	}
}
