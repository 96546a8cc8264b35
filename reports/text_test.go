package reports_test

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
)

func TestWriteText(t *testing.T) {
	r := sampleResult(320)
	var b bytes.Buffer
	if err := reports.WriteText(&b, r, reports.TextOptions{MaxPerCheck: 5}); err != nil {
		t.Fatal(err)
	}
	got := b.String()
	if strings.ContainsRune(got, '\x1b') {
		t.Errorf("text output contains an escape (colour) code")
	}
	// Recount what the summary must say, independently of the writer.
	blocks := map[string]int{} // severity + check → findings
	for _, f := range r.Findings {
		blocks[string(f.Severity)+" "+f.Check]++
	}
	care := map[checker.Severity]int{}
	for _, f := range r.Findings {
		if f.Domain == "care" {
			care[f.Severity]++
		}
	}
	listed := strings.Count(got, "\n  evidence: ")
	wantListed := 0
	for block, n := range blocks {
		if strings.HasSuffix(block, " "+checker.RejectedCheck) {
			wantListed += n // rejected rows are never cut
			continue
		}
		wantListed += min(n, 5)
	}
	if listed != wantListed {
		t.Errorf("listed %d findings, want %d (at most 5 per check and severity, every rejected row)", listed, wantListed)
	}
	for _, w := range []string{
		"Welfare records check: Birchfall Fur Research Station",
		"Period: 2026-01-01 to 2026-01-31",
		"Fingerprint: " + r.Fingerprint,
		"care_rounds.csv       1540       1534          6",
		"culls.csv                0          0          0  (not used: missing required column \"method\")",
		"total                 2800       2793          7",
		fmt.Sprintf("  %-11s  %11d  %11d  %11d  %11d", "care", care[checker.Significant], care[checker.Minor], care[checker.Note], care[checker.Significant]+care[checker.Minor]+care[checker.Note]),
		"Checks not evaluated (2)",
		"ppe.damaged.used: ppe_checks.csv is absent",
		"on 689 of 744 occupied enclosure-days (92.6 %)",
		fmt.Sprintf("… and %d more significant care.water.unavailable findings", blocks["significant care.water.unavailable"]-5),
		"SIGNIFICANT  care.water.unavailable  N-01  2026-01-04",
		"it is not a veterinary judgement",
		"the animal-care committee and local law",
	} {
		if !strings.Contains(got, w) {
			t.Errorf("text lacks %q", w)
		}
	}
	// Most severe first: no significant finding after the first minor one.
	firstMinor := strings.Index(got, "\nMINOR  ")
	lastSig := strings.LastIndex(got, "\nSIGNIFICANT  ")
	if firstMinor < 0 || lastSig < 0 || lastSig > firstMinor {
		t.Errorf("severity order: last significant at %d, first minor at %d", lastSig, firstMinor)
	}
}

