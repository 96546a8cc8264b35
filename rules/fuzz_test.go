package rules

import (
	"bytes"
	"errors"
	"testing"

	"welfare/records"
)

// FuzzLoadLimits: any limits text either decodes or fails with a LoadError
// naming the file, never a panic. The shipped limits are the main seed.
// Fuzz with `go test ./rules -run '^$' -fuzz FuzzLoadLimits -fuzztime 60s`.
func FuzzLoadLimits(f *testing.F) {
	f.Add(DefaultLimits())
	f.Add([]byte("cold:\n  bedding_wind_chill_c: -30\n"))
	f.Add([]byte("a: &a [*a]\n"))
	f.Add([]byte("species:\n  vulpes_vulpes: {}\nunknown_key: 1\n"))
	f.Add([]byte("\t- : :\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		l, err := LoadLimits(bytes.NewReader(data), "limits.yaml")
		if err != nil {
			var le *records.LoadError
			if !errors.As(err, &le) || le.File != "limits.yaml" || le.Reason == "" {
				t.Fatalf("error %v is not a LoadError of limits.yaml", err)
			}
			return
		}
		if l == nil {
			t.Fatal("no limits and no error")
		}
	})
}
