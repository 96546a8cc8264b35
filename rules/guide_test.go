package rules

import (
	"flag"
	"fmt"
	"os"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the generated section of README.md")

// guideInput is the committee guide's section on the input of each subject
// kind, generated from the input schemas so that it cannot drift from what
// the compiler checks rules against.
func guideInput(t *testing.T) string {
	t.Helper()
	var b strings.Builder
	for _, kind := range InputKinds() {
		s, err := InputSchema(kind)
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&b, "\n### %s\n\n%s\n\n| field | type | meaning |\n|---|---|---|\n", kind, s.Description)
		for _, f := range s.Fields() {
			fmt.Fprintf(&b, "| `input.%s` | %s | %s |\n", f.Path, cell(f.Type), cell(f.Description))
		}
	}
	return b.String() + "\n"
}

func cell(s string) string {
	s = strings.Join(strings.Fields(s), " ")
	return strings.ReplaceAll(s, "|", `\|`)
}

// TestGuideInput: the guide's input section equals the one generated from
// rules/schemas; -update rewrites it.
func TestGuideInput(t *testing.T) {
	const begin, end = "<!-- input: begin -->\n", "<!-- input: end -->"
	b, err := os.ReadFile("README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	i, j := strings.Index(text, begin), strings.Index(text, end)
	if i < 0 || j < i {
		t.Fatalf("README.md lacks the %q … %q markers", begin, end)
	}
	got := text[i+len(begin) : j]
	want := guideInput(t)
	if *update {
		if err := os.WriteFile("README.md", []byte(text[:i+len(begin)]+want+text[j:]), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	if got != want {
		t.Errorf("README.md's input section is stale: run go test ./rules -run TestGuideInput -update")
	}
	for _, kind := range InputKinds() {
		if !strings.Contains(got, "### "+kind+"\n") {
			t.Errorf("input section has no heading for %s", kind)
		}
	}
}