// jsonContract mirrors the findings JSON as DESIGN.md describes it, typed
// with plain strings so the decoding does not lean on the writer's types.
type jsonContract struct {
	Facility string `json:"facility"`
	Period   struct {
		From string `json:"from"`
		To   string `json:"to"`
	} `json:"period"`
	Fingerprint string `json:"fingerprint"`
	Scope       struct {
		Only          []string `json:"only"`
		Off           []string `json:"off"`
		LimitsFile    string   `json:"limits_file"`
		LimitsWhole   bool     `json:"limits_whole"`
		LimitsChanged []struct {
			Key, Old, New, Source string
		} `json:"limits_changed"`
		LocalRules []struct {
			Source      string   `json:"source"`
			Files       []string `json:"files"`
			Fingerprint string   `json:"fingerprint"`
		} `json:"local_rules"`
	} `json:"scope"`
	Accounting []struct {
		File     string `json:"file"`
		Read     int    `json:"read"`
		Accepted int    `json:"accepted"`
		Rejected int    `json:"rejected"`
		Failed   string `json:"failed"`
	} `json:"accounting"`
	Findings []struct {
		Severity string   `json:"severity"`
		Check    string   `json:"check"`
		Domain   string   `json:"domain"`
		Subject  string   `json:"subject"`
		On       string   `json:"on"`
		Until    string   `json:"until"`
		Message  string   `json:"message"`
		Evidence []string `json:"evidence"`
		Title    string   `json:"title"`
		Source   string   `json:"source"`
		Key      string   `json:"key"`
		Problem  string   `json:"problem"`
	} `json:"findings"`
	Checks       []checkContract `json:"checks"`
	NotEvaluated []struct {
		Check  string `json:"check"`
		Reason string `json:"reason"`
	} `json:"not_evaluated"`
	EvaluatedInPart []reports.JSONPartial `json:"evaluated_in_part"`
	Warnings        []struct {
		File    string `json:"file"`
		Column  string `json:"column"`
		Message string `json:"message"`
	} `json:"warnings"`
	Care struct {
		Occupied int `json:"occupied_enclosure_days"`
		Complete int `json:"complete_days"`
	} `json:"care_coverage"`
}

type checkContract struct {
	ID          string   `json:"id"`
	Domain      string   `json:"domain"`
	Title       string   `json:"title"`
	Description string   `json:"description"`
	Severity    string   `json:"severity"`
	Source      string   `json:"source"`
	Package     string   `json:"package"`
	File        string   `json:"file"`
	Needs       []string `json:"needs"`
}

func TestWriteJSONRoundTrip(t *testing.T) {
	r := sampleResult(320)
	r.Partial = []checker.Partial{{Check: "cold.work.over_limit", NotJudged: 3, Total: 128, Unit: "stints",
		Why: []checker.Reason{{Reason: "no reading within 3 h", Count: 2}, {Reason: "a reading without wind", Count: 1}}}}
	var b bytes.Buffer
	if err := reports.WriteJSON(&b, r); err != nil {
		t.Fatal(err)
	}
	dec := json.NewDecoder(bytes.NewReader(b.Bytes()))
	dec.DisallowUnknownFields() // every field written is in the contract
	var got jsonContract
	if err := dec.Decode(&got); err != nil {
		t.Fatalf("decoding the JSON: %v", err)
	}

	var want jsonContract
	want.Facility = r.Facility
	want.Period.From, want.Period.To = "2026-01-01", "2026-01-31"
	want.Fingerprint = r.Fingerprint
	// The scope is always written whole: empty lists, never null.
	want.Scope.Only, want.Scope.Off = []string{}, []string{}
	want.Scope.LimitsChanged = []struct{ Key, Old, New, Source string }{}
	want.Scope.LocalRules = []struct {
		Source      string   `json:"source"`
		Files       []string `json:"files"`
		Fingerprint string   `json:"fingerprint"`
	}{}
	want.Accounting = make([]struct {
		File     string `json:"file"`
		Read     int    `json:"read"`
		Accepted int    `json:"accepted"`
		Rejected int    `json:"rejected"`
		Failed   string `json:"failed"`
	}, len(r.Accounting))
	for i, c := range r.Accounting {
		want.Accounting[i].File, want.Accounting[i].Read, want.Accounting[i].Accepted = c.File, c.Read, c.Accepted
		want.Accounting[i].Rejected, want.Accounting[i].Failed = c.Rejected, c.Failed
	}
	for _, f := range r.Findings {
		var jf = struct {
			Severity string   `json:"severity"`
			Check    string   `json:"check"`
			Domain   string   `json:"domain"`
			Subject  string   `json:"subject"`
			On       string   `json:"on"`
			Until    string   `json:"until"`
			Message  string   `json:"message"`
			Evidence []string `json:"evidence"`
			Title    string   `json:"title"`
			Source   string   `json:"source"`
			Key      string   `json:"key"`
			Problem  string   `json:"problem"`
		}{Severity: string(f.Severity), Check: f.Check, Domain: f.Domain, Subject: f.Subject,
			On: f.On.Time().Format("2006-01-02"), Message: f.Message, Evidence: []string{}, Title: f.Title, Source: f.Source,
			// checks.md: the key is check, subject and on; the problem check and subject.
			Key: f.Check + " " + f.Subject + " " + f.On.Time().Format("2006-01-02"), Problem: f.Check + " " + f.Subject}
		if !f.Until.IsZero() {
			jf.Until = f.Until.Time().Format("2006-01-02")
		}
		for _, e := range f.Evidence {
			jf.Evidence = append(jf.Evidence, string(e))
		}
		want.Findings = append(want.Findings, jf)
	}
	for _, c := range r.Checks {
		want.Checks = append(want.Checks, checkContract{ID: c.ID, Domain: c.Domain, Title: c.Title, Description: c.Description,
			Severity: string(c.Severity), Source: c.Source, Package: c.Package, File: c.File, Needs: c.Needs})
	}
	for _, s := range r.NotEvaluated {
		want.NotEvaluated = append(want.NotEvaluated, struct {
			Check  string `json:"check"`
			Reason string `json:"reason"`
		}{s.Check, s.Reason})
	}
	want.EvaluatedInPart = []reports.JSONPartial{{Check: "cold.work.over_limit", NotJudged: 3, Total: 128, Unit: "stints",
		Why:  []reports.JSONReason{{Reason: "no reading within 3 h", Count: 2}, {Reason: "a reading without wind", Count: 1}},
		Text: "cold.work.over_limit: 3 of 128 stints not judged (2 with no reading within 3 h; 1 with a reading without wind)"}}
	for _, w := range r.Warnings {
		want.Warnings = append(want.Warnings, struct {
			File    string `json:"file"`
			Column  string `json:"column"`
			Message string `json:"message"`
		}{w.File, w.Column, w.Message})
	}
	want.Care.Occupied, want.Care.Complete = 744, 689

	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("JSON round trip (-want +got):\n%s", diff)
	}
	if !bytes.Contains(b.Bytes(), []byte("\n  \"facility\": ")) {
		t.Errorf("JSON is not indented by two spaces")
	}
}

