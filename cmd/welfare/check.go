package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
	"welfare/reports/pdf"
)

type checkOpts struct {
	from, to, on   string
	only           string
	limits         string
	rules          listFlag
	rulesOnly      bool
	jsonOut        string
	csvOut         string
	pdfOut         string
	inspector      string
	generatedAt    string
	failOn         string
	previous       string
	maxPerCheck    int
	timeoutPerEval time.Duration
}

func checkFlags() (*flag.FlagSet, *checkOpts) {
	o := &checkOpts{}
	fs := flag.NewFlagSet("check", flag.ContinueOnError)
	fs.StringVar(&o.from, "from", "", "first `DAY` of the period (YYYY-MM-DD; default: the first dated record)")
	fs.StringVar(&o.to, "to", "", "last `DAY` of the period (default: the last dated record)")
	fs.StringVar(&o.on, "on", "", "check one `DAY` and print the morning view (sites' cold, problems to fix now)")
	fs.StringVar(&o.only, "only", "", "comma-separated `DOMAINS` to report (records, care, enclosure, handling, staff, ppe, protocol, cull, cold, or a committee's own)")
	fs.StringVar(&o.limits, "limits", "", "limits `FILE` (replaces the built-in limits; see 'welfare limits show')")
	fs.Var(&o.rules, "rules", "add the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "use only the --rules folders, not the built-in rules")
	fs.StringVar(&o.jsonOut, "json", "", "write the findings as JSON to `FILE`")
	fs.StringVar(&o.csvOut, "csv", "", "write the findings as CSV to `FILE`")
	fs.StringVar(&o.pdfOut, "pdf", "", "write the PDF audit report to `FILE`")
	fs.StringVar(&o.inspector, "inspector", "", "`NAME` of the person inspecting, shown on the report")
	fs.StringVar(&o.generatedAt, "generated-at", "", "report generation `TIME` (RFC 3339; default now) — the same time gives a byte-identical PDF")
	fs.StringVar(&o.previous, "previous", "", "the previous review's findings `FILE` (JSON written by --json): class each finding new or recurring, list what was resolved, judge the corrective actions")
	fs.StringVar(&o.failOn, "fail-on", "significant", "exit 1 when a finding is at or above this `SEVERITY` (significant, minor, note, never)")
	fs.IntVar(&o.maxPerCheck, "max", 20, "findings shown per check in the terminal (`N`; all are in JSON, CSV and PDF)")
	fs.DurationVar(&o.timeoutPerEval, "rule-timeout", 5*time.Second, "time budget of one rule package on one subject (a `DURATION` such as 5s or 1m)")
	return fs, o
}

func runCheck(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := checkFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "check", msg: countMsg("one records folder", pos)}
	}
	return checkFolder(ctx, pos[0], o, stdout, stderr)
}

// checkFolder is the whole check: load, evaluate, write the reports, and
// turn the findings into the exit status.
func checkFolder(ctx context.Context, dir string, o *checkOpts, stdout, stderr io.Writer) error {
	if err := checkOutputs(o); err != nil {
		return err
	}
	failRank, err := failOnRank(o.failOn)
	if err != nil {
		return err
	}
	period, err := parsePeriod(o)
	if err != nil {
		return err
	}
	generated := time.Now().UTC().Truncate(time.Second)
	if o.generatedAt != "" {
		if generated, err = time.Parse(time.RFC3339, o.generatedAt); err != nil {
			return usagef("--generated-at %q is not an RFC 3339 time (2026-01-31T18:00:00Z)", o.generatedAt)
		}
	}
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	sources, err := ruleSources(o.rules, o.rulesOnly)
	if err != nil {
		return err
	}
	engine, err := checker.NewEngine(ctx, sources, lim.data, checker.EngineOptions{Timeout: o.timeoutPerEval})
	if err != nil {
		return err
	}
	only, err := parseOnly(o.only, engine.Checks())
	if err != nil {
		return err
	}
	var prev *checker.Previous
	if o.previous != "" {
		if prev, err = readPrevious(o.previous); err != nil {
			return err
		}
	}
	fsys, set, err := loadRecords(dir, lim)
	if err != nil {
		return err
	}
	if prev != nil && prev.Facility != set.Facility.Name {
		return fmt.Errorf("--previous %s: the findings of %q, not of %q: give the previous review of this facility", o.previous, prev.Facility, set.Facility.Name)
	}
	fp, err := checker.Fingerprint(fsys, sources, lim.src)
	if err != nil {
		return err
	}
	res, err := checker.Check(ctx, checker.Config{
		Records: set, Limits: lim.limits, LimitsSource: lim.src, Engine: engine,
		Period: period, Only: only, Fingerprint: fp, Previous: prev,
	})
	if err != nil {
		return err
	}
	if prev != nil && prev.Period.To >= res.Period.From {
		return fmt.Errorf("--previous %s: its period %s … %s does not end before this period starts (%s): give the review before this one",
			o.previous, prev.Period.From, prev.Period.To, res.Period.From)
	}

	if o.on != "" {
		err = reports.WriteMorning(stdout, res, period.From)
	} else {
		err = reports.WriteText(stdout, res, reports.TextOptions{MaxPerCheck: o.maxPerCheck})
	}
	if err != nil {
		return err
	}
	outputs := []struct {
		path  string
		write func(io.Writer) error
	}{
		{o.jsonOut, func(w io.Writer) error { return reports.WriteJSON(w, res) }},
		{o.csvOut, func(w io.Writer) error { return reports.WriteCSV(w, res) }},
		{o.pdfOut, func(w io.Writer) error {
			return pdf.Write(w, res, reports.PDFOptions{Inspector: o.inspector, GeneratedAt: generated, SiteOf: siteOf(set)})
		}},
	}
	for _, out := range outputs {
		if out.path == "" {
			continue
		}
		if err := writeFile(ctx, out.path, out.write); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s\n", out.path)
	}
	for _, f := range res.Findings {
		if failRank > 0 && f.Severity.Rank() >= failRank {
			return errFindings
		}
	}
	return nil
}

