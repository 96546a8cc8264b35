package records

import (
	"fmt"
	"io"
	"reflect"
	"strings"
)

// The records reference (records/FORMAT.md, "welfare help records") is
// written from the loader's own tables: the row types' csv and validate
// tags, the unit table, and the file list below, which Load also uses to
// decide what a folder must hold. Whatever the loader accepts, the
// reference says, so the two cannot drift apart.

// kindDoc is what the reference says about one record file beyond its
// columns: whether it is needed, and the rules on its rows that struct tags
// cannot state (each is enforced by the file's spec in load.go or by the
// cross-record rules in refs.go).
type kindDoc struct {
	file  string
	typ   reflect.Type
	need  string
	about string
	rules []string
}

var kindDocs = []kindDoc{
	{animalsFile, reflect.TypeFor[Animal](), "required", "one row per animal", []string{
		"species must be a species profile in the limits in force.",
		"left_reason is required when left_on is given, and left_on when left_reason is; left_on is not before arrived_on.",
		"enclosure_id must be in enclosures.csv; protocol_id in protocols.csv (when that file exists).",
	}},
	{enclosuresFile, reflect.TypeFor[Enclosure](), "required", "one row per cage, pen, run or room", []string{
		"Give floor_area_m2, or both length_cm and width_cm (any of their unit alternatives).",
		"building_id must be a building in facility.yaml.",
	}},
	{housingFile, reflect.TypeFor[Housing](), "optional", "moves over time: one row per stay of one animal in one enclosure", []string{
		"moved_out_on is after moved_in_on; empty means still there.",
		"Two stays of one animal do not overlap; animal_id and enclosure_id must exist.",
	}},
	{staffFile, reflect.TypeFor[Staff](), "required when any record names a staff_id", "one row per person", nil},
	{protocolsFile, reflect.TypeFor[Protocol](), "optional", "approved animal-use protocols", []string{
		"expires_on is after approved_on; every id in personnel must be in staff.csv.",
	}},
	{careFile, reflect.TypeFor[CareRound](), "optional", "one row per care round", []string{
		"Give checked_at, or date, or both (date must then be the day of checked_at).",
		"Give enclosure_id, or building_id for a round of a whole building.",
		"enclosure_id, building_id, staff_id and concern_animal_id must exist.",
	}},
	{handlingFile, reflect.TypeFor[Handling](), "optional", "one row per handling event", []string{
		"animal_id, staff_id and protocol_id must exist; glove_id must be an item_id in ppe_checks.csv when that file exists.",
	}},
	{ppeFile, reflect.TypeFor[PPECheck](), "optional", "inspections of protective equipment", []string{
		"assigned_to must be in staff.csv.",
	}},
	{weatherFile, reflect.TypeFor[Weather](), "optional", "readings at the facility's weather sites", []string{
		"site_id must be listed under weather_sites in facility.yaml.",
	}},
	{workFile, reflect.TypeFor[OutdoorWork](), "optional", "continuous outdoor work stints between warm-up breaks", []string{
		"ended_at is after started_at; staff_id and site_id must exist.",
	}},
	{cullsFile, reflect.TypeFor[Cull](), "optional", "one row per animal killed", []string{
		"animal_id, staff_id and protocol_id must exist; the animal's left_reason should be culled and left_on the cull's day (a mismatch is a finding, not a loading error).",
	}},
	{deathsFile, reflect.TypeFor[Death](), "optional", "animals that died or were found dead (not culls)", []string{
		"animal_id and found_by must exist; one row per animal; vet_notified_at is not before found_dead_at.",
		"The animal's left_reason should be died and left_on the death's day (a mismatch is a finding, not a loading error).",
	}},
	{observationsFile, reflect.TypeFor[Observation](), "optional", "clinical and welfare observations of one animal", []string{
		"animal_id and staff_id must exist; an empty signs cell records no sign.",
	}},
	{treatmentsFile, reflect.TypeFor[Treatment](), "optional", "veterinary cases", []string{
		"animal_id and prescribed_by must exist; closed_on and reviewed_on are not before opened_on; outcome goes with closed_on.",
	}},
	{littersFile, reflect.TypeFor[Litter](), "optional", "one row per litter", []string{
		"dam_id must be a female present on whelped_on; weaned_on is not before whelped_on; born_alive is at most born, weaned at most born_alive (or born).",
	}},
	{environmentFile, reflect.TypeFor[EnvironmentReading](), "optional", "readings inside indoor and sheltered buildings", []string{
		"building_id must be a building in facility.yaml.",
	}},
	{correctiveFile, reflect.TypeFor[CorrectiveAction](), "optional", "the committee's plan and schedule for correcting findings", []string{
		"One row per corrective action. check, subject and found_on name the finding it answers (the finding's check, subject and on; an empty found_on answers every finding of that check and subject); 'welfare plans FINDINGS' writes a starter file from a findings file (FINDINGS: a findings.json).",
		"check must have the shape of a check id; a check not in force is rejected when the records are checked. owner and verified_by must be in staff.csv; closed_on is not before found_on; verified_by goes with closed_on.",
	}},
}