func TestWriteJSONEmpty(t *testing.T) {
	var b bytes.Buffer
	if err := reports.WriteJSON(&b, &checker.Result{Facility: "Birchfall Fur Research Station", Period: period}); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{`"findings": []`, `"accounting": []`, `"not_evaluated": []`, `"evaluated_in_part": []`, `"from": "2026-01-01"`} {
		if !strings.Contains(b.String(), w) {
			t.Errorf("empty result JSON lacks %s:\n%s", w, b.String())
		}
	}
}

func TestWriteCSV(t *testing.T) {
	r := &checker.Result{Facility: "Birchfall Fur Research Station", Period: period, Findings: []checker.Finding{
		{Check: "cold.frostbite.risk", Domain: "cold", Subject: "north-yard", On: period.From + 13, Until: period.From + 15,
			Severity: checker.Note, Message: "-41 wind chill", Evidence: []records.Ref{"weather.csv:310", "weather.csv:334"},
			Title: "Frostbite risk", Source: "Environment and Climate Change Canada"},
		{Check: "records.row.rejected", Domain: "records", Subject: "=cmd|' /C calc'!A0", On: period.From,
			Severity: checker.Minor, Message: "@risk: value \"+1\" rejected", Evidence: []records.Ref{"care_rounds.csv:7"},
			Title: "Row rejected", Source: "common practice"},
		// PHS Policy IV.F.3: protocol noncompliance is reported to the institutional official.
		{Check: "protocol.personnel.unlisted", Domain: "protocol", Subject: "BFR-AF-02", On: period.From + 9,
			Severity: checker.Significant, Message: "ST-10 worked under protocol BFR-AF-02", Evidence: []records.Ref{"culls.csv:3"},
			Title: "Person not listed on the protocol", Source: "PHS Policy IV.C.1", Reportable: true},
	}}
	var b bytes.Buffer
	if err := reports.WriteCSV(&b, r); err != nil {
		t.Fatal(err)
	}
	got, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatalf("reading the CSV back: %v", err)
	}
	want := [][]string{
		{"severity", "check", "domain", "subject", "on", "until", "message", "evidence", "title", "source", "report_to", "key", "problem", "class", "plan", "action_status"},
		{"note", "cold.frostbite.risk", "cold", "north-yard", "2026-01-14", "2026-01-16", "'-41 wind chill", "weather.csv:310; weather.csv:334", "Frostbite risk", "Environment and Climate Change Canada", "",
			"cold.frostbite.risk north-yard 2026-01-14", "cold.frostbite.risk north-yard", "", "", ""},
		{"minor", "records.row.rejected", "records", "'=cmd|' /C calc'!A0", "2026-01-01", "", "'@risk: value \"+1\" rejected", "care_rounds.csv:7", "Row rejected", "common practice", "",
			"records.row.rejected =cmd|' /C calc'!A0 2026-01-01", "records.row.rejected =cmd|' /C calc'!A0", "", "", ""},
		{"significant", "protocol.personnel.unlisted", "protocol", "BFR-AF-02", "2026-01-10", "", "ST-10 worked under protocol BFR-AF-02", "culls.csv:3", "Person not listed on the protocol", "PHS Policy IV.C.1", "report to the institutional official",
			"protocol.personnel.unlisted BFR-AF-02 2026-01-10", "protocol.personnel.unlisted BFR-AF-02", "", "", ""},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("CSV (-want +got):\n%s", diff)
	}
}

