package main

import (
	"flag"
	"fmt"
	"sort"
	"strings"
	"time"
)

// parseArgs parses a subcommand's command line with its FlagSet, letting
// flags come before and after the positional arguments, as users type them
// ("welfare check RECORDS --pdf a.pdf" and "welfare check --pdf a.pdf
// RECORDS"). "--" ends the flags; a boolean flag never takes the next
// argument as its value; a flag with a value takes "--x=v" or "--x v".
// -h, -help and --help print the command's usage to stdout and return
// errHelp. It returns the positional arguments in the order given.
//
// The standard flag package stops at the first positional argument, so the
// arguments are sorted into flags and positionals here, knowing from the
// FlagSet which flags take a value; each value is set through its flag,
// which checks it, and a bad one is refused in words, not Go's.
func parseArgs(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			pos = append(pos, args[i+1:]...)
			break
		}
		if len(a) < 2 || a[0] != '-' {
			pos = append(pos, a)
			continue
		}
		name, _, hasValue := strings.Cut(strings.TrimPrefix(strings.TrimPrefix(a, "-"), "-"), "=")
		f := fs.Lookup(name)
		if f == nil {
			if name == "h" || name == "help" {
				return nil, helpRequested{commandHelp(fs.Name())}
			}
			return nil, &usageError{cmd: fs.Name(), msg: unknownFlag(fs, name)}
		}
		value := "true"
		switch {
		case hasValue:
			_, value, _ = strings.Cut(a, "=")
		case !isBool(f):
			if i+1 == len(args) {
				return nil, &usageError{cmd: fs.Name(), msg: fmt.Sprintf("flag --%s needs a value (--%s %s)", name, name, valueName(f))}
			}
			i++
			value = args[i]
		}
		if err := fs.Set(name, value); err != nil {
			return nil, &usageError{cmd: fs.Name(), msg: badValue(f, value, err)}
		}
	}
	return pos, nil
}

// helpRequested carries a command's usage text; run prints it and exits 0.
type helpRequested struct{ text string }

func (h helpRequested) Error() string { return "help requested" }

// badValue says what a flag's value should have been.
func badValue(f *flag.Flag, value string, err error) string {
	want := ""
	if g, ok := f.Value.(flag.Getter); ok {
		switch g.Get().(type) {
		case bool:
			want = "true or false"
		case int, int64, uint, uint64:
			want = "a whole number"
		case float64:
			want = "a number"
		case time.Duration:
			want = "a duration such as 30s, 5m or 1h"
		}
	}
	if want == "" {
		return fmt.Sprintf("--%s %q: %v", f.Name, value, err)
	}
	return fmt.Sprintf("--%s %q: want %s", f.Name, value, want)
}

func isBool(f *flag.Flag) bool {
	b, ok := f.Value.(interface{ IsBoolFlag() bool })
	return ok && b.IsBoolFlag()
}

// valueName is the back-quoted name in a flag's usage ("DAY", "FILE").
func valueName(f *flag.Flag) string {
	name, _ := flag.UnquoteUsage(f)
	if name == "" {
		return "VALUE"
	}
	return name
}

func unknownFlag(fs *flag.FlagSet, name string) string {
	var names []string
	fs.VisitAll(func(f *flag.Flag) { names = append(names, f.Name) })
	msg := fmt.Sprintf("unknown flag --%s", name)
	if s := closest(name, names); s != "" {
		return msg + fmt.Sprintf(" (did you mean --%s?)", s)
	}
	if len(names) == 0 {
		return msg + fmt.Sprintf(" (%s takes no flags)", fs.Name())
	}
	return msg
}

// closest returns the candidate nearest to s by edit distance when it is
// close enough to be a likely typing slip, or "" when none is.
func closest(s string, candidates []string) string {
	sort.Strings(candidates)
	best, bestD := "", -1
	for _, c := range candidates {
		d := editDistance(strings.ToLower(s), c)
		if bestD < 0 || d < bestD {
			best, bestD = c, d
		}
	}
	limit := 1
	if len(s) > 4 {
		limit = 2
	}
	if bestD < 0 || bestD > limit || bestD >= len(s) {
		return ""
	}
	return best
}

// editDistance is the optimal-string-alignment distance: insertions,
// deletions, substitutions and swaps of two neighbouring letters each
// count one, so "--pfd" is one step from "--pdf".
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	d := make([][]int, len(ra)+1)
	for i := range d {
		d[i] = make([]int, len(rb)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(ra)][len(rb)]
}

// countMsg says what a command needs and what it was given, so a flag
// value taken for a folder (or a forgotten one) is plain to see.
func countMsg(need string, got []string) string {
	if len(got) == 0 {
		return "needs " + need + ", got none"
	}
	return fmt.Sprintf("needs %s, got %d: %s", need, len(got), strings.Join(got, " "))
}

func unknownVerb(verb string, verbs ...string) string {
	msg := fmt.Sprintf("unknown verb %q (%s)", verb, strings.Join(verbs, " or "))
	if s := closest(verb, verbs); s != "" {
		msg = fmt.Sprintf("unknown verb %q (did you mean %q?)", verb, s)
	}
	return msg
}
