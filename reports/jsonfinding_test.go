package reports

import (
	"bytes"
	"encoding/json"
	"reflect"
	"testing"
)

// encodedFinding is the finding as encoding/json writes it inside
// WriteJSON's findings array, the bytes appendFinding must give.
func encodedFinding(t testing.TB, f *JSONFinding) []byte {
	t.Helper()
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("    ", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(f); err != nil {
		t.Fatal(err)
	}
	return bytes.TrimSuffix(buf.Bytes(), []byte("\n"))
}

// fill sets every field of v (a struct) reflect can reach to a value
// naming it: strings, bools true, string slices of two, pointers to a
// filled struct. A field appendFinding does not write then shows as a
// difference, whatever its type.
func fill(t *testing.T, v reflect.Value) {
	t.Helper()
	for i := 0; i < v.NumField(); i++ {
		fv, name := v.Field(i), v.Type().Field(i).Name
		switch fv.Kind() {
		case reflect.String:
			fv.SetString(name + " ≤ −20 °C")
		case reflect.Bool:
			fv.SetBool(true)
		case reflect.Slice:
			fv.Set(reflect.ValueOf([]string{name + " a", name + " b"}))
		case reflect.Pointer:
			p := reflect.New(fv.Type().Elem())
			fill(t, p.Elem())
			fv.Set(p)
		default:
			t.Fatalf("JSONFinding.%s is a %s: teach appendFinding and this test to write it", name, fv.Kind())
		}
	}
}

func TestAppendFindingAsEncoder(t *testing.T) {
	var full JSONFinding
	fill(t, reflect.ValueOf(&full).Elem())
	cases := map[string]JSONFinding{"every field set": full}
	// Each field left at its zero value in turn: the omitempty ones vanish,
	// the others are written empty.
	for i := 0; i < reflect.TypeOf(full).NumField(); i++ {
		f := full
		v := reflect.ValueOf(&f).Elem().Field(i)
		v.Set(reflect.Zero(v.Type()))
		cases[reflect.TypeOf(full).Field(i).Name+" zero"] = f
	}
	empty := full
	empty.Evidence = []string{}
	cases["no evidence"] = empty
	one := full
	one.Evidence = []string{"daily_care.csv:12"}
	cases["one evidence"] = one
	min := JSONFinding{Severity: "minor", Check: "care.water", Evidence: []string{}}
	cases["only the required fields"] = min
	noOwner := full
	noOwner.Action = &JSONFindingAction{Plan: "p", DueOn: "2026-01-05", Status: "open"}
	cases["action without owner"] = noOwner
	for name, f := range cases {
		got := appendFinding(nil, &f)
		if want := encodedFinding(t, &f); !bytes.Equal(got, want) {
			t.Errorf("%s:\n got %s\nwant %s", name, got, want)
		}
	}
}

// Every string encoding/json has to escape, and a few it does not.
func TestAppendStringAsEncoder(t *testing.T) {
	for _, s := range []string{
		"", "plain", "wind chill ≤ −20 °C", `said "twice"`, `back\slash`, "line\nbreak", "tab\there",
		"cr\r", "bell\a", "nul\x00", "\x1f", "del\x7f", "<b> & </b>", "bad \xff utf-8", "cut \xe2\x89",
		"line sep \u2028 para sep \u2029", "\b\f", "emoji 🦊",
	} {
		got := appendString(nil, s)
		var buf bytes.Buffer
		enc := json.NewEncoder(&buf)
		enc.SetEscapeHTML(false)
		if err := enc.Encode(s); err != nil {
			t.Fatal(err)
		}
		if want := bytes.TrimSuffix(buf.Bytes(), []byte("\n")); !bytes.Equal(got, want) {
			t.Errorf("%q: got %s, want %s", s, got, want)
		}
	}
}

func FuzzAppendString(f *testing.F) {
	for _, s := range []string{"plain", "≤ −20 °C", "\"\\\n", "\xff", "\u2028"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var buf bytes.Buffer
		enc := json.NewEncoder(&buf)
		enc.SetEscapeHTML(false)
		if err := enc.Encode(s); err != nil {
			t.Fatal(err)
		}
		if got, want := appendString(nil, s), bytes.TrimSuffix(buf.Bytes(), []byte("\n")); !bytes.Equal(got, want) {
			t.Errorf("%q: got %s, want %s", s, got, want)
		}
	})
}
