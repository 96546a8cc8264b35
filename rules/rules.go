// Package rules holds the shipped policy rules (Rego) and the default
// limits, embedded in the binary, and reads a limits file.
package rules

import (
	"bytes"
	"embed"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/go-playground/validator/v10"
	"go.yaml.in/yaml/v3"
)

//go:embed *.rego limits.yaml
var shipped embed.FS

// FS returns the shipped rules: the .rego policies with their _test.rego
// tests, and limits.yaml.
func FS() fs.FS { return shipped }

// DefaultLimits returns the text of the shipped limits.yaml.
func DefaultLimits() []byte {
	b, err := shipped.ReadFile("limits.yaml")
	if err != nil {
		// The file is embedded at build time; reading it cannot fail.
		return nil
	}
	return b
}

// LimitsError is a problem in a limits file, positioned by line when known.
type LimitsError struct {
	File   string
	Line   int
	Key    string
	Reason string
}

func (e *LimitsError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Key != "" {
		b.WriteString(e.Key + ": ")
	}
	b.WriteString(e.Reason)
	return b.String()
}

var yamlLine = regexp.MustCompile(`line (\d+): (.*)`)

// LoadLimits decodes and validates a limits file strictly: an unknown key,
// a value of the wrong type or out of range is an error naming the file and,
// where the decoder knows it, the line.
func LoadLimits(r io.Reader, name string) (*Limits, error) {
	src, err := io.ReadAll(r)
	if err != nil {
		return nil, &LimitsError{File: name, Reason: err.Error()}
	}
	var l Limits
	dec := yaml.NewDecoder(bytes.NewReader(src))
	dec.KnownFields(true)
	if err := dec.Decode(&l); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &LimitsError{File: name, Reason: "the file is empty"}
		}
		return nil, yamlError(name, err)
	}
	if err := validateLimits(&l); err != nil {
		le := err.(*LimitsError)
		le.File = name
		le.Line = lineOfKey(src, le.Key)
		return nil, le
	}
	return &l, nil
}

// yamlError turns a yaml.v3 error ("yaml: unmarshal errors:\n  line 3: ...")
// into one positioned error per the first problem.
func yamlError(name string, err error) error {
	var te *yaml.TypeError
	msg := err.Error()
	if errors.As(err, &te) && len(te.Errors) > 0 {
		msg = te.Errors[0]
	}
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		n, _ := strconv.Atoi(m[1])
		return &LimitsError{File: name, Line: n, Reason: m[2]}
	}
	return &LimitsError{File: name, Reason: strings.TrimPrefix(msg, "yaml: ")}
}

// lineOfKey finds the line of the last element of a dotted key path, for
// errors found after decoding. It is a best effort: 0 when not found.
func lineOfKey(src []byte, key string) int {
	var root yaml.Node
	if key == "" || yaml.Unmarshal(src, &root) != nil || len(root.Content) == 0 {
		return 0
	}
	n := root.Content[0]
	line := 0
	for _, part := range strings.Split(key, ".") {
		if i := strings.IndexByte(part, '['); i >= 0 {
			part = part[:i]
		}
		found := false
		if n.Kind == yaml.MappingNode {
			for i := 0; i+1 < len(n.Content); i += 2 {
				if n.Content[i].Value == part {
					line = n.Content[i].Line
					n = n.Content[i+1]
					found = true
					break
				}
			}
		}
		if !found {
			break
		}
	}
	return line
}

var (
	codeRe    = regexp.MustCompile(`^[a-z][a-z0-9_]*$`)
	checkIDRe = regexp.MustCompile(`^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*)+$`)
	cellRe    = regexp.MustCompile(`^(N|C|[1-9][0-9]*/[0-9]+)$`)
)

func newValidator() *validator.Validate {
	v := validator.New(validator.WithRequiredStructEnabled())
	v.RegisterTagNameFunc(func(f reflect.StructField) string { return yamlName(f.Tag.Get("yaml")) })
	_ = v.RegisterValidation("code", func(fl validator.FieldLevel) bool { return codeRe.MatchString(fl.Field().String()) })
	_ = v.RegisterValidation("check_id", func(fl validator.FieldLevel) bool { return checkIDRe.MatchString(fl.Field().String()) })
	_ = v.RegisterValidation("warmup_cell", func(fl validator.FieldLevel) bool { return cellRe.MatchString(fl.Field().String()) })
	return v
}

func yamlName(tag string) string {
	name, _, _ := strings.Cut(tag, ",")
	if name == "-" {
		return ""
	}
	return name
}

func validateLimits(l *Limits) error {
	if err := newValidator().Struct(l); err != nil {
		var ves validator.ValidationErrors
		if errors.As(err, &ves) && len(ves) > 0 {
			fe := ves[0]
			// Namespace is "Limits.species[x].space.adult_m2"; drop the type name.
			key := fe.Namespace()
			if i := strings.IndexByte(key, '.'); i >= 0 {
				key = key[i+1:]
			}
			return &LimitsError{Key: key, Reason: describe(fe)}
		}
		return &LimitsError{Reason: err.Error()}
	}
	ww := l.Cold.WorkWarmup
	for i, row := range ww.Rows {
		if len(row.Cells) != len(ww.WindColumnsKmh) {
			return &LimitsError{Key: fmt.Sprintf("cold.work_warmup.rows[%d]", i),
				Reason: fmt.Sprintf("row has %d cells for %d wind columns", len(row.Cells), len(ww.WindColumnsKmh))}
		}
		if i > 0 && row.WarmestC >= ww.Rows[i-1].WarmestC {
			return &LimitsError{Key: fmt.Sprintf("cold.work_warmup.rows[%d]", i), Reason: "rows must run warmest first"}
		}
	}
	if !sort.Float64sAreSorted(ww.WindColumnsKmh) {
		return &LimitsError{Key: "cold.work_warmup.wind_columns_kmh", Reason: "wind columns must rise"}
	}
	return nil
}

func describe(fe validator.FieldError) string {
	v := fmt.Sprint(fe.Value())
	switch fe.Tag() {
	case "required":
		return "is required"
	case "min":
		return "needs at least " + fe.Param() + " entries"
	case "gte", "gt", "lte", "lt":
		ops := map[string]string{"gte": "at least", "gt": "above", "lte": "at most", "lt": "below"}
		return fmt.Sprintf("%s is out of range: must be %s %s", v, ops[fe.Tag()], fe.Param())
	case "oneof":
		return fmt.Sprintf("%q is not one of %s", v, strings.ReplaceAll(fe.Param(), " ", ", "))
	case "code":
		return fmt.Sprintf("%q is not a lower_snake_case code", v)
	case "check_id":
		return fmt.Sprintf("%q is not a check id (domain.topic.problem)", v)
	case "warmup_cell":
		return fmt.Sprintf("%q is not a schedule cell (N, C or MINUTES/BREAKS such as 40/4)", v)
	}
	return fmt.Sprintf("%q fails %s %s", v, fe.Tag(), fe.Param())
}

// Data returns the limits as the plain JSON document the rules read as
// data.limits (map keys are strings, numbers are float64).
func (l *Limits) Data() (map[string]any, error) {
	b, err := json.Marshal(l)
	if err != nil {
		return nil, err
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, err
	}
	return m, nil
}

// SpeciesCodes lists the species profiles, sorted.
func (l *Limits) SpeciesCodes() []string {
	out := make([]string, 0, len(l.Species))
	for k := range l.Species {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
