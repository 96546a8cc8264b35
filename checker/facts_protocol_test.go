package checker

import (
	"os"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

func TestProtocolFacts(t *testing.T) {
	set := peopleSet(t)
	// A handling of the mink on P2's last day (in force: the approval's last
	// day counts) and one on a row naming P1 for the mink.
	set.Handling = append(set.Handling,
		records.Handling{Ref: "handling.csv:8", At: ptime(t, "2025-12-31 09:00"), AnimalID: "M1", StaffID: "S1", Purpose: "weighing"},
		records.Handling{Ref: "handling.csv:9", At: ptime(t, "2026-01-08 09:00"), AnimalID: "M1", StaffID: "S1", Purpose: "weighing", ProtocolID: "P1"},
	)
	set.Protocols[1].Personnel = []string{"S1"}
	set.Protocols[1].LastReviewedOn = pday(t, "2025-06-30")
	set.Protocols[1].PainCategory = "C"
	period := Period{From: pday(t, "2025-12-31"), To: pday(t, "2026-01-31")}
	f := newFacts(set, peopleLimits(t), period)
	f.protocolFacts()

	p1 := f.docs["protocol"]["P1"]["protocol"].(map[string]any)
	wantAnimals := map[string]any{
		// F1, F2 from 2025-06-01, F3 from its arrival on 2026-01-05 (the 3rd: over max 2),
		// M1 from the P1 row on 2026-01-08.
		"count": 4, "exceeded_on": "2026-01-05",
		"over_refs": []any{"animals.csv:4", "animals.csv:5"}, "over_animals": []any{"F3", "M1"},
	}
	if diff := cmp.Diff(wantAnimals, p1["animals"]); diff != "" {
		t.Errorf("P1 animals (-want +got):\n%s", diff)
	}
	if got := p1["expires_after_period_by"]; got != 15 {
		t.Errorf("P1 expires_after_period_by = %v, want 15", got)
	}

	p2 := f.docs["protocol"]["P2"]["protocol"].(map[string]any)
	day := func(on string, in bool, ref string) map[string]any {
		return map[string]any{"on": on, "in_force": in, "refs": []any{ref},
			"purposes": map[string]any{"weighing": []any{ref}}, "methods": map[string]any{},
			// checks.md "protocol — additions": the species and the people of each day's
			// rows, for protocol.species.unapproved and protocol.personnel.unlisted.
			"species": map[string]any{"neogale_vison": []any{ref}}, "staff": map[string]any{"S1": []any{ref}}}
	}
	wantDays := []any{
		day("2025-12-31", true, "handling.csv:8"),
		day("2026-01-15", false, "handling.csv:6"),
		day("2026-01-16", false, "handling.csv:7"),
	}
	if diff := cmp.Diff(wantDays, p2["days"]); diff != "" {
		t.Errorf("P2 days (-want +got):\n%s", diff)
	}
	// records.md "New in this contract": protocols.csv personnel, last_reviewed_on, pain_category.
	gotCols := []any{p2["species"], p2["personnel"], p2["last_reviewed_on"], p2["pain_category"]}
	if diff := cmp.Diff([]any{[]any{}, []any{"S1"}, "2025-06-30", "C"}, gotCols); diff != "" {
		t.Errorf("P2 species, personnel, last_reviewed_on, pain_category (-want +got):\n%s", diff)
	}
	// Only M1 (animals.csv) under P2, which approves any number.
	wantP2 := map[string]any{"count": 1, "exceeded_on": nil, "over_refs": []any{}, "over_animals": []any{}}
	if diff := cmp.Diff(wantP2, p2["animals"]); diff != "" {
		t.Errorf("P2 animals (-want +got):\n%s", diff)
	}
}

func TestHeldUnderCount(t *testing.T) {
	// Boundaries of "held under": the count is cumulative over the approval and
	// reported while the approval reaches into the checked period.
	tests := []struct {
		name         string
		approved     string
		expires      string
		arrivals     [][2]string // arrived_on, left_on
		max          int
		wantCount    int
		wantExceeded any
	}{
		{"at the maximum is not over", "2025-01-01", "2026-12-31", [][2]string{{"2025-02-01", ""}, {"2025-03-01", ""}}, 2, 2, nil},
		{"departed animals still count", "2025-01-01", "2026-12-31", [][2]string{{"2025-02-01", "2025-02-10"}, {"2025-03-01", "2025-04-01"}, {"2026-01-03", ""}}, 2, 3, "2026-01-03"},
		{"an animal gone before the approval does not count", "2025-06-01", "2026-12-31", [][2]string{{"2025-02-01", "2025-05-31"}, {"2025-03-01", ""}, {"2026-01-03", ""}}, 2, 2, nil},
		{"present before the approval counts from its first day", "2025-06-01", "2026-12-31", [][2]string{{"2025-02-01", ""}, {"2025-03-01", ""}, {"2025-04-01", ""}}, 2, 3, "2025-06-01"},
		{"arrivals after the period are not yet counted", "2025-01-01", "2026-12-31", [][2]string{{"2025-02-01", ""}, {"2025-03-01", ""}, {"2026-02-01", ""}}, 2, 2, nil},
		{"an approval over before the period is not reported", "2024-01-01", "2025-12-31", [][2]string{{"2025-02-01", ""}, {"2025-03-01", ""}, {"2025-04-01", ""}}, 2, 3, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			max := tt.max
			set := &records.Set{Protocols: []records.Protocol{{Ref: "protocols.csv:2", ID: "P9", Title: "t",
				ApprovedOn: pday(t, tt.approved), ExpiresOn: pday(t, tt.expires), MaxAnimals: &max}}}
			for i, a := range tt.arrivals {
				set.Animals = append(set.Animals, records.Animal{Ref: records.Ref("animals.csv:" + itoa(i+2)), ID: "A" + itoa(i+1),
					Species: "vulpes_vulpes", ArrivedOn: pday(t, a[0]), LeftOn: pday(t, a[1]), ProtocolID: "P9"})
			}
			f := newFacts(set, peopleLimits(t), peoplePeriod)
			f.protocolFacts()
			got := f.docs["protocol"]["P9"]["protocol"].(map[string]any)["animals"].(map[string]any)
			if got["count"] != tt.wantCount || got["exceeded_on"] != tt.wantExceeded {
				t.Errorf("count %v, exceeded_on %v; want %v, %v", got["count"], got["exceeded_on"], tt.wantCount, tt.wantExceeded)
			}
		})
	}
}