// ReferenceFiles lists the files the reference describes, facility.yaml first.
func ReferenceFiles() []string {
	out := []string{facilityFile}
	for _, k := range kindDocs {
		out = append(out, k.file)
	}
	return out
}

// Header is a record file's header row: the required columns first, then
// the optional ones, each in its SI unit, in the order of the row type.
func Header(file string) ([]string, error) {
	k, ok := findKind(file)
	if !ok {
		return nil, fmt.Errorf("%s is not a record file (%s)", file, strings.Join(ReferenceFiles()[1:], ", "))
	}
	rt, err := rowTypeOf(k.typ)
	if err != nil {
		return nil, err
	}
	var req, opt []string
	for i := range rt.fields {
		f := &rt.fields[i]
		if f.required || headerRequired(k.file, f.name) {
			req = append(req, siName(f))
		} else {
			opt = append(opt, siName(f))
		}
	}
	return append(req, opt...), nil
}

// eitherOr are the columns a file's column rule (fileSpec.header) asks for
// in alternatives: one of them must be there. The first of each pair goes
// into a starter file's header.
var eitherOr = map[string]map[string]string{
	careFile:       {"checked_at": "yes, or date", "date": "or checked_at", "enclosure_id": "yes, or building_id", "building_id": "or enclosure_id"},
	enclosuresFile: {"floor_area": "yes, or length and width", "length": "with width, or floor_area", "width": "with length, or floor_area"},
}

// headerRequired names the columns a starter file should carry beyond the
// required ones: the first alternative of each either-or rule.
func headerRequired(file, name string) bool {
	return strings.HasPrefix(eitherOr[file][name], "yes")
}

func findKind(file string) (kindDoc, bool) {
	name := strings.TrimSuffix(strings.TrimSuffix(file, ".xlsx"), ".csv") + ".csv"
	for _, k := range kindDocs {
		if k.file == name {
			return k, true
		}
	}
	return kindDoc{}, false
}

