package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"welfare/checker"
)

// explainFinding is "check RECORDS --explain KEY": the check runs as
// usual, then the one subject of the finding is evaluated again and what
// the rule saw is printed instead of the summary.
func explainFinding(ctx context.Context, dir string, o *checkOpts, stdout io.Writer) error {
	if o.on != "" || o.jsonOut != "" || o.csvOut != "" || o.pdfOut != "" {
		return usagef("--explain prints one finding: give it without --on, --json, --csv and --pdf")
	}
	period, err := parsePeriod(o)
	if err != nil {
		return err
	}
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	sources, err := ruleSources(o.rules, o.rulesOnly)
	if err != nil {
		return err
	}
	policy, err := checker.Compile(ctx, lim, sources, checker.Options{Timeout: o.timeoutPerEval})
	if err != nil {
		return err
	}
	only, err := parseOnly(o.only, policy.Domains())
	if err != nil {
		return err
	}
	fsys, err := recordsFolder(dir)
	if err != nil {
		return err
	}
	var prev *checker.Previous
	if o.previous != "" {
		if prev, err = readPrevious(o.previous); err != nil {
			return err
		}
	}
	x, err := policy.Explainer(ctx, fsys, checker.CheckOptions{Period: period, Only: only, Previous: prev})
	if err != nil {
		return err
	}
	ex, err := x.Explain(ctx, o.explain)
	if err != nil {
		return err
	}
	return writeExplanation(stdout, ex)
}

func writeExplanation(w io.Writer, ex *checker.Explanation) error {
	f := ex.Finding
	fmt.Fprintf(w, "Finding %s (%s)\n", ex.Key, f.Severity)
	if !f.Until.IsZero() {
		fmt.Fprintf(w, "  from %s to %s\n", f.On, f.Until)
	}
	fmt.Fprintf(w, "  %s\n\n", f.Message)
	fmt.Fprintf(w, "Rule: %s:%d, check %s, %q (source: %s)\n\n", ex.Check.File, ex.Check.Row, ex.Check.ID, ex.Check.Title, ex.Check.Source)

	fmt.Fprintln(w, "Limits the rule reads, as in force:")
	if len(ex.Limits) == 0 {
		fmt.Fprintln(w, "  none (the rule compares the facts alone)")
	}
	for _, l := range ex.Limits {
		v := "(not in the limits)"
		if l.Value != nil {
			b, err := json.Marshal(l.Value)
			if err != nil {
				return err
			}
			v = string(b)
		}
		fmt.Fprintf(w, "  %s = %s\n", l.Path, v)
	}

	fmt.Fprintln(w, "\nEvidence rows:")
	if len(ex.Evidence) == 0 {
		fmt.Fprintln(w, "  none named")
	}
	for _, e := range ex.Evidence {
		switch {
		case e.Err != "":
			fmt.Fprintf(w, "  %s: %s\n", e.Ref, e.Err)
		case strings.Contains(string(e.Ref), ".csv:"):
			fmt.Fprintf(w, "  %s\n    %s\n    %s\n", e.Ref, e.Header, e.Line)
		default:
			fmt.Fprintf(w, "  %s\n    %s\n", e.Ref, e.Line)
		}
	}

	fmt.Fprintf(w, "\nFacts the rule saw (input, %s %v):\n", ex.Kind, ex.Input["id"])
	b, err := json.MarshalIndent(ex.Input, "", "  ")
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "%s\n", b)
	fmt.Fprintln(w, "\nThis explains a records check, not a veterinary judgement: the attending veterinarian, the animal-care committee and local law decide.")
	return nil
}