// TestPeopleDemoPlanted checks the handling, staff, PPE, protocol and cull
// findings on the invented Birchfall demo against its answer key,
// testdata/demo/PLANTED.md: every planted finding, nothing else.
func TestPeopleDemoPlanted(t *testing.T) {
	key, err := os.ReadFile("../testdata/demo/PLANTED.md")
	if err != nil {
		t.Skipf("no demo answer key: %v", err)
	}
	lim := peopleLimits(t)
	set, err := records.Load(os.DirFS("../testdata/demo/records"), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{}
	for _, line := range strings.Split(string(key), "\n") {
		cells := strings.Split(line, "|")
		if len(cells) < 5 {
			continue
		}
		check := strings.TrimSpace(cells[1])
		if slices.Contains(peopleDomains, strings.SplitN(check, ".", 2)[0]) {
			want = append(want, check+" "+strings.TrimSpace(cells[2])+" "+strings.TrimSpace(cells[3]))
		}
	}
	if len(want) == 0 {
		t.Fatal("the answer key lists no finding of these domains")
	}
	sort.Strings(want)
	got := []string{}
	for _, f := range peopleFindings(t, set, lim, Period{From: pday(t, "2026-01-01"), To: pday(t, "2026-01-31")}) {
		got = append(got, f.Check+" "+f.Subject+" "+f.On.String())
	}
	sort.Strings(got)
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("demo findings (-want +got):\n%s", diff)
	}
}