// siteOf maps the subjects of cold findings to the weather site whose
// chart they belong on: an enclosure to its building's site, a keeper to
// the site of their stints, a site to itself.
func siteOf(set *records.Set) map[string]string {
	m := map[string]string{}
	bsite := map[string]string{}
	for _, b := range set.Facility.Buildings {
		bsite[b.ID] = b.WeatherSite
	}
	for _, e := range set.Enclosures {
		if s := bsite[e.BuildingID]; s != "" {
			m[e.ID] = s
		}
	}
	for _, w := range set.Work {
		if _, ok := m[w.StaffID]; !ok {
			m[w.StaffID] = w.SiteID
		}
	}
	for _, s := range set.Facility.WeatherSites {
		m[s] = s
	}
	return m
}

func failOnRank(s string) (int, error) {
	if s == "never" {
		return 0, nil
	}
	r := checker.Severity(s).Rank()
	if r == 0 {
		return 0, usagef("--fail-on %q is not one of significant, minor, note, never", s)
	}
	return r, nil
}

func parsePeriod(o *checkOpts) (checker.Period, error) {
	var p checker.Period
	day := func(flagName, s string) (records.Day, error) {
		if s == "" {
			return 0, nil
		}
		d, err := records.ParseDay(s)
		if err != nil {
			return 0, usagef("--%s: %v", flagName, err)
		}
		return d, nil
	}
	var err error
	if o.on != "" {
		if o.from != "" || o.to != "" {
			return p, usagef("--on checks one day: give it without --from and --to")
		}
		d, err := day("on", o.on)
		return checker.Period{From: d, To: d}, err
	}
	if p.From, err = day("from", o.from); err != nil {
		return p, err
	}
	if p.To, err = day("to", o.to); err != nil {
		return p, err
	}
	if !p.From.IsZero() && !p.To.IsZero() && p.To < p.From {
		return p, usagef("--to %s is before --from %s", o.to, o.from)
	}
	return p, nil
}

// parseOnly checks --only against the domains of the rules in force, so a
// committee's own package is as selectable as the shipped ones.
func parseOnly(s string, checks []checker.CheckInfo) ([]string, error) {
	if s == "" {
		return nil, nil
	}
	known := map[string]bool{}
	var names []string
	for _, c := range checks {
		if !known[c.Domain] {
			known[c.Domain] = true
			names = append(names, c.Domain)
		}
	}
	var out []string
	for _, d := range strings.Split(s, ",") {
		d = strings.TrimSpace(d)
		if !known[d] {
			return nil, usagef("--only: %q is not a domain of the rules in force (%s)", d, strings.Join(names, ", "))
		}
		out = append(out, d)
	}
	return out, nil
}

// readPrevious reads the previous review's findings file.
func readPrevious(path string) (*checker.Previous, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("--previous: %w", err)
	}
	defer f.Close()
	prev, err := reports.ReadFindings(f, path)
	if err != nil {
		return nil, err
	}
	// Reports name the file, not the folder it was in on this machine.
	prev.File = filepath.Base(path)
	return prev, nil
}
