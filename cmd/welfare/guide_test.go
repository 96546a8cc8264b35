package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/rules"
)

// guideStep is one thing the committee guide tells its reader to do: write
// a file, add to the end of one, or run a command.
type guideStep struct {
	write, add string // the file to write or add to, with text
	text       string
	command    string // a welfare command line
}

var (
	saveAs = regexp.MustCompile("[Ss]ave this as `([^`]+)`:\\s*$")
	addTo  = regexp.MustCompile("add this to the end of `([^`]+)`:\\s*$")
)

// guideSteps reads the guide's instructions in order: a fenced block after
// "Save this as `FILE`:" or "add this to the end of `FILE`:" is that
// file's text; every line of a sh block is a command.
func guideSteps(t *testing.T, text string) []guideStep {
	t.Helper()
	var steps []guideStep
	lines := strings.Split(text, "\n")
	target, mode := "", ""
	for i := 0; i < len(lines); i++ {
		line := lines[i]
		if m := saveAs.FindStringSubmatch(line); m != nil {
			target, mode = m[1], "write"
			continue
		}
		if m := addTo.FindStringSubmatch(line); m != nil {
			target, mode = m[1], "add"
			continue
		}
		if !strings.HasPrefix(line, "```") {
			continue
		}
		lang := strings.TrimPrefix(line, "```")
		var body []string
		for i++; i < len(lines) && lines[i] != "```"; i++ {
			body = append(body, lines[i])
		}
		switch {
		case lang == "sh":
			for _, c := range body {
				if c = strings.TrimSpace(c); c != "" {
					steps = append(steps, guideStep{command: c})
				}
			}
		case target != "" && mode == "write":
			steps = append(steps, guideStep{write: target, text: strings.Join(body, "\n") + "\n"})
		case target != "" && mode == "add":
			steps = append(steps, guideStep{add: target, text: strings.Join(body, "\n") + "\n"})
		}
		target, mode = "", ""
	}
	return steps
}

