package records

import "time"

// environmentFile holds readings inside indoor and sheltered buildings.
const environmentFile = "environment.csv"

// EnvironmentReading is a row of environment.csv: one reading of the air
// inside a building, in SI units.
type EnvironmentReading struct {
	Ref         Ref
	At          time.Time `csv:"observed_at,required"`
	BuildingID  string    `csv:"building_id,required" validate:"required,id"`
	AirTempC    float64   `csv:"air_temp,unit=temperature,required" validate:"gte=-80,lte=60"`
	HumidityPct *float64  `csv:"humidity_pct" validate:"omitempty,gte=0,lte=100"`
	AmmoniaPpm  *float64  `csv:"ammonia_ppm" validate:"omitempty,gte=0"`
}

func (r *EnvironmentReading) rowRef() Ref { return r.Ref }

var environmentSpec = &fileSpec[EnvironmentReading]{
	name: environmentFile,
	day:  func(r *EnvironmentReading) Day { return dayOfTime(r.At) },
}

// environmentRefs is the cross-record rule of environment.csv: its
// building is a building in facility.yaml.
func (ld *loadedSet) environmentRefs(buildings *index) {
	ld.environment.keep(func(r *EnvironmentReading) *cellError {
		return ld.environment.refs(ref{"BuildingID", r.BuildingID, buildings})
	})
}

// columns lists the columns a file was read with, by their SI names as
// records.md documents them (air_temp_c for a file written in air_temp_f).
func (p *plan) columns() []string {
	var out []string
	for i := range p.rt.fields {
		if p.colOf[i] >= 0 {
			out = append(out, siName(&p.rt.fields[i]))
		}
	}
	return out
}

// HasColumn reports whether the file was read and had the column (named as
// records.md names it, in its SI unit). A check that needs a column a file
// lacks is "not evaluated", not passed: daily_care.csv without `cleaned`
// cannot say when cages were cleaned.
func (s *Set) HasColumn(file, column string) bool {
	for _, c := range s.Columns[file] {
		if c == column {
			return true
		}
	}
	return false
}