// PHS Policy IV.F.3: every output marks reportable findings "report to the institutional official".
func TestReportableMarkedInTextAndJSON(t *testing.T) {
	r := &checker.Result{Facility: "Birchfall Fur Research Station", Period: period, Findings: []checker.Finding{
		{Check: "protocol.inactive", Domain: "protocol", Subject: "BFR-RF-01", On: period.From + 5,
			Severity: checker.Significant, Message: "1 handling or cull row(s) under protocol BFR-RF-01", Evidence: []records.Ref{"handling.csv:40"},
			Title: "Work outside the protocol's approval", Source: "common practice", Reportable: true},
		{Check: "care.water.unavailable", Domain: "care", Subject: "S2-11", On: period.From + 7,
			Severity: checker.Significant, Message: "water frozen", Title: "Water unavailable", Source: "OLAW"},
	}}
	var text bytes.Buffer
	if err := reports.WriteText(&text, r, reports.TextOptions{}); err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(text.String(), "reportable: report to the institutional official"); n != 1 {
		t.Errorf("text marks %d findings reportable, want 1:\n%s", n, text.String())
	}
	var js bytes.Buffer
	if err := reports.WriteJSON(&js, r); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Findings []struct {
			Check      string `json:"check"`
			Reportable bool   `json:"reportable"`
			ReportTo   string `json:"report_to"`
		} `json:"findings"`
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, f := range doc.Findings {
		if f.Reportable {
			got[f.Check] = f.ReportTo
		}
	}
	if diff := cmp.Diff(map[string]string{"protocol.inactive": "report to the institutional official"}, got); diff != "" {
		t.Errorf("JSON reportable findings (-want +got):\n%s", diff)
	}
}

