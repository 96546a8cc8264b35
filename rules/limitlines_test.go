package rules

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestLimitLines(t *testing.T) {
	src := []byte(`# header
care:
  significant_run_days: 2    # [C] two in a row
species:
  vulpes_vulpes:
    space:
      adult_m2: 0.8          # [P] Council of Europe (1999)
      juvenile_m2: 0.6       # [P] same: 1.2 m² for two
    nest_box: true           # [P] same [M]
    euthanasia:              # [M] AVMA 2020
      acceptable: [barbiturate_overdose]
      conditional:
        gunshot: {note: "trained operator"}
cold:
  work_warmup:               # [P] ACGIH TLV
    rows:
      - {warmest_c: -26, cells: [N, 40/4]}
      - {warmest_c: -29, cells: [C, C]}
`)
	want := []LimitLine{
		{Key: "care.significant_run_days", Value: "2", Source: "[C] two in a row"},
		{Key: "species.vulpes_vulpes.space.adult_m2", Value: "0.8", Source: "[P] Council of Europe (1999)"},
		{Key: "species.vulpes_vulpes.space.juvenile_m2", Value: "0.6", Source: "[P] Council of Europe (1999); 1.2 m² for two"},
		{Key: "species.vulpes_vulpes.nest_box", Value: "true", Source: "[P] Council of Europe (1999) [M]"},
		{Key: "species.vulpes_vulpes.euthanasia.acceptable", Value: "[barbiturate_overdose]", Source: "[M] AVMA 2020"},
		{Key: "species.vulpes_vulpes.euthanasia.conditional.gunshot", Value: "{note: trained operator}", Source: "[M] AVMA 2020"},
		{Key: "cold.work_warmup.rows[0]", Value: "{warmest_c: -26, cells: [N, 40/4]}", Source: "[P] ACGIH TLV"},
		{Key: "cold.work_warmup.rows[1]", Value: "{warmest_c: -29, cells: [C, C]}", Source: "[P] ACGIH TLV"},
	}
	if diff := cmp.Diff(want, limitLines(src)); diff != "" {
		t.Errorf("limitLines (-want +got):\n%s", diff)
	}
}
