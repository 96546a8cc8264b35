package records

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

// The columns records.md "New in this contract" adds for the veterinary
// corrections: culls.anaesthetised, staff.rabies_risk_category (ACIP 2022
// categories 1-5), protocols.personnel/last_reviewed_on/pain_category (USDA
// pain and distress categories B-E).
func TestVetColumns(t *testing.T) {
	fsys := folder(map[string]string{
		staffFile: "staff_id,name,role,rabies_risk_category\nK1,Ilse Marrow,keeper,3\nV1,Tomas Fell,veterinarian,6\nV2,Aino Brisk,veterinarian,2\n",
		protocolsFile: "protocol_id,title,approved_on,expires_on,personnel,last_reviewed_on,pain_category\n" +
			"P1,Winter coat,2025-01-08,2028-01-07,K1;V2,2025-12-01,C\nP2,Nest use,2025-01-08,2028-01-07,,,F\n",
		cullsFile: "culled_at,animal_id,staff_id,reason,method,sedated,anaesthetised\n2026-01-20T11:00,A1,K1,health,potassium_chloride,yes,yes\n",
	})
	s := mustLoad(t, fsys)
	want := []string{
		"staff.csv:3: rabies_risk_category: 6 is outside the plausible range 1 … 5",
		`protocols.csv:3: pain_category: "F" is not one of B, C, D, E`,
	}
	if diff := cmp.Diff(want, problemLines(s)); diff != "" {
		t.Errorf("problems (-want +got):\n%s", diff)
	}
	if len(s.Staff) != 2 || s.Staff[0].RabiesRiskCategory == nil || *s.Staff[0].RabiesRiskCategory != 3 {
		t.Errorf("staff K1 rabies_risk_category = %+v", s.Staff)
	}
	if len(s.Protocols) != 1 || !cmp.Equal(s.Protocols[0].Personnel, []string{"K1", "V2"}) ||
		s.Protocols[0].LastReviewedOn.String() != "2025-12-01" || s.Protocols[0].PainCategory != "C" {
		t.Errorf("protocol P1 = %+v", s.Protocols)
	}
	if len(s.Culls) != 1 || !s.Culls[0].Anaesthetised.IsYes() || !s.Culls[0].Sedated.IsYes() {
		t.Errorf("cull = %+v", s.Culls)
	}
}