// checks.md "Corrections to the first set": the bite caution quotes the same limit the
// bite-report rule uses (handling.report_within_hours, 24 h by default, common practice), and
// the exposure caution cites the ACIP post-exposure recommendations (2008, updated 2010; from
// memory), not the 2022 pre-exposure report.
func TestBiteCautionQuotesTheLimit(t *testing.T) {
	r := &checker.Result{Limits: []checker.LimitLine{{Key: "handling.report_within_hours", Value: "12", Source: "[C]"}}}
	if got := reports.BiteReportCaution(r); !strings.Contains(got, "within 12 h") || strings.Contains(got, "same day") {
		t.Errorf("caution with a 12 h limit = %q", got)
	}
	if got := reports.BiteReportCaution(&checker.Result{}); strings.Contains(got, "24") {
		t.Errorf("caution without limits invents a figure: %q", got)
	}
	if !strings.Contains(reports.RabiesExposureCaution, "MMWR 2008") || strings.Contains(reports.RabiesExposureCaution, "2022") {
		t.Errorf("exposure caution cites %q", reports.RabiesExposureCaution)
	}
}

// A run without findings over checks not all evaluated never prints a bare
// "No findings." (checks.md "Never pass what was not judged"): the text
// says how many checks were not evaluated or evaluated only in part, and
// which; the JSON carries the counts.
func TestNoBareAllClear(t *testing.T) {
	partial := checker.Partial{Check: "cold.work.over_limit", NotJudged: 3, Total: 128, Unit: "stints",
		Why: []checker.Reason{{Reason: "no reading within 3 h", Count: 3}}}
	skipped := checker.Skipped{Check: "ppe.damaged.used", Reason: "no ppe_checks.csv in the records folder"}
	tests := []struct {
		name       string
		r          *checker.Result
		want       []string
		wantNot    []string
		wantInPart int
	}{
		{"everything evaluated", &checker.Result{Facility: "Birchfall Fur Research Station", Period: period},
			[]string{"No findings.\n"}, []string{"not a clean result", "evaluated only in part"}, 0},
		{"a check not evaluated", &checker.Result{Facility: "Birchfall Fur Research Station", Period: period, NotEvaluated: []checker.Skipped{skipped}},
			[]string{"No findings among the checks evaluated, but not a clean result: 1 check not evaluated (ppe.damaged.used)."},
			[]string{"No findings.\n"}, 0},
		{"a check evaluated in part", &checker.Result{Facility: "Birchfall Fur Research Station", Period: period, NotEvaluated: []checker.Skipped{skipped},
			Partial: []checker.Partial{partial}},
			[]string{
				"Checks evaluated only in part (1)\n  cold.work.over_limit: 3 of 128 stints not judged (no reading within 3 h)\n",
				"No findings among the checks evaluated, but not a clean result: 1 check not evaluated (ppe.damaged.used); 1 check evaluated only in part (cold.work.over_limit).",
			},
			[]string{"No findings.\n"}, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			if err := reports.WriteText(&b, tc.r, reports.TextOptions{}); err != nil {
				t.Fatal(err)
			}
			for _, w := range tc.want {
				if !strings.Contains(b.String(), w) {
					t.Errorf("text lacks %q:\n%s", w, b.String())
				}
			}
			for _, w := range tc.wantNot {
				if strings.Contains(b.String(), w) {
					t.Errorf("text has %q:\n%s", w, b.String())
				}
			}
			doc := reports.NewJSONReport(tc.r)
			if len(doc.EvaluatedInPart) != tc.wantInPart {
				t.Fatalf("evaluated_in_part has %d entries, want %d", len(doc.EvaluatedInPart), tc.wantInPart)
			}
			if tc.wantInPart > 0 {
				want := reports.JSONPartial{Check: "cold.work.over_limit", NotJudged: 3, Total: 128, Unit: "stints",
					Why:  []reports.JSONReason{{Reason: "no reading within 3 h", Count: 3}},
					Text: "cold.work.over_limit: 3 of 128 stints not judged (no reading within 3 h)"}
				if diff := cmp.Diff(want, doc.EvaluatedInPart[0]); diff != "" {
					t.Errorf("evaluated_in_part (-want +got):\n%s", diff)
				}
			}
		})
	}
}
