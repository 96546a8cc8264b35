package reports_test

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/reports"
	"welfare/reports/pdf"
)

var keep = flag.String("keep", "", "also write the sample report's PDF to this file, to look at it")

func writePDF(t testing.TB, r *checker.Result, opt reports.PDFOptions) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := pdf.Write(&b, r, opt); err != nil {
		t.Fatalf("pdf.Write: %v", err)
	}
	return b.Bytes()
}

func sampleOptions() reports.PDFOptions {
	return reports.PDFOptions{Inspector: "Dr. Tuomas Vähäkangas", GeneratedAt: generatedAt}
}

func TestWritePDFDeterministic(t *testing.T) {
	r := sampleResult(320)
	first := writePDF(t, r, sampleOptions())
	// Several writes, because gofpdf keeps fonts and pages in maps: one
	// lucky iteration order must not hide a leak.
	for i := 0; i < 3; i++ {
		if got := writePDF(t, r, sampleOptions()); !bytes.Equal(got, first) {
			t.Fatalf("write %d differs from the first (%d vs %d bytes)", i+2, len(got), len(first))
		}
	}
	later := sampleOptions()
	later.GeneratedAt = generatedAt.Add(1)
	later.GeneratedAt = generatedAt.AddDate(0, 0, 1)
	if bytes.Equal(writePDF(t, r, later), first) {
		t.Errorf("a different generation time gave the same bytes; the date is not in the PDF")
	}
	if *keep != "" {
		if err := os.WriteFile(*keep, first, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func TestWritePDFNeedsGenerationTime(t *testing.T) {
	err := pdf.Write(&bytes.Buffer{}, sampleResult(3), reports.PDFOptions{})
	if err == nil || !strings.Contains(err.Error(), "GeneratedAt") {
		t.Errorf("pdf.Write without GeneratedAt: got error %v, want one naming GeneratedAt", err)
	}
}

// tool finds a poppler tool; the checks need it, so only its absence skips.
func tool(t *testing.T, name string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		t.Skipf("%s not installed (apt-get install poppler-utils): %v", name, err)
	}
	return p
}

func run(t *testing.T, name string, args ...string) string {
	t.Helper()
	out, err := exec.Command(tool(t, name), args...).CombinedOutput()
	if err != nil {
		t.Fatalf("%s %v: %v\n%s", name, args, err, out)
	}
	return string(out)
}

func TestWritePDFContent(t *testing.T) {
	r := sampleResult(320)
	dir := t.TempDir()
	file := filepath.Join(dir, "audit.pdf")
	if err := os.WriteFile(file, writePDF(t, r, sampleOptions()), 0o644); err != nil {
		t.Fatal(err)
	}
	info := run(t, "pdfinfo", file)
	m := regexp.MustCompile(`(?m)^Pages:\s+(\d+)`).FindStringSubmatch(info)
	if m == nil {
		t.Fatalf("pdfinfo gave no page count:\n%s", info)
	}
	pages, _ := strconv.Atoi(m[1])
	text := run(t, "pdftotext", "-raw", file, "-")
	// pdftotext separates pages with form feeds.
	pageTexts := strings.Split(strings.TrimSuffix(text, "\f"), "\f")
	if len(pageTexts) != pages {
		t.Fatalf("got %d page texts, want %d", len(pageTexts), pages)
	}
	flat := strings.Join(strings.Fields(text), " ")

	// Counts, recomputed here from the findings.
	var sig, minor, note int
	for _, f := range r.Findings {
		switch f.Severity {
		case checker.Significant:
			sig++
		case checker.Minor:
			minor++
		case checker.Note:
			note++
		}
	}
	perCheck := map[string]int{}
	for _, f := range r.Findings {
		perCheck[f.Check]++
	}
	wants := []string{
		// Cover
		"Welfare records audit", "Birchfall Fur Research Station", "2026-01-01 to 2026-01-31",
		"Dr. Tuomas Vähäkangas", "2026-02-03 09:30 -06:00", r.Fingerprint,
		fmt.Sprintf("Findings %d: %d significant, %d minor, %d note", len(r.Findings), sig, minor, note),
		"care_rounds.csv 1540 1534 6", "total 2800 2793 7",
		"not used: missing required column \"method\"",
		// Summary
		"Findings by domain and severity", "Checks not evaluated (2)", "ppe_checks.csv is absent",
		"on 689 of 744 occupied enclosure-days (92.6 %)", "keeper_mood", "sedative_dose_µg_kg",
		// Cold season
		"Cold season", "Weather site north-yard", "−20: bedding, shelter", "−28: frostbite risk",
		"−28 to −39: exposed skin can freeze in 10–30 min", "Days without readings: 1",
		// Findings
		"care.water.unavailable — Water unavailable", "Plan and schedule for correction",
		"floor area 1.10 m² < required 1.20 m²", "(≥ 2 mm required)", "Aino Lindqvist-Ødegård",
		fmt.Sprintf("%d more care.observation.missed findings in the attached findings.csv / findings.json",
			perCheck["care.observation.missed"]-reports.DefaultPDFMaxPerCheck),
		// Limits
		"Limits in force", "bedding_wind_chill_c −20", "Checks in force (17)",
		// Cautions
		"Conscious foxes and mink bite", "bite-resistant gloves", "Report every bite or scratch",
		"soap and running water for about 15 minutes (WHO rabies position paper, 2018)",
		"rabies post-exposure assessment", "Echinococcus multilocularis", "survive freezing",
		"dedicated clothing", "do not eat, drink or smoke in animal areas", "Sarcoptic mange", "Leptospirosis",
		"work/warm-up schedule", "frostbite",
		"it is not a veterinary judgement", "attending veterinarian, the animal-care committee and local law",
		// Sign-off
		"Sign-off", "Attending veterinarian", "Chair, animal-care committee", "Signature",
	}
	for _, w := range wants {
		if !strings.Contains(flat, w) {
			t.Errorf("PDF text lacks %q", w)
		}
	}
	// Every page: header, footer, page N of M, short fingerprint.
	for i, pt := range pageTexts {
		pf := strings.Join(strings.Fields(pt), " ")
		for _, w := range []string{
			"Birchfall Fur Research Station", "Period 2026-01-01 – 2026-01-31",
			fmt.Sprintf("page %d of %d", i+1, pages), "Fingerprint " + r.Fingerprint[:12],
		} {
			if !strings.Contains(pf, w) {
				t.Errorf("page %d lacks %q", i+1, w)
			}
		}
	}
	// Sections in order.
	last := -1
	for _, s := range []string{"Rows read per file", "Summary", "Cold season", "Findings Grouped by domain", "Limits in force", "Cautions", "Sign-off"} {
		at := strings.Index(flat, s)
		if at < last {
			t.Errorf("section %q at %d, before the previous section (%d)", s, at, last)
		}
		last = at
	}

	// Attachments: listed, and byte-identical to the JSON and CSV writers.
	list := run(t, "pdfdetach", "-list", file)
	for _, name := range []string{"findings.json", "findings.csv"} {
		if !strings.Contains(list, name) {
			t.Errorf("pdfdetach -list lacks %s:\n%s", name, list)
		}
	}
	run(t, "pdfdetach", "-saveall", "-o", dir, file)
	var js, cs bytes.Buffer
	if err := reports.WriteJSON(&js, r); err != nil {
		t.Fatal(err)
	}
	if err := reports.WriteCSV(&cs, r); err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string][]byte{"findings.json": js.Bytes(), "findings.csv": cs.Bytes()} {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Errorf("attached %s: %v", name, err)
			continue
		}
		if diff := cmp.Diff(string(want), string(got)); diff != "" {
			t.Errorf("attached %s differs from the writer's output (-want +got):\n%s", name, diff)
		}
	}
}

