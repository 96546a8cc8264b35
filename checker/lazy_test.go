package checker

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"testing"
	"time"

	"welfare/records"
	"welfare/rules"
)

var updateDocs = flag.Bool("update", false, "rewrite testdata/documents.golden.json from the facts as they are built now")

// documentsGolden holds, for both demo seasons and a generated year, a
// digest of every section of every kind of subject document (its subjects,
// bytes and SHA-256 of its JSON), resolved: a change that only makes the
// fact builders cheaper, or a section lazy, must leave every digest as it
// was; a change to the documents on purpose rewrites it with -update.

const documentsGolden = "testdata/documents.golden.json"

// documentSets are the facts of both demo seasons and of a generated year.
func documentSets(t *testing.T) map[string]*facts {
	t.Helper()
	all := demoFacts(t)
	out := map[string]*facts{"demo-1": all[0], "demo-2": all[1]}
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	set, _ := generatedSet(t, 150, lim)
	from, to := recordSpan(set)
	g := newFacts(set, lim, Period{From: from, To: to})
	// As a check that keeps only its result builds them: the care rounds
	// go once the builders that read them are done, and the event rows
	// once every builder is, so a lazy section that read either when made
	// would fail here.
	buildFacts(g, set.DropCare)
	dropEvents(set)
	out["generated-150"] = g
	return out
}

// sectionDigest is the JSON of one section of every document of a kind that
// has it, in subject order, as a SHA-256 with its byte count.
type sectionDigest struct {
	Docs  int    `json:"docs"`
	Bytes int    `json:"bytes"`
	SHA   string `json:"sha256"`
}

func hasLazy(v any) bool {
	switch x := v.(type) {
	case *lazy:
		return true
	case map[string]any:
		for _, e := range x {
			if hasLazy(e) {
				return true
			}
		}
	case []any:
		for _, e := range x {
			if hasLazy(e) {
				return true
			}
		}
	}
	return false
}

