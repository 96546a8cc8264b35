package demo

import (
	"bytes"
	"fmt"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// TestDemoLoads loads the demo with the default limits' species: exactly the
// planted rejected rows are rejected, every other row is accepted, and
// nothing is left over as a warning.
func TestDemoLoads(t *testing.T) {
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(FS(), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	s, err := generate()
	if err != nil {
		t.Fatal(err)
	}
	var want []string
	for _, f := range s.planted {
		if f.check == "records.row.rejected" {
			want = append(want, f.subject)
		}
	}
	var got []string
	for _, p := range set.Problems {
		got = append(got, fmt.Sprintf("%s:%d", p.File, p.Line))
		t.Logf("rejected: %s:%d (day %s): %s: %s", p.File, p.Line, p.Day, p.Column, p.Reason)
	}
	sortStrings := cmp.Transformer("sort", func(in []string) []string {
		out := append([]string(nil), in...)
		for i := range out {
			for j := i + 1; j < len(out); j++ {
				if out[j] < out[i] {
					out[i], out[j] = out[j], out[i]
				}
			}
		}
		return out
	})
	if diff := cmp.Diff(want, got, sortStrings); diff != "" {
		t.Errorf("rejected rows (-want +got):\n%s", diff)
	}
	for _, w := range set.Warnings {
		t.Errorf("warning: %s %s: %s", w.File, w.Column, w.Message)
	}
	rejected := map[string]int{}
	for _, r := range want {
		rejected[r[:strings.IndexByte(r, ':')]]++
	}
	for _, fc := range set.Accounting {
		if fc.Failed != "" || fc.Rejected != rejected[fc.File] || fc.Read != fc.Accepted+fc.Rejected {
			t.Errorf("%s: read %d accepted %d rejected %d failed %q; want %d rejected", fc.File, fc.Read, fc.Accepted, fc.Rejected, fc.Failed, rejected[fc.File])
		}
	}
	if got, want := len(set.Animals), 116-1-1; got != want { // 115 animal rows (RF-425 and DG-02 from the veterinary corrections), one rejected
		t.Errorf("%d animals accepted, want %d", got, want)
	}
}