// TestCommitteeGuide follows rules/README.md word for word in an empty
// folder: writes the example files from its code blocks and runs its
// commands as printed. The examples' tests pass, and their findings fire on
// the demo and reach the PDF.
func TestCommitteeGuide(t *testing.T) {
	if testing.Short() {
		t.Skip("checks the demo with the guide's rules")
	}
	b, err := os.ReadFile(filepath.Join("..", "..", "rules", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	steps := guideSteps(t, string(b))
	t.Chdir(t.TempDir())
	r := &printedRunner{t: t}
	var written, ran []string
	outputs := map[string]string{}
	for _, s := range steps {
		switch {
		case s.write != "":
			if err := os.MkdirAll(filepath.Dir(s.write), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(s.write, []byte(s.text), 0o644); err != nil {
				t.Fatal(err)
			}
			written = append(written, s.write)
		case s.add != "":
			f, err := os.OpenFile(s.add, os.O_APPEND|os.O_WRONLY, 0)
			if err != nil {
				t.Fatalf("the guide adds to %s before it exists: %v", s.add, err)
			}
			_, err = f.WriteString(s.text)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
			if err != nil {
				t.Fatal(err)
			}
			written = append(written, s.add+" (added)")
		default:
			args, stdoutFile, err := r.substitute(s.command)
			if err != nil {
				t.Fatalf("%q: %v", s.command, err)
			}
			code, stdout, stderr := r.run(args)
			t.Logf("%s → exit %d", s.command, code)
			// check exits 1 for the demo's significant findings; anything
			// else must succeed.
			if code != exitOK && !(args[0] == "check" && code == exitFindings) {
				t.Fatalf("the guide's %q exits %d:\n%s%s", s.command, code, stdout, stderr)
			}
			if stdoutFile != "" {
				if err := os.WriteFile(stdoutFile, []byte(stdout), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			key := args[0]
			if len(args) > 1 {
				key += " " + args[1]
			}
			outputs[key] += stdout
			ran = append(ran, s.command)
		}
	}
	// The commands the guide names in its text run as printed too, after
	// the steps (placeholders as in TestPrintedCommandsRun).
	if err := os.WriteFile("limits.yaml", rules.DefaultLimits(), 0o644); err != nil {
		t.Fatal(err)
	}
	inline, _ := printedCommands(string(b))
	for _, line := range inline {
		if slices.Contains(ran, line) {
			continue
		}
		args, _, err := r.substitute(line)
		if err != nil {
			t.Errorf("the guide names %q: %v", line, err)
			continue
		}
		if code, stdout, stderr := r.run(args); code == exitUsage {
			t.Errorf("the guide names %q, which exits 2:\n%s%s", line, stdout, stderr)
		}
		ran = append(ran, line)
	}
	// The guide's severity example is a valid severity map of checks that
	// exist, and switches its check off.
	i := strings.Index(string(b), "```yaml\nseverity:\n")
	if i < 0 {
		t.Fatal("the guide has no severity example")
	}
	block := string(b)[i+len("```yaml\n"):]
	block = block[:strings.Index(block, "```")]
	lim := strings.Replace(string(rules.DefaultLimits()), "severity: {}\n", block, 1)
	if err := os.WriteFile("severity.yaml", []byte(lim), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := r.run([]string{"rules", "list", "--json", "--limits", "severity.yaml"})
	if code != exitOK {
		t.Fatalf("the guide's severity example: exit %d\n%s", code, errOut)
	}
	var listed []listedCheck
	if err := json.Unmarshal([]byte(out), &listed); err != nil {
		t.Fatal(err)
	}
	inForce := map[string]string{}
	for _, c := range listed {
		inForce[c.ID] = c.InForce
	}
	if diff := cmp.Diff(map[string]string{"handling.duration.exceeded": "note", "cold.frostbite.risk": "off"},
		map[string]string{"handling.duration.exceeded": inForce["handling.duration.exceeded"], "cold.frostbite.risk": inForce["cold.frostbite.risk"]}); diff != "" {
		t.Errorf("severity in force after the guide's example (-want +got):\n%s", diff)
	}

	want := []string{"our-rules/eyes.rego", "our-rules/eyes_test.rego", "our-limits.yaml (added)", "our-rules/weight.rego", "our-rules/weight_test.rego"}
	for _, w := range want {
		if !strings.Contains(strings.Join(written, "\n"), w) {
			t.Errorf("the guide writes %v, not %s", written, w)
		}
	}
	if !strings.Contains(outputs["rules test"], "Rule tests in our-rules: 4 of 4 passed") {
		t.Errorf("rules test after both examples does not pass all four tests:\n%s", outputs["rules test"])
	}
	for _, id := range []string{"local.eyes.unprotected", "local.weight.dropped"} {
		if !strings.Contains(outputs["check welfare-demo/records"], id) {
			t.Errorf("check with the guide's rules shows no %s finding:\n%s", id, outputs["check welfare-demo/records"])
		}
	}
	// RF-416's drop from 7.4 kg (Dec 29) to 6.5 kg (Jan 26), planted in the
	// demo as a weight loss: (7.4-6.5)/7.4 = 12.2 %, more than 10 %.
	if !strings.Contains(outputs["check welfare-demo/records"], "RF-416") {
		t.Errorf("the weight example does not fire for RF-416")
	}
	// --explain on the weight example: its limits and both weighings
	// (7.4 kg on Dec 29, 6.5 kg on Jan 26, testdata/demo/PLANTED.md).
	for _, s := range []string{"local.weight_drop_days = 30", "local.weight_drop_pct = 10", "our-rules/weight.rego:", "2025-12-29T10:48,RF-416,ST-04,7.4,", "2026-01-26T10:48,RF-416,ST-04,6.5,"} {
		if !strings.Contains(outputs["check welfare-demo/records"], s) {
			t.Errorf("--explain of the weight example lacks %q", s)
		}
	}
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skip("pdftotext not installed (apt-get install poppler-utils)")
	}
	pdfOut, err := exec.Command("pdftotext", "-layout", "our-audit.pdf", "-").Output()
	if err != nil {
		t.Fatalf("pdftotext our-audit.pdf: %v", err)
	}
	pdf := strings.Join(strings.Fields(string(pdfOut)), " ")
	for _, s := range []string{"local.eyes.unprotected", "local.weight.dropped", "No eye protection when handling a conscious animal (local rule)", "Weight dropped more than 10 % in 30 days (local rule)", "local.weight_drop_pct"} {
		if !strings.Contains(pdf, s) {
			t.Errorf("the PDF lacks %q", s)
		}
	}
	t.Logf("ran %q", ran)
}
