package records

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"strings"
	"time"
	_ "time/tzdata" // facility time zones must resolve on machines without a zoneinfo database

	"github.com/go-playground/validator/v10"
	"go.yaml.in/yaml/v3"
)

const facilityFile = "facility.yaml"

// loadFacility reads facility.yaml strictly: every failure is a LoadError
// with the line and key, since no record can be placed without it.
func loadFacility(ctx context.Context, fsys fs.FS) (Facility, *time.Location, error) {
	var fac Facility
	data, err := readFacility(ctx, fsys)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return fac, nil, &LoadError{File: facilityFile, Reason: "required file is missing", Err: err}
		}
		return fac, nil, &LoadError{File: facilityFile, Reason: "cannot be read: " + err.Error(), Err: err}
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	if line := firstInvalidLine(data); line > 0 {
		return fac, nil, &LoadError{File: facilityFile, Line: line,
			Reason: "is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 file)"}
	}
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return fac, nil, yamlError(facilityFile, err) // a syntax error: nothing after it can be read
	}
	if len(root.Content) == 0 {
		return fac, nil, &LoadError{File: facilityFile, Reason: "is empty"}
	}
	doc := root.Content[0]
	// Every problem is collected, so that a keeper fixes them all at once.
	var probs []*LoadError
	bad := map[string]bool{} // keys with a problem already
	add := func(le *LoadError) {
		for k := le.Column; k != ""; k, _ = cutLast(k) {
			if bad[k] {
				return // already reported at the key, or at the block holding it
			}
		}
		bad[le.Column] = true
		probs = append(probs, le)
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&fac); err != nil {
		var te *yaml.TypeError
		if !errors.As(err, &te) {
			return fac, nil, yamlError(facilityFile, err)
		}
		for _, m := range te.Errors {
			add(facilityTypeProblem(doc, m))
		}
	}
	// The buildings are read one by one, so that a building that is not a
	// block of keys does not shift the positions of the ones after it.
	var buildingAt []int // index in fac.Buildings -> index in the file
	if bs := mapValue(doc, "buildings"); bs != nil && bs.Kind == yaml.SequenceNode {
		fac.Buildings = fac.Buildings[:0]
		for i, n := range bs.Content {
			var b Building
			if n.Kind != yaml.MappingNode || n.Decode(&b) != nil {
				continue // reported by the decoder above
			}
			b.Line = n.Line
			fac.Buildings = append(fac.Buildings, b)
			buildingAt = append(buildingAt, i)
		}
	}
	if err := validate().Struct(&fac); err != nil {
		var ves validator.ValidationErrors
		if !errors.As(err, &ves) {
			return fac, nil, &LoadError{File: facilityFile, Reason: err.Error(), Err: err}
		}
		for _, fe := range ves {
			key := YAMLPath(fe)
			var j int
			if n, _ := fmt.Sscanf(key, "buildings[%d]", &j); n == 1 {
				_, rest, _ := strings.Cut(key, "]")
				key = fmt.Sprintf("buildings[%d]%s", fileIndex(buildingAt, j), rest)
			}
			add(&LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key, Reason: facilityReason(fe)})
		}
	}
	loc, err := time.LoadLocation(fac.TimeZone)
	if fac.TimeZone != "" && (err != nil || fac.TimeZone == "Local") {
		add(&LoadError{File: facilityFile, Line: KeyLine(doc, "time_zone"), Column: "time_zone",
			Reason: fmt.Sprintf("%q is not an IANA time zone name (such as America/Winnipeg)", fac.TimeZone), Err: err})
	}
	sites := map[string]bool{}
	for i, s := range fac.WeatherSites {
		if sites[s] {
			key := fmt.Sprintf("weather_sites[%d]", i)
			add(&LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key, Reason: fmt.Sprintf("%q is listed twice", s)})
		}
		sites[s] = true
	}
	seen := map[string]int{}
	for i, b := range fac.Buildings {
		if first, dup := seen[b.ID]; dup && b.ID != "" {
			add(&LoadError{File: facilityFile, Line: b.Line, Column: fmt.Sprintf("buildings[%d].id", fileIndex(buildingAt, i)),
				Reason: fmt.Sprintf("%q is a duplicate; first at %s:%d", b.ID, facilityFile, first)})
		}
		seen[b.ID] = b.Line
		if b.WeatherSite != "" && !sites[b.WeatherSite] {
			key := fmt.Sprintf("buildings[%d].weather_site", fileIndex(buildingAt, i))
			add(&LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key,
				Reason: fmt.Sprintf("%q is not one of the weather_sites: add it under weather_sites", b.WeatherSite)})
		}
	}
	for _, le := range fac.RoundTimes.problems(doc) {
		add(le)
	}
	if len(probs) > 0 {
		return fac, nil, joinLoadErrors(probs)
	}
	return fac, loc, nil
}

// readFacility reads facility.yaml as OpenFile allows: a regular file in the
// folder, at most MaxFacilityBytes.
func readFacility(ctx context.Context, fsys fs.FS) ([]byte, error) {
	f, err := OpenFile(ctx, fsys, facilityFile)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return io.ReadAll(f)
}

func facilityReason(fe validator.FieldError) string {
	switch fe.Tag() {
	case "required":
		return "is required"
	case "oneof":
		return fmt.Sprintf("%q is not one of %s", fmt.Sprint(fe.Value()), strings.ReplaceAll(fe.Param(), " ", ", "))
	case "id":
		return fmt.Sprintf("%q is not an id (1 to 64 letters, digits or - _ . : /)", fmt.Sprint(fe.Value()))
	}
	return fmt.Sprintf("%v fails the %s %s check", fe.Value(), fe.Tag(), fe.Param())
}

// cutLast drops the last part of a dotted path: "buildings[0].id" →
// "buildings[0]" → "buildings" → "".
func cutLast(k string) (string, bool) {
	if i := strings.LastIndexAny(k, ".["); i >= 0 {
		return k[:i], true
	}
	return "", false
}

// fileIndex is the position in the file of the i-th building read.
func fileIndex(at []int, i int) int {
	if i < len(at) {
		return at[i]
	}
	return i
}