// TestResolvedDocumentsAsBefore walks every document of both demo seasons
// and a generated year: resolving gives plain values only, the same each
// time, and for the golden sections exactly the JSON the eager builder gave.
func TestResolvedDocumentsAsBefore(t *testing.T) {
	got := map[string]map[string]sectionDigest{}
	for name, f := range documentSets(t) {
		got[name] = map[string]sectionDigest{}
		for _, kind := range SubjectKinds {
			docs := f.inputs(kind)
			sections := map[string][][]byte{}
			counted := map[string]int{}
			for _, d := range docs {
				r := resolveDoc(d)
				if hasLazy(r) {
					t.Fatalf("%s %s %v: a lazy value is left after resolving", name, kind, d["id"])
				}
				again, _ := json.Marshal(resolveDoc(d))
				once, err := json.Marshal(r)
				if err != nil {
					t.Fatal(err)
				}
				if string(once) != string(again) {
					t.Fatalf("%s %s %v: resolving twice gives two documents", name, kind, d["id"])
				}
				for k := range d {
					key := kind + "." + k
					b, _ := json.Marshal([]any{d["id"], r[k]})
					sections[key] = append(sections[key], b)
					counted[key]++
				}
			}
			for key, parts := range sections {
				// Subject order: f.inputs sorts by id.
				h := sha256.New()
				n := 0
				for _, p := range parts {
					h.Write(p)
					h.Write([]byte{'\n'})
					n += len(p) + 1
				}
				got[name][key] = sectionDigest{Docs: counted[key], Bytes: n, SHA: hex.EncodeToString(h.Sum(nil))}
			}
		}
	}
	want := got
	if *updateDocs {
		b, err := json.MarshalIndent(want, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.FromSlash(documentsGolden), append(b, '\n'), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	b, err := os.ReadFile(filepath.FromSlash(documentsGolden))
	if err != nil {
		t.Fatal(err)
	}
	var golden map[string]map[string]sectionDigest
	if err := json.Unmarshal(b, &golden); err != nil {
		t.Fatal(err)
	}
	for name, byKey := range golden {
		for key, w := range byKey {
			if g, ok := got[name][key]; !ok {
				t.Errorf("%s %s: in the golden, not in the documents", name, key)
			} else if g != w {
				t.Errorf("%s %s: documents %+v, golden %+v", name, key, g, w)
			}
		}
	}
	for name, byKey := range got {
		for key := range byKey {
			if _, ok := golden[name][key]; !ok {
				t.Errorf("%s %s: in the documents, not in the golden (go test ./checker -run TestResolvedDocumentsAsBefore -update)", name, key)
			}
		}
	}
}

// plainDocs is every document of f, resolved (resolveDoc), by kind and id.
func plainDocs(f *facts) map[string]map[string]map[string]any {
	out := map[string]map[string]map[string]any{}
	for kind, byID := range f.docs {
		out[kind] = map[string]map[string]any{}
		for id, d := range byID {
			out[kind][id] = resolveDoc(d)
		}
	}
	return out
}

// TestRowRefsKeepTheText: a kept ref gives back the text it was made from,
// in every form the loader makes and a few it does not.
func TestRowRefsKeepTheText(t *testing.T) {
	rt := newRowRefs()
	in := []records.Ref{"daily_care.csv:212", "facility.yaml:7", "records.xlsx:daily_care!212",
		"records.xlsx:daily_care!E4", "x.csv:007", "x.csv:", "", "x.csv:12345678901", "daily_care.csv:213"}
	codes := make([]rowRef, len(in))
	for i, r := range in {
		codes[i] = rt.code(r)
	}
	for i, r := range in {
		if got := rt.ref(codes[i]); got != string(r) {
			t.Errorf("%q kept as %+v gives %q", r, codes[i], got)
		}
	}
	if codes[0].part != codes[8].part {
		t.Errorf("two lines of one file keep the file twice: %+v %+v", codes[0], codes[8])
	}
}

// TestMinuteStampOf: the day's text and the local minute give what
// formatting the time gives, in zones either side of UTC and across a
// daylight-saving change.
func TestMinuteStampOf(t *testing.T) {
	for _, name := range []string{"UTC", "America/Anchorage", "Europe/Helsinki", "Asia/Kolkata"} {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Skip(err)
		}
		for at := time.Date(2025, 3, 1, 0, 0, 0, 0, loc); at.Before(time.Date(2025, 11, 10, 0, 0, 0, 0, loc)); at = at.Add(97 * time.Minute) {
			want := at.Format("2006-01-02 15:04")
			if got := minuteStampOf(stampDay(records.DayOf(at)), minuteOfDay(at)); got != want {
				t.Fatalf("%s: %q, want %q", name, got, want)
			}
		}
	}
	if got, want := minuteStampOf(stampDay(0), 61), "1970-01-01 01:01"; got != want {
		t.Errorf("day 0: %q, want %q", got, want)
	}
}

// TestSharedFiguresErrorNotPanic: a shared figure that cannot be made an
// OPA value is an error of the subject's conversion, not a crash of the
// check.
func TestSharedFiguresErrorNotPanic(t *testing.T) {
	if _, err := objectPairs(newConverter(), map[string]any{"on": "2026-01-05", "x": make(chan int)}, 0); err == nil {
		t.Fatal("a channel in a shared figure converted without error")
	}
	pairs, err := objectPairs(newConverter(), map[string]any{"on": "2026-01-05", "n": 2}, 3)
	if err != nil || len(pairs) != 2 || cap(pairs) != 5 {
		t.Fatalf("objectPairs: %d pairs (cap %d), %v; want 2 (cap 5)", len(pairs), cap(pairs), err)
	}
	bad := errors.New("site figures broken")
	eh := &encHeat{days: []hotDayOf{{}}, on: &siteHeat{err: bad}}
	if _, err := eh.sectionTerm(newConverter()); !errors.Is(err, bad) {
		t.Fatalf("heat section: %v, want the site's error", err)
	}
	ec := &encCold{sc: &siteCold{err: bad}}
	if _, err := ec.sectionTerm(newConverter()); !errors.Is(err, bad) {
		t.Fatalf("cold section: %v, want the site's error", err)
	}
}
