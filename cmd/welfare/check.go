package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
	"welfare/reports/pdf"
)

type checkOpts struct {
	from, to, on   string
	at             string // --on: the time of day to look from
	plain          bool   // --on: no box drawing
	only           string
	limits         limitsFiles
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
	packageTimeout time.Duration
	evalTimeout    time.Duration
	timings        bool
	explain        string
}

func checkFlags() (*flag.FlagSet, *checkOpts) {
	o := &checkOpts{}
	fs := flag.NewFlagSet("check", flag.ContinueOnError)
	fs.StringVar(&o.from, "from", "", "first `DAY` of the period (YYYY-MM-DD; default: the first dated record)")
	fs.StringVar(&o.to, "to", "", "last `DAY` of the period (default: the last dated record)")
	fs.StringVar(&o.on, "on", "", "check one `DAY` (today, yesterday or YYYY-MM-DD; --on alone: today) and print the keepers' view of that day, as the today command does")
	fs.StringVar(&o.at, "at", "", "with --on: the time of day `HH:MM` to look from (default: now when the day is today, the end of the day otherwise)")
	fs.BoolVar(&o.plain, "plain", false, "with --on: plain text, no box drawing")
	fs.StringVar(&o.only, "only", "", "comma-separated `DOMAINS` to report ("+strings.Join(checker.Domains(), ", ")+", or a committee's own)")
	addLimitsFlags(fs, &o.limits)
	fs.Var(&o.rules, "rules", "add the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "use only the --rules folders, not the built-in rules")
	fs.StringVar(&o.jsonOut, "json", "", "write the findings as JSON to `FILE`")
	fs.StringVar(&o.csvOut, "csv", "", "write the findings as CSV to `FILE`, and the run's scope beside it (FILE's name with .scope.txt)")
	fs.StringVar(&o.pdfOut, "pdf", "", "write the PDF audit report to `FILE`")
	fs.StringVar(&o.inspector, "inspector", "", "`NAME` of the person inspecting, shown on the report")
	fs.StringVar(&o.generatedAt, "generated-at", "", "report generation `TIME` (RFC 3339; default now) — the same time gives a byte-identical PDF")
	fs.StringVar(&o.previous, "previous", "", "the previous review's findings `FILE` (JSON written by --json): class each finding new or recurring, list what was resolved, judge the corrective actions")
	fs.StringVar(&o.failOn, "fail-on", "significant", "exit 1 when a finding is at or above this `SEVERITY` (significant, minor, note, never); rejected rows exit 1 under every value but never")
	fs.IntVar(&o.maxPerCheck, "max", 20, "findings shown per check in the terminal (`N`; every rejected row is shown; all are in JSON, CSV and PDF)")
	fs.DurationVar(&o.timeoutPerEval, "rule-timeout", checker.DefaultTimeout, "time budget of one rule package on one subject (a `DURATION` such as 5s or 1m)")
	fs.DurationVar(&o.packageTimeout, "package-timeout", checker.DefaultPackageBudget, "time budget of one rule package across all its subjects (a `DURATION`)")
	fs.DurationVar(&o.evalTimeout, "evaluation-timeout", checker.DefaultTotalBudget, "time budget of the whole rule evaluation, every package and subject (a `DURATION`)")
	fs.StringVar(&o.explain, "explain", "", "print why one finding fired instead of the summary: the facts the rule saw, the limits it read, the rule and the evidence rows (`KEY` = \"CHECK SUBJECT YYYY-MM-DD\")")
	fs.BoolVar(&o.timings, "timings", false, "print each step's wall time (load, facts, rules, reports), peak heap and CPU time to stderr")
	return fs, o
}

func runCheck(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := checkFlags()
	pos, err := parseArgs(fs, bareOn(args))
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "check", msg: countMsg("one records folder", pos)}
	}
	for _, b := range []struct {
		name string
		d    time.Duration
	}{{"rule-timeout", o.timeoutPerEval}, {"package-timeout", o.packageTimeout}, {"evaluation-timeout", o.evalTimeout}} {
		if b.d <= 0 {
			return usagef("--%s %s: a time budget must be more than 0 (such as 5s or 1m)", b.name, b.d)
		}
	}
	if o.explain != "" {
		return explainFinding(ctx, pos[0], o, stdout)
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
	ph := newPhases(stderr, o.timings)
	defer ph.finish()
	recordBytes := folderBytes(dir)
	ph.enter("compile", "")
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	sources, err := ruleSources(o.rules, o.rulesOnly)
	if err != nil {
		return err
	}
	policy, err := checker.Compile(ctx, lim, sources, checker.Options{Timeout: o.timeoutPerEval,
		PackageBudget: o.packageTimeout, TotalBudget: o.evalTimeout,
		Progress: func(phase string, done int) {
			if done == 0 {
				ph.enter(phase, map[string]string{"load": "rows", "rules": "subjects"}[phase])
				switch phase {
				case "load":
					paceLoad(recordBytes)
				case "facts":
					paceMemory()
				case "rules":
					paceRules()
				}
			}
			ph.set(done)
		}})
	if err != nil {
		return err
	}
	only, err := parseOnly(o.only, policy.Domains())
	if err != nil {
		return err
	}
	var prev *checker.Previous
	if o.previous != "" {
		if prev, err = readPrevious(o.previous); err != nil {
			return err
		}
	}
	fsys, err := recordsFolder(dir)
	if err != nil {
		return err
	}
	var view todayView
	res, checked, err := policy.CheckWith(ctx, fsys, checker.CheckOptions{Only: only, Previous: prev, DropRecords: o.on == "", Released: paceReleased, Scope: func(set *records.Set) (*records.Set, checker.Period, error) {
		if prev != nil && prev.Facility != set.Facility.Name {
			return nil, period, fmt.Errorf("--previous %s: the findings of %q, not of %q: give the previous review of this facility", o.previous, prev.Facility, set.Facility.Name)
		}
		if o.on == "" {
			return set, period, nil
		}
		// The keepers' view: one day, read as it stood at --at, so a round
		// due later is not judged from rows not yet written.
		var err error
		if view, err = planToday(o, set.Location, clock()); err != nil {
			return nil, period, err
		}
		if !view.endOfDay {
			set = set.Until(view.cut)
		}
		return set, checker.Period{From: view.day, To: view.day}, nil
	}})
	if err != nil {
		return err
	}
	if prev != nil && prev.Period.To >= res.Period.From {
		return fmt.Errorf("--previous %s: its period %s … %s does not end before this period starts (%s): give the review before this one",
			o.previous, prev.Period.From, prev.Period.To, res.Period.From)
	}
	ph.enter("reports", "")
	paceReports()

	var verdict reports.TodayVerdict
	if o.on != "" {
		verdict, err = reports.WriteToday(stdout, res, reports.TodayOptions{
			Day: view.day, At: view.at, EndOfDay: view.endOfDay, Records: checked,
			Schedule: scheduleOf(lim), AllCommand: allCommand(dir, o, view.day), Plain: o.plain, Only: only,
		})
	} else {
		err = reports.WriteText(stdout, res, reports.TextOptions{MaxPerCheck: o.maxPerCheck})
	}
	if err != nil {
		return err
	}
	// With a PDF, the findings.json and findings.csv written beside it are
	// kept and attached as they are, not written a second time.
	popt := reports.PDFOptions{Inspector: o.inspector, GeneratedAt: generated, SiteOf: res.SiteOf}
	keep := func(into *[]byte, write func(io.Writer, *checker.Result) error, encode func(*checker.Result) ([]byte, error)) func(io.Writer) error {
		return func(w io.Writer) error {
			if o.pdfOut == "" {
				return write(w, res)
			}
			b, err := encode(res)
			if err != nil {
				return err
			}
			*into = b
			_, err = w.Write(b)
			return err
		}
	}
	outputs := []struct {
		path  string
		write func(io.Writer) error
	}{
		{o.jsonOut, keep(&popt.FindingsJSON, reports.WriteJSON, reports.JSONBytes)},
		{o.csvOut, keep(&popt.FindingsCSV, reports.WriteCSV, reports.CSVBytes)},
		// The scope goes beside the CSV, not into it: a spreadsheet reads
		// findings.csv as one header row and one finding per row.
		{scopePath(o.csvOut), func(w io.Writer) error { return reports.WriteScope(w, res) }},
		{o.pdfOut, func(w io.Writer) error { return pdf.Write(w, res, popt) }},
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
	if o.on != "" {
		// The morning view's exit is its answer: 0 only for a real
		// all-clear.
		if !verdict.AllClear() {
			return errFindings
		}
		return nil
	}
	for _, f := range res.Findings {
		if failRank > 0 && f.Severity.Rank() >= failRank {
			return errFindings
		}
	}
	// Rows the loader rejected were not judged by any check: a run with
	// them never passes, whatever their severity says, unless the user
	// asked for --fail-on never.
	if failRank > 0 && len(res.Rejected) > 0 {
		fmt.Fprintf(stderr, "exit 1: %s rejected (rejected rows fail every --fail-on but never)\n", plural(len(res.Rejected), "row was", "rows were"))
		return errFindings
	}
	return nil
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// scopePath is the scope file written beside a CSV: findings.csv →
// findings.scope.txt; "" for no CSV.
func scopePath(csv string) string {
	if csv == "" {
		return ""
	}
	return strings.TrimSuffix(csv, filepath.Ext(csv)) + ".scope.txt"
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
		return p, nil // resolved in the facility's time zone once it is read
	}
	if o.at != "" || o.plain {
		return p, usagef("--at and --plain go with --on (the morning view)")
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
func parseOnly(s string, names []string) ([]string, error) {
	if s == "" {
		return nil, nil
	}
	var out []string
	for _, d := range strings.Split(s, ",") {
		d = strings.TrimSpace(d)
		if !slices.Contains(names, d) {
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
