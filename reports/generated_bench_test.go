package reports_test

import (
	"context"
	"fmt"
	"io"
	"os"
	"testing"
	"time"

	"welfare/checker"
	"welfare/records/synth"
	"welfare/reports"
	"welfare/reports/pdf"
	"welfare/rules"
)

// BenchmarkGenerated writes the reports of a check of a generated folder
// (welfare generate --days 365 --seed 7) at 1,000 and 10,000 animals: the
// report step of `welfare check --pdf --json`, whose size follows the
// records (care coverage, weather) as well as the findings.
//
//	go test ./reports -run '^$' -bench 'Generated/animals=1000$/' -benchmem
func BenchmarkGenerated(b *testing.B) {
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("animals=%d", n), func(b *testing.B) {
			res := generatedResult(b, synth.Options{Animals: n, Days: 365, Seed: 7})
			benchWriters(b, res, "text", "json", "pdf")
		})
	}
}

// benchWriters benchmarks each named writer (text, json, csv, pdf) on res,
// one sub-benchmark each, writing to io.Discard.
func benchWriters(b *testing.B, res *checker.Result, names ...string) {
	writers := map[string]func(io.Writer) error{
		"text": func(w io.Writer) error { return reports.WriteText(w, res, reports.TextOptions{MaxPerCheck: 20}) },
		"json": func(w io.Writer) error { return reports.WriteJSON(w, res) },
		"csv":  func(w io.Writer) error { return reports.WriteCSV(w, res) },
		"pdf": func(w io.Writer) error {
			return pdf.Write(w, res, reports.PDFOptions{GeneratedAt: time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)})
		},
	}
	for _, name := range names {
		write, ok := writers[name]
		if !ok {
			b.Fatalf("no writer %q", name)
		}
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if err := write(io.Discard); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// generatedResult checks a folder made by welfare generate with opt (a
// year of the baseline farm, or the failing farm) with the shipped rules.
func generatedResult(tb testing.TB, opt synth.Options) *checker.Result {
	tb.Helper()
	dir := tb.TempDir()
	if _, err := synth.Generate(dir, opt); err != nil {
		tb.Fatal(err)
	}
	lim, err := rules.Default()
	if err != nil {
		tb.Fatal(err)
	}
	ctx := context.Background()
	policy, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	res, err := policy.Check(ctx, os.DirFS(dir), checker.Period{}, nil)
	if err != nil {
		tb.Fatal(err)
	}
	return res
}
