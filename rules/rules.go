// Package rules holds the shipped policy rules (Rego) and the default
// limits, embedded in the binary, and reads a limits file.
package rules

import (
	"embed"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"reflect"
	"regexp"
	"sort"
	"strings"

	"github.com/go-playground/validator/v10"

	"welfare/records"
)

//go:embed *.rego limits.yaml schemas/*.json
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

// ParseLimits decodes and validates the limits file src, read from name,
// strictly: an unknown key, a value of the wrong type or out of range is a
// *records.LoadError naming the file, the line and the key, as
// facility.yaml problems are. The limits keep their text, for the report's
// "limits in force" (Lines) and the run's fingerprint (Source).
func ParseLimits(name string, src []byte) (*Limits, error) {
	var l Limits
	doc, err := records.DecodeYAML(name, src, &l)
	if err != nil {
		return nil, plainTypeError(err)
	}
	if key, reason := validateLimits(&l); reason != "" {
		return nil, &records.LoadError{File: name, Line: keyLine(doc, key), Column: key, Reason: reason}
	}
	l.name, l.src, l.doc = name, src, doc
	return &l, nil
}

// LoadLimits is ParseLimits on the text read from r.
func LoadLimits(r io.Reader, name string) (*Limits, error) {
	src, err := io.ReadAll(r)
	if err != nil {
		return nil, &records.LoadError{File: name, Reason: "cannot be read: " + err.Error(), Err: err}
	}
	return ParseLimits(name, src)
}

// BuiltInName is the name the shipped limits are read under.
const BuiltInName = "limits.yaml (built in)"

// Default parses the shipped limits.yaml.
func Default() (*Limits, error) {
	return ParseLimits(BuiltInName, DefaultLimits())
}

// Name is the file the limits were read from.
func (l *Limits) Name() string { return l.name }

// Source is the text the limits were parsed from (nil for limits built in
// Go), the bytes a check's fingerprint covers.
func (l *Limits) Source() []byte { return l.src }

// CheckID is the form of a check id everywhere (rule METADATA, findings,
// the limits' severity overrides): domain.topic.problem or domain.problem,
// lower_snake_case parts.
var CheckID = regexp.MustCompile(`^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*){1,3}$`)

var cellRe = regexp.MustCompile(`^(N|C|[1-9][0-9]*/[0-9]+)$`)

func newValidator() *validator.Validate {
	v := validator.New(validator.WithRequiredStructEnabled())
	v.RegisterTagNameFunc(func(f reflect.StructField) string { return yamlName(f.Tag.Get("yaml")) })
	_ = v.RegisterValidation("code", func(fl validator.FieldLevel) bool { return records.IsCode(fl.Field().String()) })
	_ = v.RegisterValidation("check_id", func(fl validator.FieldLevel) bool { return CheckID.MatchString(fl.Field().String()) })
	for _, name := range []string{"purpose", "purpose_or_default", "ppe_item", "glove", "restraint", "item_kind", "sign"} {
		_ = v.RegisterValidation(name, func(fl validator.FieldLevel) bool { return inCatalogue(name, fl.Field().String()) })
	}
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

// validateLimits checks what the types cannot say, returning the dotted key
// and the reason of the first problem ("" when the limits are sound).
func validateLimits(l *Limits) (key, reason string) {
	if err := newValidator().Struct(l); err != nil {
		var ves validator.ValidationErrors
		if errors.As(err, &ves) && len(ves) > 0 {
			return records.YAMLPath(ves[0]), describe(ves[0])
		}
		return "", err.Error()
	}
	if key, reason := localValues("local", map[string]any(l.Local)); reason != "" {
		return key, reason
	}
	ww := l.Cold.WorkWarmup
	for i, row := range ww.Rows {
		if len(row.Cells) != len(ww.WindColumnsKmh) {
			return fmt.Sprintf("cold.work_warmup.rows[%d]", i),
				fmt.Sprintf("row has %d cells for %d wind columns", len(row.Cells), len(ww.WindColumnsKmh))
		}
		if i > 0 && row.WarmestC >= ww.Rows[i-1].WarmestC {
			return fmt.Sprintf("cold.work_warmup.rows[%d]", i), "rows must run warmest first"
		}
	}
	if !sort.Float64sAreSorted(ww.WindColumnsKmh) {
		return "cold.work_warmup.wind_columns_kmh", "wind columns must rise"
	}
	for _, sp := range sortedKeys(l.Litter.MinWeaningDays) {
		if _, ok := l.Species[sp]; !ok {
			return "litter.min_weaning_days[" + sp + "]", fmt.Sprintf("%q is not a species profile of these limits (%s)", sp, strings.Join(l.SpeciesCodes(), ", "))
		}
	}
	return "", ""
}

// localValues checks the committee's own values: plain YAML (numbers,
// text, true/false, lists, maps with lower_snake_case names), so that each
// reaches the rules as data.limits.local unchanged.
func localValues(key string, v any) (string, string) {
	switch x := v.(type) {
	case map[string]any:
		names := make([]string, 0, len(x))
		for k := range x {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			if !records.IsCode(k) {
				return key + "." + k, fmt.Sprintf("%q is not a lower_snake_case name", k)
			}
			if k2, r := localValues(key+"."+k, x[k]); r != "" {
				return k2, r
			}
		}
	case []any:
		for i, e := range x {
			if k2, r := localValues(fmt.Sprintf("%s[%d]", key, i), e); r != "" {
				return k2, r
			}
		}
	case nil:
		return key, "has no value (write one, or leave the name out)"
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return key, "is not a finite number"
		}
	case string, bool, int, int64, uint64:
	default:
		return key, fmt.Sprintf("is not a number, text, true/false, list or map (%T)", v)
	}
	return "", ""
}

func describe(fe validator.FieldError) string {
	v := fmt.Sprint(fe.Value())
	switch fe.Tag() {
	case "required":
		return "is required"
	case "min":
		if fe.Param() == "1" {
			return "needs at least one entry"
		}
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
	case "gtefield":
		return fmt.Sprintf("%s is out of range: must be at least %s", v, strings.ToLower(fe.Param()))
	case "purpose", "purpose_or_default", "ppe_item", "glove", "restraint", "item_kind", "sign":
		return catalogueReason(fe.Tag(), v)
	case "warmup_cell":
		return fmt.Sprintf("%q is not a schedule cell (N, C or MINUTES/BREAKS such as 40/4)", v)
	}
	return fmt.Sprintf("%q fails %s %s", v, fe.Tag(), fe.Param())
}

// Data returns the limits as the plain JSON document the rules read as
// data.limits (map keys are strings, numbers are float64): the one
// conversion of the limits for Rego.
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
