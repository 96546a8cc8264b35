package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"welfare/rules"
)

// Every command line printed for users runs as printed: in README.md and
// DEVELOPERS.md, in "welfare help" and every "welfare help COMMAND", and in
// what the commands themselves print (hints such as the demo's "Try:
// welfare check welfare-demo/records --on 2026-01-15 --only cold"). Each is
// run in process, in a folder holding the demo, with placeholders (RECORDS,
// DIR, FILE, …) replaced; one that exits 2 is a broken instruction.
//
// Commands are found, not listed: a command added to the table in main.go
// gets its help page read here, and any line a doc or a command prints that
// starts with "welfare" (or "go run ./cmd/welfare") is picked up.
func TestPrintedCommandsRun(t *testing.T) {
	if testing.Short() {
		t.Skip("runs every printed command against the demo")
	}
	var docs []printedText
	for _, name := range []string{"README.md", "DEVELOPERS.md"} {
		b, err := os.ReadFile(filepath.Join("..", "..", name))
		if err != nil {
			t.Fatal(err)
		}
		docs = append(docs, printedText{name, string(b)})
	}

	tmp := t.TempDir()
	t.Chdir(tmp)
	// What the printed commands expect to find: the demo (README's first
	// set-up step), a limits file ("welfare limits show > limits.yaml") and
	// a committee's rules folder.
	if err := os.WriteFile("limits.yaml", rules.DefaultLimits(), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir("our-rules", 0o755); err != nil {
		t.Fatal(err)
	}
	r := &printedRunner{t: t}
	if code, _, stderr := r.run([]string{"demo"}); code != exitOK {
		t.Fatalf("welfare demo: exit %d\n%s", code, stderr)
	}

	queue := docs
	queue = append(queue, printedText{"welfare help", captured(t, r, "help")})
	for _, name := range commandNames() {
		queue = append(queue, printedText{"welfare help " + name, captured(t, r, "help", name)})
	}
	seen := map[string]bool{}
	perSource := map[string]int{}
	fromOutput := 0
	covered := map[string]bool{}
	for len(queue) > 0 {
		src := queue[0]
		queue = queue[1:]
		lines, synopses := printedCommands(src.text)
		for _, s := range synopses {
			// A synopsis ("welfare rules list|test [DIR...]") is grammar,
			// not a command; its command must exist.
			if f := strings.Fields(s); len(f) > 1 && isWord(f[1]) {
				if _, ok := commands[f[1]]; !ok {
					t.Errorf("%s shows %q, but there is no command %q", src.name, s, f[1])
				}
			}
		}
		for _, line := range lines {
			perSource[src.name]++
			if strings.HasPrefix(src.name, "output of") {
				fromOutput++
			}
			if seen[line] {
				continue
			}
			seen[line] = true
			args, stdoutFile, err := r.substitute(line)
			if err != nil {
				t.Errorf("%s prints %q: %v", src.name, line, err)
				continue
			}
			covered[args[0]] = true
			code, stdout, stderr := r.run(args)
			t.Logf("%s: %s → exit %d", src.name, line, code)
			if code == exitUsage {
				t.Errorf("%s prints\n\t%s\nwhich exits 2 (run as welfare %q):\n%s", src.name, line, args, stderr)
				continue
			}
			if stdoutFile != "" {
				if err := os.WriteFile(stdoutFile, []byte(stdout), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			queue = append(queue, printedText{"output of `" + line + "`", stdout + stderr})
		}
	}
	for _, src := range docs {
		if perSource[src.name] == 0 {
			t.Errorf("found no command line in %s: has the extraction broken?", src.name)
		}
	}
	if fromOutput == 0 {
		t.Error("found no command line in the programme's own output, not even the demo's hint")
	}
	for _, name := range commandNames() {
		if !covered[name] {
			t.Errorf("no printed example runs %q: add one to its section in usage.txt", name)
		}
	}
	t.Logf("ran %d printed command lines", len(seen))
}

type printedText struct{ name, text string }

func captured(t *testing.T, r *printedRunner, args ...string) string {
	t.Helper()
	code, stdout, stderr := r.run(args)
	if code != exitOK {
		t.Fatalf("welfare %s: exit %d\n%s", strings.Join(args, " "), code, stderr)
	}
	return stdout
}

var (
	// Where a command may begin: "welfare" or "go run ./cmd/welfare",
	// then a space.
	commandStart = regexp.MustCompile(`(go run \./cmd/welfare|welfare) `)
	commentTail  = regexp.MustCompile(`\s+#.*$`)
	fence        = regexp.MustCompile("^\\s*```")
)

// printedCommands finds the command lines in a text: in a fenced code
// block, every line starting with welfare; elsewhere (inline code, quotes,
// help text, hints) a welfare command naming a known subcommand that is
// quoted, begins a line, or follows a colon ("Try: welfare check …").
// Lines showing grammar ([optional], a|b, repeated...) are synopses.
func printedCommands(text string) (lines, synopses []string) {
	inFence := false
	for _, line := range strings.Split(text, "\n") {
		if fence.MatchString(line) {
			inFence = !inFence
			continue
		}
		for _, m := range commandStart.FindAllStringIndex(line, -1) {
			start := m[0]
			before := byte(' ')
			if start > 0 {
				before = line[start-1]
			}
			var cmd string
			lineStart := strings.TrimSpace(line[:start]) == "" || strings.TrimSpace(line[:start]) == "$"
			switch {
			case before == '`' || before == '\'' || before == '"':
				end := strings.IndexByte(line[start:], before)
				if end < 0 {
					continue
				}
				cmd = line[start : start+end]
			case lineStart || strings.HasSuffix(strings.TrimSpace(line[:start]), ":"):
				cmd = strings.TrimRight(commentTail.ReplaceAllString(line[start:], ""), " .")
			default:
				continue
			}
			cmd = strings.TrimSpace(strings.TrimPrefix(cmd, "go run ./cmd/"))
			words := strings.Fields(cmd)
			if len(words) < 2 {
				continue
			}
			if _, known := commands[words[1]]; !known && !(inFence && lineStart && before != '`') {
				continue // prose: "welfare checks the husbandry …"
			}
			if strings.ContainsAny(cmd, "[|…") || strings.Contains(cmd, "...") {
				synopses = append(synopses, cmd)
				continue
			}
			lines = append(lines, cmd)
		}
	}
	return lines, synopses
}

func isWord(s string) bool { return regexp.MustCompile(`^[a-z][a-z-]*$`).MatchString(s) }

// printedRunner runs printed commands in the current folder.
type printedRunner struct {
	t    *testing.T
	dirs int
}

func (r *printedRunner) run(args []string) (int, string, string) {
	var stdout, stderr bytes.Buffer
	code := exitCode(run(context.Background(), args, &stdout, &stderr), &stderr)
	return code, stdout.String(), stderr.String()
}

var placeholder = regexp.MustCompile(`^[A-Z][A-Z_]*[A-Z]$`)

// substitute splits a printed command as a shell would, drops "welfare",
// takes "> file" as where standard output goes, and replaces placeholders
// with things that exist here.
func (r *printedRunner) substitute(line string) (args []string, stdoutFile string, err error) {
	words, err := shellWords(line)
	if err != nil {
		return nil, "", err
	}
	words = words[1:] // "welfare"
	for i := 0; i < len(words); i++ {
		w := words[i]
		switch {
		case w == ">" && i+1 < len(words):
			stdoutFile = words[i+1]
			i++
			continue
		case strings.HasPrefix(w, ">") && len(w) > 1:
			stdoutFile = w[1:]
			continue
		}
		flagName, value, isFlagValue := strings.Cut(w, "=")
		if !isFlagValue || !strings.HasPrefix(w, "-") {
			flagName, value = "", w
		}
		if placeholder.MatchString(value) {
			prev := ""
			if i > 0 {
				prev = words[i-1]
			}
			v, err := r.placeholderValue(value, prev)
			if err != nil {
				return nil, "", err
			}
			if flagName != "" {
				v = flagName + "=" + v
			}
			w = v
		}
		args = append(args, w)
	}
	if len(args) == 0 {
		return nil, "", fmt.Errorf("no command after welfare")
	}
	return args, stdoutFile, nil
}

// placeholderValue is what a user would type for a placeholder; a new
// placeholder in the docs fails here until it is given a value.
func (r *printedRunner) placeholderValue(p, prev string) (string, error) {
	switch p {
	case "RECORDS":
		return filepath.Join("welfare-demo", "records"), nil
	case "DIR":
		// A new, empty folder each time: for demo DIR, init DIR, --rules DIR.
		r.dirs++
		d := fmt.Sprintf("dir-%d", r.dirs)
		if err := os.Mkdir(d, 0o755); err != nil {
			return "", err
		}
		return d, nil
	case "FILE":
		if prev == "records" { // welfare help records FILE
			return "animals.csv", nil
		}
		return "limits.yaml", nil
	case "COMMAND":
		return "check", nil
	case "FINDINGS":
		// The findings file the demo wrote.
		return filepath.Join("welfare-demo", "findings.json"), nil
	case "PREVIOUS":
		// The previous review's findings, shipped with the winter demo.
		return filepath.Join("welfare-demo", "previous", "findings-2025-12.json"), nil
	case "DAY":
		return "2026-01-15", nil
	case "KIND":
		return "enclosure", nil
	}
	return "", fmt.Errorf("placeholder %s has no value in printed_test.go's placeholderValue: add one", p)
}

// shellWords splits a command line as a POSIX shell does for the quoting
// the docs use: 'single', "double" and backslash escapes.
func shellWords(s string) ([]string, error) {
	var words []string
	var cur strings.Builder
	inWord := false
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == ' ' || c == '\t':
			if inWord {
				words = append(words, cur.String())
				cur.Reset()
				inWord = false
			}
		case c == '\'' || c == '"':
			end := strings.IndexByte(s[i+1:], c)
			if end < 0 {
				return nil, fmt.Errorf("unclosed %c quote", c)
			}
			cur.WriteString(s[i+1 : i+1+end])
			i += end + 1
			inWord = true
		case c == '\\' && i+1 < len(s):
			i++
			cur.WriteByte(s[i])
			inWord = true
		default:
			cur.WriteByte(c)
			inWord = true
		}
	}
	if inWord {
		words = append(words, cur.String())
	}
	return words, nil
}
