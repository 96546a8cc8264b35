package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"welfare/records/demo"
)

type demoOpts struct{ generatedAt, season string }

func demoFlags() (*flag.FlagSet, *demoOpts) {
	o := &demoOpts{}
	fs := flag.NewFlagSet("demo", flag.ContinueOnError)
	fs.StringVar(&o.generatedAt, "generated-at", "2026-02-02T08:00:00Z", "report generation `TIME` printed on the demo report")
	fs.StringVar(&o.season, "season", "winter", "which demo `SEASON`: winter (January, the cold season) or summer (July: heat, shade, indoor climate, cleaning)")
	return fs, o
}

// runDemo writes the invented station's records and checks them as a
// veterinarian would, writing every report beside them. The demo's findings
// are planted, so they do not make the exit status fail.
func runDemo(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := demoFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 1 {
		return &usageError{cmd: "demo", msg: countMsg("at most one folder", pos)}
	}
	dir := "welfare-demo"
	if len(pos) == 1 {
		dir = pos[0]
	}
	season, ok := demo.Seasons[o.season]
	if !ok {
		return usagef("--season is winter or summer, not %q", o.season)
	}
	recs := filepath.Join(dir, "records")
	if err := season.WriteTo(recs); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "Demo records (an invented station) written to %s\n\n", recs)
	co := &checkOpts{
		from:        season.From,
		to:          season.To,
		failOn:      "never",
		maxPerCheck: 3,
		jsonOut:     filepath.Join(dir, "findings.json"),
		csvOut:      filepath.Join(dir, "findings.csv"),
		pdfOut:      filepath.Join(dir, "audit.pdf"),
		inspector:   "Demo inspector (invented)",
		generatedAt: o.generatedAt,
	}
	if name, data, ok := season.Previous(); ok {
		// The earlier review, so the first report shows the whole loop:
		// new, recurring and resolved problems, and the plans judged.
		prevDir := filepath.Join(dir, "previous")
		if err := os.MkdirAll(prevDir, 0o755); err != nil {
			return err
		}
		co.previous = filepath.Join(prevDir, name)
		if err := os.WriteFile(co.previous, data, 0o644); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "The previous review (December 2025) written to %s\n\n", co.previous)
	}
	if err := checkFolder(ctx, recs, co, stdout, stderr); err != nil {
		return err
	}
	if season.Name == "summer" {
		fmt.Fprintf(stdout, "\nTry: welfare check --on 2026-07-16 --only heat,environment %s\n", recs)
		return nil
	}
	fmt.Fprintf(stdout, "\nTry: welfare check %s --on 2026-01-15 --only cold\n", recs)
	return nil
}
