package main

import (
	"context"
	_ "embed"
	"flag"
	"fmt"
	"io"
	"sort"
	"strings"
)

// usageDoc is the one source of the usage text: the overview, each
// command's help and README's usage section are all printed from it.
//
//go:embed usage.txt
var usageDoc string

// docSection is one "== NAME ==" section of usage.txt.
type docSection struct {
	name     string
	synopsis string   // a command's first line
	summary  string   // its first paragraph
	body     string   // the rest of the text, examples taken out
	examples []string // lines "  welfare …", indentation kept
	text     string   // a non-command section, whole
}

// sections parses usage.txt, in the order written.
func sections() []docSection {
	var out []docSection
	var cur *docSection
	var lines []string
	flush := func() {
		if cur == nil {
			return
		}
		text := strings.Trim(strings.Join(lines, "\n"), "\n")
		cur.text = text
		if _, isCmd := commands[cur.name]; isCmd {
			first, rest, _ := strings.Cut(text, "\n")
			cur.synopsis = first
			summary, body, _ := strings.Cut(rest, "\n\n")
			cur.summary = summary
			var kept []string
			for _, l := range strings.Split(body, "\n") {
				if strings.HasPrefix(l, "  welfare ") {
					cur.examples = append(cur.examples, l)
				} else {
					kept = append(kept, l)
				}
			}
			cur.body = strings.Trim(strings.Join(kept, "\n"), "\n")
		}
		out = append(out, *cur)
	}
	for _, l := range strings.Split(usageDoc, "\n") {
		if strings.HasPrefix(l, "== ") && strings.HasSuffix(l, " ==") {
			flush()
			cur = &docSection{name: strings.TrimSuffix(strings.TrimPrefix(l, "== "), " ==")}
			lines = nil
			continue
		}
		lines = append(lines, l)
	}
	flush()
	return out
}

func section(name string) (docSection, bool) {
	for _, s := range sections() {
		if s.name == name {
			return s, true
		}
	}
	return docSection{}, false
}

// overviewHelp is "welfare help": what the tool is, then usageText.
func overviewHelp() string {
	intro, _ := section("welfare")
	return intro.text + "\n\n" + usageText()
}

// usageText is the commands, examples and exit codes; README.md's usage
// section is exactly this text (tested).
func usageText() string {
	var b strings.Builder
	b.WriteString("Usage:\n\n")
	var examples []string
	for _, s := range sections() {
		if s.synopsis == "" {
			continue
		}
		fmt.Fprintf(&b, "  %s\n", s.synopsis)
		for _, l := range strings.Split(s.summary, "\n") {
			fmt.Fprintf(&b, "      %s\n", l)
		}
		examples = append(examples, s.examples...)
	}
	args, _ := section("arguments")
	exit, _ := section("exit")
	fmt.Fprintf(&b, "\n%s\n\nExamples:\n\n%s\n\n%s\n", args.text, strings.Join(examples, "\n"), exit.text)
	return b.String()
}

// commandHelp is "welfare help NAME" and "welfare NAME -h".
func commandHelp(name string) string {
	s, _ := section(name)
	var b strings.Builder
	fmt.Fprintf(&b, "Usage: %s\n\n%s\n", s.synopsis, s.summary)
	if s.body != "" {
		fmt.Fprintf(&b, "\n%s\n", s.body)
	}
	if c := commands[name]; c.flags != nil {
		if fs := c.flags(); hasFlags(fs) {
			b.WriteString("\nFlags:\n")
			printFlags(&b, fs)
		}
	}
	if len(s.examples) > 0 {
		fmt.Fprintf(&b, "\nExamples:\n%s\n", strings.Join(s.examples, "\n"))
	}
	args, _ := section("arguments")
	fmt.Fprintf(&b, "\n%s\n", args.text)
	return b.String()
}

func hasFlags(fs *flag.FlagSet) bool {
	n := 0
	fs.VisitAll(func(*flag.Flag) { n++ })
	return n > 0
}

// printFlags lists flags as users type them (--name VALUE), with their
// descriptions and non-empty defaults.
func printFlags(w io.Writer, fs *flag.FlagSet) {
	var all []*flag.Flag
	fs.VisitAll(func(f *flag.Flag) { all = append(all, f) })
	sort.Slice(all, func(i, j int) bool { return all[i].Name < all[j].Name })
	for _, f := range all {
		name, usage := flag.UnquoteUsage(f)
		dash := "--"
		if len(f.Name) == 1 {
			dash = "-"
		}
		line := "  " + dash + f.Name
		if !isBool(f) && name != "" {
			line += " " + name
		}
		fmt.Fprintf(w, "%s\n      %s", line, usage)
		if f.DefValue != "" && f.DefValue != "false" && f.DefValue != "[]" && !strings.Contains(usage, "default") {
			fmt.Fprintf(w, " (default %s)", f.DefValue)
		}
		fmt.Fprintln(w)
	}
}

func helpFlags() *flag.FlagSet { return flag.NewFlagSet("help", flag.ContinueOnError) }

func runHelp(_ context.Context, args []string, stdout, _ io.Writer) error {
	pos, err := parseArgs(helpFlags(), args)
	if err != nil {
		return err
	}
	if len(pos) > 0 && pos[0] == "records" {
		return runHelpRecords(pos[1:], stdout)
	}
	switch len(pos) {
	case 0:
		_, err := io.WriteString(stdout, overviewHelp())
		return err
	case 1:
		if _, ok := commands[pos[0]]; !ok {
			if s := closest(pos[0], commandNames()); s != "" {
				return usagef("help: no command %q (did you mean %q?)", pos[0], s)
			}
			return usagef("help: no command %q (commands: %s)", pos[0], strings.Join(commandNames(), ", "))
		}
		_, err := io.WriteString(stdout, commandHelp(pos[0]))
		return err
	}
	return usagef("help takes at most one command")
}

// listFlag collects a repeatable flag.
type listFlag []string

func (l *listFlag) String() string     { return strings.Join(*l, ",") }
func (l *listFlag) Set(v string) error { *l = append(*l, v); return nil }
