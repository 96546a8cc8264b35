package records

import (
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
	doc, err := DecodeYAML(facilityFile, data, &fac)
	if err != nil {
		return fac, nil, err
	}
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
			key := YAMLPath(fe)
			return fac, nil, &LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key, Reason: facilityReason(fe)}
		}
		return fac, nil, &LoadError{File: facilityFile, Reason: err.Error(), Err: err}
	}
	loc, err := time.LoadLocation(fac.TimeZone)
	if err != nil || fac.TimeZone == "Local" {
		return fac, nil, &LoadError{File: facilityFile, Line: KeyLine(doc, "time_zone"), Column: "time_zone",
			Reason: fmt.Sprintf("%q is not an IANA time zone name (such as America/Winnipeg)", fac.TimeZone), Err: err}
	}
	sites := map[string]bool{}
	for i, s := range fac.WeatherSites {
		if sites[s] {
			key := fmt.Sprintf("weather_sites[%d]", i)
			return fac, nil, &LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key, Reason: fmt.Sprintf("%q is listed twice", s)}
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
			return fac, nil, &LoadError{File: facilityFile, Line: KeyLine(doc, key), Column: key,
				Reason: fmt.Sprintf("%q is not one of the weather_sites", b.WeatherSite)}
		}
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
