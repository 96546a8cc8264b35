package records

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

// corrective_actions.csv goes through the same decoding path as every file:
// each row is accepted or rejected with its position and reason.
func TestCorrectiveActions(t *testing.T) {
	const head = "check,subject,found_on,plan,owner,due_on,closed_on,verified_by\n"
	tests := []struct {
		name     string
		csv      string
		want     []string
		accepted int
	}{
		{
			name:     "good rows, found_on empty answers every finding of the problem",
			csv:      head + "care.water.unavailable,E1,2026-01-08,Heated drinkers,K1,2026-01-20,,\ncare.observation.missed,E2,,Second keeper on weekends,,2026-02-01,2026-01-25,V1\n",
			want:     []string{},
			accepted: 2,
		},
		{
			name:     "not a check id",
			csv:      head + "Water frozen,E1,2026-01-08,Heated drinkers,K1,2026-01-20,,\n",
			want:     []string{`corrective_actions.csv:2: check: "Water frozen" is not a check id (domain.topic.problem, e.g. care.water.unavailable)`},
			accepted: 0,
		},
		{
			name:     "plan and due date required",
			csv:      head + "care.water.unavailable,E1,2026-01-08,,K1,2026-01-20,,\ncare.water.unavailable,E1,2026-01-08,Heated drinkers,K1,,,\n",
			want:     []string{`corrective_actions.csv:2: plan: is required but empty`, `corrective_actions.csv:3: due_on: is required but empty`},
			accepted: 0,
		},
		{
			name:     "closed before found",
			csv:      head + "care.water.unavailable,E1,2026-01-08,Heated drinkers,K1,2026-01-20,2026-01-02,\n",
			want:     []string{`corrective_actions.csv:2: closed_on: 2026-01-02 is before found_on 2026-01-08`},
			accepted: 0,
		},
		{
			name:     "verified while open",
			csv:      head + "care.water.unavailable,E1,2026-01-08,Heated drinkers,K1,2026-01-20,,V1\n",
			want:     []string{`corrective_actions.csv:2: closed_on: is required when verified_by is given (a correction is verified once it is closed)`},
			accepted: 0,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(map[string]string{correctiveFile: tt.csv}))
			if diff := cmp.Diff(tt.want, problemLines(s)); diff != "" {
				t.Errorf("problems (-want +got):\n%s", diff)
			}
			if len(s.CorrectiveActions) != tt.accepted {
				t.Errorf("accepted %d rows, want %d", len(s.CorrectiveActions), tt.accepted)
			}
		})
	}
}

func TestCorrectiveOwnerUnknown(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{correctiveFile: "check,subject,plan,owner,due_on\ncare.water.unavailable,E1,Heated drinkers,Z9,2026-01-20\n"}))
	got := problemLines(s)
	if len(got) != 1 || len(s.CorrectiveActions) != 0 {
		t.Fatalf("want one rejected row for an unknown owner, got %q", got)
	}
}