func TestWritePDFSparse(t *testing.T) {
	// No weather, no findings, no limits: the sections say so rather than
	// vanish, and the cautions and sign-off are still there.
	r := &checker.Result{Facility: "Birchfall Fur Research Station", Period: sampleResult(0).Period,
		Fingerprint: "ab", NotEvaluated: []checker.Skipped{{Check: "cold.frostbite.risk", Reason: "weather.csv is absent"}},
		Partial: []checker.Partial{{Check: "enclosure.space.insufficient", NotJudged: 31, Total: 620, Unit: "occupied enclosure-days",
			Why: []checker.Reason{{Reason: "no length_cm for an occupant of a formula species", Count: 31}}}}}
	dir := t.TempDir()
	file := filepath.Join(dir, "audit.pdf")
	if err := os.WriteFile(file, writePDF(t, r, sampleOptions()), 0o644); err != nil {
		t.Fatal(err)
	}
	flat := strings.Join(strings.Fields(run(t, "pdftotext", "-raw", file, "-")), " ")
	for _, w := range []string{"No findings among the checks evaluated, but not a clean result: 1 check not evaluated (cold.frostbite.risk); " +
		"1 check evaluated only in part (enclosure.space.insufficient). See the summary.",
		"Checks in force 0, of which 1 not evaluated and 1 evaluated only in part", "Checks evaluated only in part (1)",
		"31 of 620 occupied enclosure-days", "31: no length_cm for an occupant of a formula species",
		"weather.csv is absent",
		"No limits were reported with this result.", "No occupied enclosure-days", "Conscious foxes and mink bite",
		"Chair, animal-care committee", "Fingerprint ab "} {
		if !strings.Contains(flat, w) {
			t.Errorf("sparse PDF lacks %q", w)
		}
	}
	if strings.Contains(flat, "Cold season") {
		t.Errorf("sparse PDF has a cold-season section without weather")
	}
}

func TestWritePDFMaxPerCheck(t *testing.T) {
	r := sampleResult(320)
	tests := []struct {
		name string
		max  int
		more bool
	}{
		{"default lists 25 per check", 0, true},
		{"negative lists every finding", -1, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			opt := sampleOptions()
			opt.MaxPerCheck = tt.max
			file := filepath.Join(t.TempDir(), "audit.pdf")
			if err := os.WriteFile(file, writePDF(t, r, opt), 0o644); err != nil {
				t.Fatal(err)
			}
			flat := strings.Join(strings.Fields(run(t, "pdftotext", "-raw", file, "-")), " ")
			if got := strings.Contains(flat, "more care.observation.missed findings in the attached"); got != tt.more {
				t.Errorf("\"N more\" note present = %v, want %v", got, tt.more)
			}
		})
	}
}
