package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"welfare/checker"
)

// listedCheck is one check as "rules list --json" writes it.
type listedCheck struct {
	ID          string   `json:"id"`
	Domain      string   `json:"domain"`
	Title       string   `json:"title"`
	Description string   `json:"description"`
	Severity    string   `json:"severity"`          // the rule's default
	InForce     string   `json:"severity_in_force"` // after the limits' severity map: significant, minor, note or off
	Source      string   `json:"source"`
	Limits      []string `json:"limits"` // the limits the check reads, as dotted paths of the limits file
	Origin      string   `json:"origin"` // shipped or local
	File        string   `json:"file"`
	Row         int      `json:"row"`
	Package     string   `json:"package"`
	Subjects    []string `json:"subjects"`
	Needs       []string `json:"needs"`
}

// listChecks describes the checks in force; a check is local when it comes
// from a --rules folder.
func listChecks(checks []checker.CheckInfo, overrides map[string]string) []listedCheck {
	out := make([]listedCheck, 0, len(checks))
	for _, c := range checks {
		origin := "shipped"
		if c.Local {
			origin = "local"
		}
		inForce := string(c.Severity)
		if o, ok := overrides[c.ID]; ok {
			inForce = o
		}
		l := listedCheck{
			ID: c.ID, Domain: c.Domain, Title: c.Title, Description: strings.TrimSpace(c.Description),
			Severity: string(c.Severity), InForce: inForce, Source: c.Source, Limits: c.Limits,
			Origin: origin, File: c.File, Row: c.Row, Package: c.Package, Subjects: c.Subjects, Needs: c.Needs,
		}
		for _, p := range []*[]string{&l.Limits, &l.Subjects, &l.Needs} {
			if *p == nil {
				*p = []string{}
			}
		}
		out = append(out, l)
	}
	return out
}

func printChecks(w io.Writer, checks []listedCheck, asJSON bool) error {
	if asJSON {
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(checks)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "check\tseverity\trules\ttitle\tsource\tlimits read")
	for _, c := range checks {
		sev := c.Severity
		if c.InForce != c.Severity {
			sev = c.InForce + " (limits override; rule: " + c.Severity + ")"
		}
		limits := strings.Join(c.Limits, ", ")
		if limits == "" {
			limits = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", c.ID, sev, c.Origin, c.Title, c.Source, limits)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nSources marked 'from memory' are to be verified against the current text before relying on them.")
	return nil
}
