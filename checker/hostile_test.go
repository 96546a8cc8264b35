package checker

import (
	"context"
	"io/fs"
	"strings"
	"testing"
	"testing/fstest"

	"welfare/records"
)

// TestFingerprintCoversFilesRead: the fingerprint covers exactly the files
// the loader reads: an unknown file, a named pipe or a link leading outside
// the folder does not change it; a file that is read does.
func TestFingerprintCoversFilesRead(t *testing.T) {
	base := func() fstest.MapFS {
		return fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF1\n")}, "facility.yaml": {Data: []byte("name: X\n")}}
	}
	want, err := Fingerprint(base(), nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		add  fstest.MapFS
		same bool
	}{
		{"unknown file", fstest.MapFS{"notes.txt": {Data: []byte("hello")}}, true},
		{"file in a subfolder", fstest.MapFS{"old/animals.csv": {Data: []byte("x")}}, true},
		{"named pipe", fstest.MapFS{"daily_care.csv": {Mode: fs.ModeNamedPipe}}, true},
		{"link outside", fstest.MapFS{"weather.csv": {Mode: fs.ModeSymlink, Data: []byte("../secret.csv")}}, true},
		{"record file read", fstest.MapFS{"weather.csv": {Data: []byte("observed_at\n")}}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := base()
			for k, v := range tc.add {
				fsys[k] = v
			}
			got, err := Fingerprint(fsys, nil, nil)
			if err != nil {
				t.Fatal(err)
			}
			if (got == want) != tc.same {
				t.Errorf("fingerprint changed = %v, want changed = %v", got != want, !tc.same)
			}
		})
	}
}

// TestDefaultPeriodBounded: a period worked out from the records that is
// longer than two years stops with a message asking for --from/--to; a
// period given in full is used as given.
func TestDefaultPeriodBounded(t *testing.T) {
	set := &records.Set{Care: []records.CareRound{{Day: records.MakeDay(2023, 1, 10)}, {Day: records.MakeDay(2025, 1, 11)}}}
	_, err := Check(context.Background(), Config{Records: set})
	if err == nil || err.Error() != "the records' dates run from 2023-01-10 to 2025-01-11, more than 2 years: give --from and --to to choose the period to check" {
		t.Errorf("err = %v", err)
	}
	for _, p := range []Period{{From: records.MakeDay(2022, 12, 1)}, {To: records.MakeDay(2025, 12, 1)}} {
		if _, err := Check(context.Background(), Config{Records: set, Period: p}); err == nil || !strings.Contains(err.Error(), "give --from and --to") {
			t.Errorf("period %v: err = %v", p, err)
		}
	}
	// Exactly two years is allowed (checked by span alone: no engine is needed to get past it).
	if err := defaultSpan(Period{}, Period{From: records.MakeDay(2023, 1, 10), To: records.MakeDay(2025, 1, 10)}); err != nil {
		t.Errorf("two years: %v", err)
	}
}
