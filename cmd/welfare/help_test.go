package main

import (
	"flag"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

var update = flag.Bool("update", false, "rewrite README.md's usage section from usage.txt and the golden files under testdata/golden/demo")

const (
	readmePath  = "../../README.md"
	usageBegin  = "<!-- usage: begin (generated from cmd/welfare/usage.txt; do not edit here) -->\n```text\n"
	usageEnd    = "```\n<!-- usage: end -->"
	usageUpdate = "go test ./cmd/welfare -update"
)

// README's usage section is the usage text welfare prints, so the two
// cannot drift apart.
func TestReadmeUsageIsTheHelpText(t *testing.T) {
	b, err := os.ReadFile(readmePath)
	if err != nil {
		t.Fatal(err)
	}
	readme := string(b)
	i := strings.Index(readme, usageBegin)
	j := strings.Index(readme, usageEnd)
	if i < 0 || j < i {
		t.Fatalf("README.md lacks the usage markers %q … %q", usageBegin, usageEnd)
	}
	got := readme[i+len(usageBegin) : j]
	want := usageText()
	if got == want {
		return
	}
	if *update {
		if err := os.WriteFile(readmePath, []byte(readme[:i+len(usageBegin)]+want+readme[j:]), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	t.Errorf("README.md's usage section is stale; run %s (-want +got):\n%s", usageUpdate, cmp.Diff(want, got))
}

// Every command has its section in usage.txt, and every section names a
// command or one of the shared parts.
func TestEveryCommandHasItsUsage(t *testing.T) {
	shared := map[string]bool{"welfare": true, "arguments": true, "exit": true}
	seen := map[string]bool{}
	for _, s := range sections() {
		seen[s.name] = true
		if shared[s.name] {
			continue
		}
		if _, ok := commands[s.name]; !ok {
			t.Errorf("usage.txt has a section %q but there is no such command", s.name)
			continue
		}
		if !strings.HasPrefix(s.synopsis, "welfare "+s.name) || s.summary == "" {
			t.Errorf("usage.txt section %q: synopsis %q should start with %q and be followed by a summary", s.name, s.synopsis, "welfare "+s.name)
		}
	}
	for name := range commands {
		if !seen[name] {
			t.Errorf("command %q has no section in usage.txt", name)
		}
	}
	for name := range shared {
		if !seen[name] {
			t.Errorf("usage.txt lacks the %q section", name)
		}
	}
}

// help NAME, NAME -h, NAME --help and NAME -help print the same text, and it
// lists every flag the command's FlagSet defines, as users type it.
func TestHelpAndDashHAgree(t *testing.T) {
	for _, name := range commandNames() {
		t.Run(name, func(t *testing.T) {
			code, want, stderr := runMain(t, "help", name)
			if code != exitOK {
				t.Fatalf("welfare help %s: exit %d\n%s", name, code, stderr)
			}
			for _, h := range []string{"-h", "--help", "-help"} {
				code, got, stderr := runMain(t, name, h)
				if code != exitOK {
					t.Errorf("welfare %s %s: exit %d\n%s", name, h, code, stderr)
				}
				if diff := cmp.Diff(want, got); diff != "" {
					t.Errorf("welfare %s %s differs from welfare help %s (-want +got):\n%s", name, h, name, diff)
				}
			}
			if c := commands[name]; c.flags != nil {
				c.flags().VisitAll(func(f *flag.Flag) {
					dash := "--"
					if len(f.Name) == 1 {
						dash = "-"
					}
					if !strings.Contains(want, "\n  "+dash+f.Name) {
						t.Errorf("welfare help %s does not list %s%s", name, dash, f.Name)
					}
				})
			}
		})
	}
	for _, args := range [][]string{{"help"}, {"-h"}, {"--help"}, {"-help"}} {
		code, got, _ := runMain(t, args...)
		if code != exitOK || got != overviewHelp() {
			t.Errorf("welfare %s: exit %d, want 0 and the overview", strings.Join(args, " "), code)
		}
	}
}

// The flags usage.txt shows for a command (in its synopsis and examples)
// are flags its FlagSet defines, so the text and the parser cannot drift.
func TestUsageFlagsExist(t *testing.T) {
	flagRef := regexp.MustCompile(`(?:^|[\s\[])(--?[a-z][a-z-]*)`)
	for _, s := range sections() {
		c, ok := commands[s.name]
		if !ok {
			continue
		}
		text := s.synopsis
		for _, e := range s.examples {
			text += "\n" + commentTail.ReplaceAllString(e, "")
		}
		for _, m := range flagRef.FindAllStringSubmatch(text, -1) {
			name := strings.TrimLeft(m[1], "-")
			if name == "h" || name == "help" {
				continue
			}
			if c.flags == nil || c.flags().Lookup(name) == nil {
				t.Errorf("usage.txt shows %s for %q, which has no such flag", m[1], s.name)
			}
		}
	}
}