// WriteReference writes the records reference in Markdown: every file, or
// only the named one ("daily_care.csv", "daily_care", "facility.yaml").
func WriteReference(w io.Writer, file string) error {
	var b strings.Builder
	switch {
	case file == "":
		b.WriteString(referenceIntro)
		writeFacilityRef(&b)
		for _, k := range kindDocs {
			if err := writeKindRef(&b, k); err != nil {
				return err
			}
		}
		b.WriteString(referenceCross)
	case file == facilityFile || file == "facility":
		writeFacilityRef(&b)
	default:
		k, ok := findKind(file)
		if !ok {
			return fmt.Errorf("%s is not a record file; the files are %s", file, strings.Join(ReferenceFiles(), ", "))
		}
		if err := writeKindRef(&b, k); err != nil {
			return err
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}

const referenceIntro = `# The records folder

This reference is generated from the loader's own tables (` + "`go test ./records -run TestFormatReference -update`" + `);
` + "`welfare help records`" + ` prints the same text and ` + "`welfare help records FILE`" + ` one file of it.
` + "`welfare init DIR`" + ` writes a starter folder with every file and its header row.

A records folder holds facility.yaml, animals.csv and enclosures.csv, and any of the optional files.
A check whose records are absent is reported as "not evaluated", never as passed.

- CSV files are UTF-8, comma-separated, with one header row; columns may come in any order. An
  unknown column or file is a warning, a missing required column makes the whole file unusable.
- A workbook may stand in for a CSV file: ` + "`daily_care.xlsx`" + ` (its first sheet, or a sheet named
  ` + "`daily_care`" + `), or one ` + "`records.xlsx`" + ` with a sheet per record kind named after its file. Problems are
  then placed as ` + "`daily_care.xlsx:daily_care!C212`" + ` (sheet, cell). Dates typed as spreadsheet dates
  are read as dates, formulas by their cached value. A CSV file and a workbook for one kind is an error.
- An empty cell is "not recorded". Dates are YYYY-MM-DD; date-times YYYY-MM-DDTHH:MM (or with :SS,
  a space for the T, or RFC 3339 with an offset) in the facility's time zone. Yes/no cells take
  yes/no, y/n, true/false or 1/0. Lists are ;-separated in one cell.
- Numbers use a decimal point. A decimal comma (-35,5), a day-first or month-first date
  (15/01/2026), a semicolon or tab between columns and text that is not UTF-8 are refused with the fix.
- Measured columns carry their unit in the name; any one of the alternatives is accepted and
  converted. Ids are 1–64 letters, digits or - _ . : / and unique within their file.
- Local columns: a column whose name starts with ` + "`x_`" + ` (lower_snake_case, such as
  ` + "`x_tail_length_cm`" + ` in animals.csv) is the committee's own. It is not checked by the loader and is no
  warning; its cells reach the rules as text, on the row's subject or event: ` + "`input.extra.x_tail_length_cm`" + `
  on the animal's document, ` + "`extra.x_…`" + ` on the entry of an event (a handling, a weighing) wherever
  the facts list it. Only a committee's own rules read them (rules/README.md).

`

const referenceCross = `## Rules across files
- Every referenced id exists: an animal, enclosure, staff member or protocol in its file, a
  building or weather site in facility.yaml, a glove in ppe_checks.csv.
- A row naming an id whose own row was rejected is rejected too, saying which row to fix first.
- Ids are unique within their file: the first occurrence wins, each later one is rejected.
- Every row read is accepted or rejected with its position and reason: read = accepted + rejected.
`

func writeFacilityRef(b *strings.Builder) {
	b.WriteString("## facility.yaml (required)\n\n")
	b.WriteString("| key | type | required | allowed values |\n|---|---|---|---|\n")
	writeYAMLKeys(b, reflect.TypeFor[Facility](), "")
	b.WriteString("\nEach building's weather_site must be one of weather_sites; building ids are unique; time_zone is an IANA name such as America/Winnipeg; round_times are when the first and second care rounds are due (the morning view counts a round, feeding or water check as missing once its round is due).\n\n")
}

func writeYAMLKeys(b *strings.Builder, t reflect.Type, prefix string) {
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		name, _, _ := strings.Cut(sf.Tag.Get("yaml"), ",")
		if name == "" || name == "-" {
			continue
		}
		v := sf.Tag.Get("validate")
		req := "no"
		if hasRule(v, "required") {
			req = "yes"
		}
		typ := "text"
		switch {
		case sf.Tag.Get("ref") != "":
			typ = sf.Tag.Get("ref") // a type the tags cannot say, such as a time of day
		case sf.Type.Kind() == reflect.Struct:
			typ = "block"
		case sf.Type.Kind() == reflect.Slice && sf.Type.Elem().Kind() == reflect.Struct:
			typ = "list of blocks"
		case sf.Type.Kind() == reflect.Slice:
			typ = "list of ids"
		case hasRule(v, "id"):
			typ = "id"
		case strings.Contains(v, "oneof="):
			typ = "code"
		}
		fmt.Fprintf(b, "| %s%s | %s | %s | %s |\n", prefix, name, typ, req, oneOf(v))
		if sf.Type.Kind() == reflect.Slice && sf.Type.Elem().Kind() == reflect.Struct {
			writeYAMLKeys(b, sf.Type.Elem(), prefix+name+"[].")
		}
		if sf.Type.Kind() == reflect.Struct {
			writeYAMLKeys(b, sf.Type, prefix+name+".")
		}
	}
}

func writeKindRef(b *strings.Builder, k kindDoc) error {
	rt, err := rowTypeOf(k.typ)
	if err != nil {
		return err
	}
	fmt.Fprintf(b, "## %s (%s)\n\n%s.\n\n", k.file, k.need, upperFirst(k.about))
	b.WriteString("| column | type | required | allowed values |\n|---|---|---|---|\n")
	for i := range rt.fields {
		f := &rt.fields[i]
		req := "no"
		if f.required {
			req = "yes"
		} else if e := eitherOr[k.file][f.name]; e != "" {
			req = e
		}
		fmt.Fprintf(b, "| %s | %s | %s | %s |\n", columnNames(f), fieldType(f), req, oneOf(f.vtag))
	}
	if len(k.rules) > 0 {
		b.WriteString("\n")
		for _, r := range k.rules {
			b.WriteString("- " + r + "\n")
		}
	}
	b.WriteString("\n")
	return nil
}

// columnNames is the column in its SI unit, with its alternatives.
func columnNames(f *field) string {
	if f.unit == "" || len(units[f.unit]) == 1 {
		return siName(f)
	}
	var others []string
	for _, a := range units[f.unit][1:] {
		others = append(others, f.name+a.suffix)
	}
	return siName(f) + " (or " + strings.Join(others, ", ") + ")"
}

func fieldType(f *field) string {
	unit := ""
	if f.unit != "" {
		unit = " " + units[f.unit][0].label
	}
	rng := ""
	if f.hasRng {
		switch {
		case f.lo != "" && f.hi != "" && f.loOpen:
			rng = " > " + f.lo + " … " + f.hi
		case f.lo != "" && f.hi != "":
			rng = " " + f.lo + " … " + f.hi
		case f.lo != "" && f.loOpen:
			rng = " > " + f.lo
		case f.lo != "":
			rng = " ≥ " + f.lo
		default:
			rng = " ≤ " + f.hi
		}
	}
	switch f.kind {
	case kDay:
		return "date"
	case kTime:
		return "date-time"
	case kBool:
		return "yes/no"
	case kFloat, kFloatPtr:
		return "number" + rng + unit
	case kInt, kIntPtr:
		return "whole number" + rng + unit
	case kList:
		switch {
		case strings.Contains(f.vtag, "oneof"):
			return "list of codes"
		case strings.Contains(f.vtag, "code"):
			return "list of codes (lower_snake_case)"
		}
		return "list"
	}
	switch {
	case hasRule(f.vtag, "id"):
		return "id"
	case hasRule(f.vtag, "code"):
		return "code (lower_snake_case)"
	case strings.Contains(f.vtag, "oneof"):
		return "code"
	}
	return "text"
}

func hasRule(vtag, rule string) bool {
	for r := range strings.SplitSeq(vtag, ",") {
		if r == rule {
			return true
		}
	}
	return false
}

func oneOf(vtag string) string {
	for r := range strings.SplitSeq(vtag, ",") {
		if p, ok := strings.CutPrefix(r, "oneof="); ok {
			return "`" + strings.ReplaceAll(p, " ", "` `") + "`"
		}
	}
	return ""
}

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
