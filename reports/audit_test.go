package reports_test

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"testing"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
	"welfare/rules"
)

// auditJSON is the section model as indented JSON, the golden form.
func auditJSON(t *testing.T, r *checker.Result, opt reports.PDFOptions) []byte {
	t.Helper()
	a, err := reports.BuildAudit(r, opt)
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(a); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// demoGeneratedAt is `welfare demo`'s default --generated-at.
var demoGeneratedAt = time.Date(2026, 2, 2, 8, 0, 0, 0, time.UTC)

// The PDF's content for the small result: every section, block, table row
// and chart series, in page order.
func TestGoldenAuditSmall(t *testing.T) {
	opt := reports.PDFOptions{Inspector: "Dr. Tuomas Vähäkangas", GeneratedAt: demoGeneratedAt, MaxPerCheck: 1}
	golden(t, "small", "audit.json", auditJSON(t, smallResult(), opt))
}

// demoResult checks the demo records over the demo's period the way
// `welfare demo` does (shipped rules and limits, January 2026).
func demoResult(t *testing.T) *checker.Result {
	t.Helper()
	return demoSeasonResult(t, "../testdata/demo/records", checker.Period{From: records.MakeDay(2026, 1, 1), To: records.MakeDay(2026, 1, 31)})
}

// demoSeasonResult checks a demo records folder over its period, as
// `welfare demo [--season summer]` does.
func demoSeasonResult(t *testing.T, dir string, period checker.Period) *checker.Result {
	t.Helper()
	ctx := context.Background()
	lim, err := rules.ParseLimits("limits.yaml (built in)", rules.DefaultLimits())
	if err != nil {
		t.Fatal(err)
	}
	policy, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	res, err := policy.Check(ctx, os.DirFS(dir), period, nil)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The demo report's content, as `welfare demo` writes it. The demo has one
// weather site, so every cold finding is marked on its chart without a
// SiteOf map.
func TestGoldenAuditDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("checks the whole demo")
	}
	res := demoResult(t)
	if n := len(res.Weather); n != 1 {
		t.Fatalf("the demo has %d weather sites; this test assumes one (give it a SiteOf map)", n)
	}
	opt := reports.PDFOptions{Inspector: "Demo inspector (invented)", GeneratedAt: demoGeneratedAt}
	golden(t, "demo", "audit.json", auditJSON(t, res, opt))
}

// The summer demo's report content (July 2026, `welfare demo --season
// summer`): the warm-season chart, the indoor climate and the cleaning gaps,
// and no cold-season chart.
func TestGoldenAuditDemoSummer(t *testing.T) {
	if testing.Short() {
		t.Skip("checks the whole summer demo")
	}
	res := demoSeasonResult(t, "../testdata/demo-summer/records",
		checker.Period{From: records.MakeDay(2026, 7, 1), To: records.MakeDay(2026, 7, 31)})
	opt := reports.PDFOptions{Inspector: "Demo inspector (invented)", GeneratedAt: demoGeneratedAt}
	golden(t, "demo-summer", "audit.json", auditJSON(t, res, opt))
}
