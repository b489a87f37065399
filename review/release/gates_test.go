package release

import (
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review"
)

func TestCheckAudits(t *testing.T) {
	s := format.ReleaseSettings{MinAudits: 3, MaxRejectRate: 0.5}
	for _, tc := range []struct {
		name string
		sum  review.AuditSummary
		want Gate // "" when the gates pass
	}{
		{"too few", review.AuditSummary{Audits: 2, Hi: 0.1}, GateAudits},
		{"too few and rejected", review.AuditSummary{Audits: 2, Rejected: 2, Hi: 1}, GateAudits},
		{"bound too high", review.AuditSummary{Audits: 3, Rejected: 1, Hi: 0.9}, GateRejectRate},
		{"bound at the limit", review.AuditSummary{Audits: 3, Hi: 0.5}, ""},
		{"enough and clean", review.AuditSummary{Audits: 40, Hi: 0.09}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			b := CheckAudits(tc.sum, s)
			switch {
			case tc.want == "" && b != nil:
				t.Errorf("CheckAudits = gate %q, want pass", b.Gate)
			case tc.want != "" && (b == nil || b.Gate != tc.want):
				t.Errorf("CheckAudits = %+v, want gate %q", b, tc.want)
			case b != nil && b.Audits.Audits != tc.sum.Audits:
				t.Errorf("CheckAudits kept %d audits, want %d", b.Audits.Audits, tc.sum.Audits)
			}
		})
	}
}

func TestCheckOpen(t *testing.T) {
	if b := CheckOpen(nil); b != nil {
		t.Errorf("CheckOpen(nil) = %+v, want pass", b)
	}
	open := []string{"reviews/open/a.outline"}
	if b := CheckOpen(open); b == nil || b.Gate != GateOpenPackets || len(b.Open) != 1 {
		t.Errorf("CheckOpen(%q) = %+v, want the open-packets gate naming it", open, b)
	}
}

func TestValidVersion(t *testing.T) {
	for v, want := range map[string]bool{
		"1.0": true, "2026.1-rc_2": true, "a": true,
		"": false, "-1": false, ".hidden": false, "1 0": false, "1/0": false, "v;rm": false,
		"x123456789012345678901234567890123456789012345678901234567890123":  true,
		"x1234567890123456789012345678901234567890123456789012345678901234": false,
	} {
		if got := ValidVersion(v); got != want {
			t.Errorf("ValidVersion(%q) = %v, want %v", v, got, want)
		}
	}
}
