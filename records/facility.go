package records

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"regexp"
	"strconv"
	"strings"
	"time"
	_ "time/tzdata" // facility time zones must resolve on machines without a zoneinfo database

	"github.com/go-playground/validator/v10"
	"go.yaml.in/yaml/v3"
)

const facilityFile = "facility.yaml"

// yamlLine finds "line N:" in a yaml.v3 error message.
var yamlLine = regexp.MustCompile(`line (\d+): (.*)`)

// loadFacility reads facility.yaml strictly: every failure is a LoadError
// with the line and key, since no record can be placed without it.
func loadFacility(fsys fs.FS) (Facility, *time.Location, error) {
	var fac Facility
	data, err := fs.ReadFile(fsys, facilityFile)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return fac, nil, &LoadError{File: facilityFile, Reason: "required file is missing", Err: err}
		}
		return fac, nil, &LoadError{File: facilityFile, Reason: "cannot be read: " + err.Error(), Err: err}
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return fac, nil, yamlError(err)
	}
	if len(root.Content) == 0 {
		return fac, nil, &LoadError{File: facilityFile, Reason: "is empty"}
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(&fac); err != nil && err != io.EOF {
		return fac, nil, yamlError(err)
	}
	doc := root.Content[0]
	if bs := mapValue(doc, "buildings"); bs != nil && bs.Kind == yaml.SequenceNode {
		for i, n := range bs.Content {
			if i < len(fac.Buildings) {
				fac.Buildings[i].Line = n.Line
			}
		}
	}
	if err := validate().Struct(&fac); err != nil {
		var ves validator.ValidationErrors
		if errors.As(err, &ves) && len(ves) > 0 {
			fe := ves[0]
			key := fe.Namespace()
			if _, rest, ok := strings.Cut(key, "."); ok {
				key = rest // drop the Go type name
			}
			return fac, nil, &LoadError{File: facilityFile, Line: keyLine(doc, key), Column: key, Reason: facilityReason(fe)}
		}
		return fac, nil, &LoadError{File: facilityFile, Reason: err.Error(), Err: err}
	}
	loc, err := time.LoadLocation(fac.TimeZone)
	if err != nil || fac.TimeZone == "Local" {
		return fac, nil, &LoadError{File: facilityFile, Line: keyLine(doc, "time_zone"), Column: "time_zone",
			Reason: fmt.Sprintf("%q is not an IANA time zone name (such as America/Winnipeg)", fac.TimeZone), Err: err}
	}
	sites := map[string]bool{}
	for i, s := range fac.WeatherSites {
		if sites[s] {
			key := fmt.Sprintf("weather_sites[%d]", i)
			return fac, nil, &LoadError{File: facilityFile, Line: keyLine(doc, key), Column: key, Reason: fmt.Sprintf("%q is listed twice", s)}
		}
		sites[s] = true
	}
	seen := map[string]int{}
	for i, b := range fac.Buildings {
		if first, dup := seen[b.ID]; dup {
			return fac, nil, &LoadError{File: facilityFile, Line: b.Line, Column: fmt.Sprintf("buildings[%d].id", i),
				Reason: fmt.Sprintf("%q is a duplicate; first at %s:%d", b.ID, facilityFile, first)}
		}
		seen[b.ID] = b.Line
		if b.WeatherSite != "" && !sites[b.WeatherSite] {
			key := fmt.Sprintf("buildings[%d].weather_site", i)
			return fac, nil, &LoadError{File: facilityFile, Line: keyLine(doc, key), Column: key,
				Reason: fmt.Sprintf("%q is not one of the weather_sites", b.WeatherSite)}
		}
	}
	return fac, loc, nil
}

func yamlError(err error) *LoadError {
	var te *yaml.TypeError
	msg := err.Error()
	if errors.As(err, &te) && len(te.Errors) > 0 {
		msg = te.Errors[0]
	}
	msg = strings.TrimPrefix(msg, "yaml: ")
	le := &LoadError{File: facilityFile, Reason: msg, Err: err}
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		le.Line, _ = strconv.Atoi(m[1])
		le.Reason = m[2]
		// "field foo not found in type records.Facility" says it in Go terms.
		if name, ok := strings.CutPrefix(le.Reason, "field "); ok {
			if k, _, ok := strings.Cut(name, " not found"); ok {
				le.Column, le.Reason = k, "unknown key"
			}
		}
	}
	return le
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

// mapValue returns the value node of key in a mapping node.
func mapValue(n *yaml.Node, key string) *yaml.Node {
	if n == nil || n.Kind != yaml.MappingNode {
		return nil
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == key {
			return n.Content[i+1]
		}
	}
	return nil
}

// keyLine finds the line of a path such as "buildings[1].exposure", falling
// back to the deepest part that exists (a missing key has no line of its own).
func keyLine(doc *yaml.Node, path string) int {
	line := 0
	n := doc
	for part := range strings.SplitSeq(path, ".") {
		name, idx, hasIdx := strings.Cut(part, "[")
		var key *yaml.Node
		if n != nil && n.Kind == yaml.MappingNode {
			for i := 0; i+1 < len(n.Content); i += 2 {
				if n.Content[i].Value == name {
					key, n = n.Content[i], n.Content[i+1]
					break
				}
			}
		}
		if key == nil {
			return line
		}
		line = key.Line
		if hasIdx {
			i, _ := strconv.Atoi(strings.TrimSuffix(idx, "]"))
			if n.Kind != yaml.SequenceNode || i >= len(n.Content) {
				return line
			}
			n = n.Content[i]
			line = n.Line
		}
	}
	return line
}
