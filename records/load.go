package records

import (
	"bufio"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"reflect"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"
)

// Options are what loading needs from outside the records folder.
type Options struct {
	// Species are the species codes of the limits in force. An animal row
	// naming any other species is rejected. When empty, species are checked
	// for form only and a warning says so.
	Species []string
	// Now is the clock for the plausible window of dates (see dateWindow);
	// nil means time.Now.
	Now func() time.Time
	// Progress, when set, is called now and then with the number of rows
	// read since its last call, from the goroutines that read the files
	// (so it must be safe for concurrent use). It only reports; it cannot
	// change what is loaded.
	Progress func(rows int)
}

// progressEvery is how many rows a file reads between Progress calls.
const progressEvery = 8192

// The record files in the order records.md documents them; accounting and
// problems follow this order.
const (
	animalsFile      = "animals.csv"
	enclosuresFile   = "enclosures.csv"
	housingFile      = "housing.csv"
	staffFile        = "staff.csv"
	protocolsFile    = "protocols.csv"
	careFile         = "daily_care.csv"
	handlingFile     = "handling.csv"
	ppeFile          = "ppe_checks.csv"
	weatherFile      = "weather.csv"
	workFile         = "outdoor_work.csv"
	cullsFile        = "culls.csv"
	deathsFile       = "deaths.csv"
	observationsFile = "observations.csv"
	treatmentsFile   = "treatments.csv"
	littersFile      = "litters.csv"
)

// Files lists the record files a folder may hold, facility.yaml first, then
// the CSV files in the order of the records contract.
var Files = []string{facilityFile, animalsFile, enclosuresFile, housingFile, staffFile, protocolsFile,
	careFile, handlingFile, ppeFile, weatherFile, workFile, cullsFile,
	deathsFile, observationsFile, treatmentsFile, littersFile, environmentFile, correctiveFile}

func fileOrder(name string) int {
	if i := slices.Index(Files, name); i >= 0 {
		return i
	}
	return len(Files)
}

// env is what row rules need beyond the row itself.
type env struct {
	sources     map[string]*source // by record file name
	loc         *time.Location
	window      window
	species     map[string]bool
	speciesList string
	progress    func(rows int)
}

// rowCheck gives a file's row rules the row's cells, to cite columns as
// written in the header and values as written in the cell.
type rowCheck struct {
	p   *plan
	rec []string
	env *env
	// zone is the decoder's cache of the zone of the last local time read.
	zone *zoneCache
}

// dayOf is DayOf(t), through the decoder's cache of the zone when t was
// just read by it.
func (c *rowCheck) dayOf(t time.Time) Day {
	if c.zone != nil {
		return c.zone.dayOf(t)
	}
	return DayOf(t)
}

// fail positions a row-rule problem at the Go field's column.
func (c *rowCheck) fail(goName, reason string) *cellError {
	ce := &cellError{field: -1, column: c.p.header(goName), reason: reason}
	if fi, ok := c.p.rt.byGo[goName]; ok {
		ce.field = fi
		if ci := c.p.colOf[fi]; ci >= 0 && c.rec != nil {
			ce.value = c.rec[ci]
		}
	}
	return ce
}

// fileSpec is what differs between record files.
type fileSpec[T any] struct {
	name   string
	header func(p *plan) *headerIssue         // column rules beyond "required"
	row    func(r *T, c *rowCheck) *cellError // row rules validate tags cannot say
	day    func(r *T) Day                     // the row's date, to place a rejected row in time
	id     func(r *T) string                  // the row's unique id, for files keyed by one
	idName string                             // the Go field of that id
	// store, when set, makes the file's compact store: accepted rows go
	// there as they are read instead of into rows (see CareRounds).
	store func(loc *time.Location) rowStore[T]
}

// rowStore keeps a file's accepted rows in a form of its own. Each row is
// decoded into one reused value and handed to add with its ref, as the
// prefix and the line, so nothing of the row outlives the call.
type rowStore[T any] interface {
	addAt(row *T, prefix string, line int)
	Len() int
	reset()
	// done drops what only adding rows needs, once the file is read.
	done()
	// appendStore moves the rows of another store of the same file after
	// this one's, as if they had been added here in order, and reports
	// whether it could; the other store is left empty.
	appendStore(o rowStore[T]) bool
}

// loaded is one file after reading: its accepted rows and its account.
type loaded[T any] struct {
	spec     *fileSpec[T]
	present  bool
	rows     []T
	store    rowStore[T] // the accepted rows instead of rows, when spec.store is set
	count    FileCount
	problems []Problem
	warnings []Warning
	plan     *plan
	// chunks are the full blocks of accepted rows while reading: rows grow
	// by blocks as they are read (never sized from the file's length) and
	// are joined once at the end, sized by the rows actually accepted.
	chunks [][]T
	// rejected maps the ids of rejected rows to their ref, so a reference to
	// one can say why it is unknown.
	rejected map[string]Ref
	// file is the file read (daily_care.csv, daily_care.xlsx, records.xlsx);
	// sheet and at place problems inside a workbook.
	file  string
	sheet string
	at    func(ci, line int) string
	// local are the committee's own columns (x_…) by header index, and
	// extra their cells per accepted row.
	local map[int]string
	extra map[Ref]map[string]string
}

func loadFile[T any](ctx context.Context, fsys fs.FS, spec *fileSpec[T], e *env) *loaded[T] {
	src := e.sources[spec.name]
	if src == nil {
		return &loaded[T]{spec: spec, count: FileCount{File: spec.name}, file: spec.name}
	}
	if reason, present := refusal(fsys, src.file); !present || reason != "" {
		// A refused file is a warning of Load, and is not present.
		return &loaded[T]{spec: spec, count: FileCount{File: spec.name}, file: spec.name}
	}
	if l := loadSplit(ctx, fsys, spec, e, src); l != nil {
		return l
	}
	l := newLoaded(spec, src, e)
	rt, err := rowTypeOf(reflect.TypeFor[T]())
	if err != nil {
		l.fail("", err.Error())
		return l
	}
	var rr rowReader
	if src.csv() {
		f, err := OpenFile(ctx, fsys, src.file)
		if err != nil {
			l.fail("", "cannot be read: "+err.Error())
			return l
		}
		defer f.Close()
		br := bufio.NewReaderSize(f, 4096)
		skipBOM(br)
		rr = newCSVRows(f, br, src.file)
		defer stopRows(rr)
	} else {
		sh := src.sheet
		if sh == nil {
			if sh, err = kindSheet(fsys, src.file, kindOf(spec.name)); err != nil {
				l.fail("", err.Error())
				return l
			}
		}
		sr := newSheetReader(sh)
		l.at, l.sheet = sr.at, sh.name
		if l.store == nil {
			l.rows = make([]T, 0, len(sh.rows))
		}
		rr = sr
	}
	p, ok := l.begin(rr, rt, true)
	if !ok {
		return l
	}
	d := newDecoder(p, e, src.file)
	d.refBase = rr.refBase()
	l.read(rr, d, e)
	l.flatten()
	if l.store != nil {
		l.store.done()
	}
	return l
}

// newLoaded is a present file before its header is read.
func newLoaded[T any](spec *fileSpec[T], src *source, e *env) *loaded[T] {
	l := &loaded[T]{spec: spec, present: true, count: FileCount{File: src.display}, file: src.file}
	if spec.store != nil {
		l.store = spec.store(e.loc)
	}
	return l
}

// skipBOM drops a UTF-8 byte order mark at the start of a file.
func skipBOM(br *bufio.Reader) {
	if b, err := br.Peek(3); err == nil && string(b) == "\ufeff" {
		_, _ = br.Discard(3)
	}
}

// begin reads the header row and makes the file's plan, with a warning for
// each column that is not read. A header that makes the file unusable is
// the file's problem, and false; the file's rows are then drained (counted
// and rejected) when drain is set, and left unread when not (the caller
// reads the file another way).
func (l *loaded[T]) begin(rr rowReader, rt *rowType, drain bool) (*plan, bool) {
	head, _, err := rr.next()
	// The plan and the warnings keep the header's names: copies, since a
	// reader's cells are valid only until it reads on (see rowBatch).
	head = cloneCells(head)
	switch {
	case err == io.EOF:
		l.fail("", "no header row (the file is empty)")
		return nil, false
	case err != nil:
		var pe *csv.ParseError
		if !errors.As(err, &pe) {
			l.fail("", "cannot be read: "+err.Error())
			return nil, false
		}
		if !drain {
			return nil, false
		}
		l.fail("", "header row: "+csvReason(err))
		l.drain(rr)
		return nil, false
	}
	issue := delimiterIssue(head)
	if !validUTF8(head) {
		issue = &headerIssue{reason: "the header row is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export)", kind: KindNotUTF8}
	}
	if issue == nil {
		for i, h := range head {
			if why := textIssue(h); why != "" {
				issue = &headerIssue{reason: fmt.Sprintf("column %d of the header %s", i+1, why)}
				break
			}
		}
	}
	var (
		p       *plan
		unknown []string
	)
	if issue == nil {
		p, unknown, issue = newPlan(rt, head)
		if p != nil && l.spec.header != nil {
			issue = joinMissing(issue, l.spec.header(p))
		}
	}
	if issue != nil {
		if !drain {
			return nil, false
		}
		l.count.Failed = issue.reason
		if issue.column != "" {
			l.count.Failed = issue.column + ": " + issue.reason
		}
		if isMissing(issue) && len(unknown) > 0 {
			issue.reason += "; the header has " + strings.Join(unknown, ", ")
		}
		l.drain(rr)
		// One message for the file, with the count of rows it cost.
		issue.reason += rowsNotRead(l.count.Read)
		l.problems = append(l.problems, l.problem(1, &cellError{field: -1, column: issue.column, reason: issue.reason, kind: issue.kind}))
		return nil, false
	}
	l.plan = p
	l.local = localColumns(p)
	for _, u := range unknown {
		switch key := strings.ToLower(u); {
		case strings.HasPrefix(key, "x_") && IsCode(key):
			// A local column: carried to the rules as text.
		case strings.HasPrefix(key, "x_"):
			l.warnings = append(l.warnings, Warning{File: l.count.File, Column: u,
				Message: "not read: a local column's name is x_ and lower_snake_case (x_tail_length_cm)"})
		default:
			l.warnings = append(l.warnings, Warning{File: l.count.File, Column: u, Message: "unknown column, not read"})
		}
	}
	return p, true
}

// cloneCells copies a row's cells out of the reader's buffer.
func cloneCells(rec []string) []string {
	out := make([]string, len(rec))
	for i, c := range rec {
		out[i] = strings.Clone(c)
	}
	return out
}

// rowsNotRead says how many rows a file-level problem kept from being read.
func rowsNotRead(n int) string {
	switch n {
	case 0:
		return ""
	case 1:
		return "; its 1 row is not read"
	}
	return fmt.Sprintf("; its %d rows are not read", n)
}

// fail marks the whole file unusable.
func (l *loaded[T]) fail(column, reason string) {
	l.problems = append(l.problems, Problem{File: l.file, Column: column, Reason: reason, At: l.sheetAt()})
	l.count.Failed = reason
}

// sheetAt is the At of a whole-file problem: the sheet of records.xlsx.
func (l *loaded[T]) sheetAt() string {
	if l.file == workbookFile {
		return l.sheet
	}
	return ""
}

// problem positions a rejected row (or a header problem, on line 1).
func (l *loaded[T]) problem(line int, ce *cellError) Problem {
	// Copies: the row's cells are the reader's, valid only until it reads on.
	pr := Problem{File: l.file, Line: line, Column: ce.column, Value: printable(ce.value), Reason: strings.Clone(shortenReason(ce.reason, ce.value)), Kind: ce.kind}
	if l.at != nil {
		ci := -1
		if ce.field >= 0 && l.plan != nil {
			ci = l.plan.colOf[ce.field]
		}
		pr.At = l.at(ci, line)
	}
	return pr
}

// drain counts the rows of a file that failed as a whole: each is read and rejected.
func (l *loaded[T]) drain(r rowReader) {
	for {
		_, _, err := r.next()
		if err == io.EOF {
			return
		}
		var pe *csv.ParseError
		if err != nil && !errors.As(err, &pe) {
			l.stop(err)
			return
		}
		l.count.Read++
		l.count.Rejected++
	}
}

// stop ends a file that cannot be read to its end (too large, a line over
// the cap, an interrupted run): none of its rows is used, since a file read
// in part would make the checks judge part of the records.
func (l *loaded[T]) stop(err error) {
	l.count.Rejected += l.count.Accepted
	l.count.Accepted = 0
	l.rows, l.chunks = nil, nil
	if l.store != nil {
		l.store.reset()
	}
	l.rejected = nil
	l.fail("", "cannot be read: "+err.Error())
}

func csvReason(err error) string {
	var pe *csv.ParseError
	var qe *quoteError
	if errors.As(err, &qe) {
		return qe.Error()
	}
	if errors.As(err, &pe) {
		return fmt.Sprintf("%v (line %d, character %d)", pe.Err, pe.Line, pe.Column)
	}
	return err.Error()
}

// read decodes the file's rows after the header. Rows kept in l.rows grow
// by blocks (l.chunks): the caller joins them with flatten.
func (l *loaded[T]) read(r rowReader, d *decoder, e *env) {
	spec, p := l.spec, d.p
	check := rowCheck{p: p, env: e, zone: &d.zone}
	var zero, scratch T
	if l.store != nil {
		d.scratch = make([]float64, p.rt.typ.NumField())
	}
	firstAt := map[string]int{}
	if spec.id != nil {
		l.rejected = map[string]Ref{}
	}
	idField := -1
	if spec.idName != "" {
		idField = p.rt.byGo[spec.idName]
	}
	for {
		if e.progress != nil && l.count.Read%progressEvery == progressEvery-1 {
			e.progress(progressEvery)
		}
		rec, line, err := r.next()
		if err == io.EOF {
			return
		}
		if err != nil {
			var pe *csv.ParseError
			if !errors.As(err, &pe) {
				l.stop(err)
				return
			}
			l.count.Read++
			l.count.Rejected++
			l.problems = append(l.problems, Problem{File: l.file, Line: pe.StartLine, Reason: csvReason(err)})
			continue
		}
		l.count.Read++
		var ce *cellError
		row := &scratch
		if l.store != nil {
			scratch = zero
		} else {
			if len(l.rows) == cap(l.rows) {
				l.grow()
			}
			l.rows = append(l.rows, zero)
			row = &l.rows[len(l.rows)-1]
		}
		// A row that is not UTF-8 gets the keeper's fix (below); in one
		// that is, only the cell cap and NUL bytes are left to find.
		checked := textChecked(r) // every cell found to be text by the reader's goroutine
		valid := checked || validUTF8(rec)
		var text *cellError
		if !checked && valid && len(rec) == len(p.cols) {
			text = boundsCheck(rec, p)
		}
		switch {
		case len(rec) != len(p.cols):
			ce = &cellError{field: -1, reason: fmt.Sprintf("row has %d cells but the header has %d", len(rec), len(p.cols))}
			if sp, ok := r.(interface{ span() (int, int) }); ok {
				if start, end := sp.span(); end > start {
					ce.reason += fmt.Sprintf(" (the row runs from line %d to line %d: is a quote left open?)", start, end)
				}
			}
		case !valid:
			// Before the per-cell check: an export in another encoding gets
			// the keeper's fix (save as UTF-8), grouped over its rows.
			ce = notUTF8(p, rec)
		case text != nil:
			ce = text
		case blank(rec):
			ce = &cellError{field: -1, reason: "row is empty (every cell is blank)"}
		default:
			ce = d.decode(reflect.ValueOf(row).Elem(), rec)
			if ce == nil && spec.row != nil {
				check.rec = rec
				ce = spec.row(row, &check)
			}
			if spec.id != nil && !d.failed[idField] {
				if id := spec.id(row); id != "" {
					if first, dup := firstAt[id]; dup {
						if ce == nil {
							check.rec = rec
							ce = check.fail(spec.idName, fmt.Sprintf("%q is a duplicate; first at %s", id, d.ref(first)))
						}
					} else {
						firstAt[id] = line
						if ce != nil {
							l.rejected[id] = d.ref(line)
						}
					}
				}
			}
		}
		if ce != nil {
			pr := l.problem(line, ce)
			if spec.day != nil {
				pr.Day = spec.day(row)
			}
			l.problems = append(l.problems, pr)
			l.count.Rejected++
			if l.store == nil {
				l.rows = l.rows[:len(l.rows)-1]
			}
			continue
		}
		l.count.Accepted++
		if l.store != nil {
			if len(l.local) > 0 {
				l.keepLocal(d.ref(line), rec)
			}
			l.store.addAt(row, d.refBase, line)
			continue
		}
		ref := d.ref(line)
		reflect.ValueOf(row).Elem().Field(p.rt.ref).SetString(string(ref))
		if len(l.local) > 0 {
			l.keepLocal(ref, rec)
		}
	}
}

// boundsCheck rejects a row of UTF-8 text with a cell that holds a NUL
// byte or is over the cell cap, positioned at the cell's column.
func boundsCheck(rec []string, p *plan) *cellError {
	for ci, cell := range rec {
		if len(cell) <= MaxFieldBytes && strings.IndexByte(cell, 0) < 0 {
			continue
		}
		if why := textIssue(cell); why != "" {
			return textError(rec, ci, p, why)
		}
	}
	return nil
}

// textError positions a text problem of cell ci at its column.
func textError(rec []string, ci int, p *plan, why string) *cellError {
	col := fmt.Sprintf("column %d", ci+1)
	if ci < len(p.cols) && p.cols[ci].header != "" {
		col = p.cols[ci].header
	}
	field := -1
	if ci < len(p.cols) {
		field = p.cols[ci].field
	}
	return &cellError{field: field, column: col, value: rec[ci], reason: why}
}

// maxChunk is the most rows in one block while reading.
const maxChunk = 1 << 14

// grow puts the full block of rows aside and starts a new one.
func (l *loaded[T]) grow() {
	next := 256
	if c := cap(l.rows); c > 0 {
		l.chunks = append(l.chunks, l.rows)
		next = min(2*c, maxChunk)
	}
	l.rows = make([]T, 0, next)
}

// flatten joins the blocks of rows into one slice.
func (l *loaded[T]) flatten() {
	if len(l.chunks) == 0 {
		return
	}
	n := len(l.rows)
	for _, c := range l.chunks {
		n += len(c)
	}
	all := make([]T, 0, n)
	for _, c := range l.chunks {
		all = append(all, c...)
	}
	l.rows = append(all, l.rows...)
	l.chunks = nil
}

func blank(rec []string) bool {
	for _, c := range rec {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// The per-file rules. Cross-file rules are in refs.go.
var (
	animalSpec = &fileSpec[Animal]{
		name: animalsFile,
		row: func(a *Animal, c *rowCheck) *cellError {
			if c.env.species != nil && !c.env.species[a.Species] {
				return c.fail("Species", fmt.Sprintf("%q is not a species profile in the limits (%s)", a.Species, c.env.speciesList))
			}
			switch {
			case !a.LeftOn.IsZero() && a.LeftReason == "":
				return c.fail("LeftReason", "is required when left_on is given")
			case a.LeftOn.IsZero() && a.LeftReason != "":
				return c.fail("LeftOn", "is required when left_reason is given")
			case !a.LeftOn.IsZero() && a.LeftOn < a.ArrivedOn:
				return c.fail("LeftOn", fmt.Sprintf("%s is before arrived_on %s", a.LeftOn, a.ArrivedOn))
			}
			return nil
		},
		day:    func(a *Animal) Day { return a.ArrivedOn },
		id:     func(a *Animal) string { return a.ID },
		idName: "ID",
	}
	enclosureSpec = &fileSpec[Enclosure]{
		name: enclosuresFile,
		header: func(p *plan) *headerIssue {
			if !p.has("FloorAreaM2") && !(p.has("LengthCm") && p.has("WidthCm")) {
				return &headerIssue{column: "floor_area_m2", reason: "required column is missing (give floor_area_m2, or both length_cm and width_cm)"}
			}
			return nil
		},
		row: func(e *Enclosure, c *rowCheck) *cellError {
			if e.FloorAreaM2 == nil && (e.LengthCm == nil || e.WidthCm == nil) {
				return c.fail("FloorAreaM2", fmt.Sprintf("is required when %s and %s are not both given", c.p.header("LengthCm"), c.p.header("WidthCm")))
			}
			return nil
		},
		id:     func(e *Enclosure) string { return e.ID },
		idName: "ID",
	}
	housingSpec = &fileSpec[Housing]{
		name: housingFile,
		row: func(h *Housing, c *rowCheck) *cellError {
			if !h.MovedOutOn.IsZero() && h.MovedOutOn <= h.MovedInOn {
				return c.fail("MovedOutOn", fmt.Sprintf("%s is not after moved_in_on %s", h.MovedOutOn, h.MovedInOn))
			}
			return nil
		},
		day: func(h *Housing) Day { return h.MovedInOn },
	}
	staffSpec = &fileSpec[Staff]{
		name:   staffFile,
		id:     func(s *Staff) string { return s.ID },
		idName: "ID",
	}
	protocolSpec = &fileSpec[Protocol]{
		name: protocolsFile,
		row: func(p *Protocol, c *rowCheck) *cellError {
			if p.ExpiresOn <= p.ApprovedOn {
				return c.fail("ExpiresOn", fmt.Sprintf("%s is not after approved_on %s", p.ExpiresOn, p.ApprovedOn))
			}
			return nil
		},
		day:    func(p *Protocol) Day { return p.ApprovedOn },
		id:     func(p *Protocol) string { return p.ID },
		idName: "ID",
	}
	careSpec = &fileSpec[CareRound]{
		name: careFile,
		header: func(p *plan) *headerIssue {
			var issue *headerIssue
			if !p.has("At") && !p.has("Day") {
				issue = &headerIssue{column: "checked_at", reason: "required column is missing (give checked_at, or date)"}
			}
			if !p.has("EnclosureID") && !p.has("BuildingID") {
				issue = joinMissing(issue, &headerIssue{column: "enclosure_id", reason: "required column is missing (give enclosure_id, or building_id)"})
			}
			return issue
		},
		row: func(r *CareRound, c *rowCheck) *cellError {
			switch {
			case !r.At.IsZero():
				d := c.dayOf(r.At)
				if r.Day != 0 && r.Day != d {
					return c.fail("Day", fmt.Sprintf("%s is not the day of checked_at (%s)", r.Day, d))
				}
				r.Day = d
			case r.Day != 0:
				r.At, r.DateOnly = r.Day.In(c.env.loc), true
			default:
				return c.fail("At", "is required but empty (give checked_at, or date)")
			}
			if r.EnclosureID == "" && r.BuildingID == "" {
				return c.fail("EnclosureID", "is required but empty (give enclosure_id, or building_id)")
			}
			return nil
		},
		day: func(r *CareRound) Day {
			if !r.At.IsZero() {
				return DayOf(r.At)
			}
			return r.Day
		},
		store: func(loc *time.Location) rowStore[CareRound] { return newCareRounds(loc) },
	}
	handlingSpec = &fileSpec[Handling]{
		name: handlingFile,
		day:  func(h *Handling) Day { return dayOfTime(h.At) },
	}
	ppeSpec = &fileSpec[PPECheck]{
		name: ppeFile,
		day:  func(p *PPECheck) Day { return p.CheckedOn },
	}
	weatherSpec = &fileSpec[Weather]{
		name: weatherFile,
		day:  func(w *Weather) Day { return dayOfTime(w.At) },
	}
	workSpec = &fileSpec[OutdoorWork]{
		name: workFile,
		row: func(w *OutdoorWork, c *rowCheck) *cellError {
			if !w.EndedAt.After(w.StartedAt) {
				return c.fail("EndedAt", fmt.Sprintf("%s is not after started_at %s",
					w.EndedAt.Format("2006-01-02T15:04"), w.StartedAt.Format("2006-01-02T15:04")))
			}
			return nil
		},
		day: func(w *OutdoorWork) Day { return dayOfTime(w.StartedAt) },
	}
	cullSpec = &fileSpec[Cull]{
		name: cullsFile,
		day:  func(c *Cull) Day { return dayOfTime(c.At) },
	}
)

func dayOfTime(t time.Time) Day {
	if t.IsZero() {
		return 0
	}
	return DayOf(t)
}

// Load reads and validates a records folder (see the package comment).
// The error is for the folder as a whole and is a *LoadError; every
// row-level problem is in the Set instead.
func Load(fsys fs.FS, opt Options) (*Set, error) {
	return LoadContext(context.Background(), fsys, opt)
}

// LoadContext is Load that stops soon after ctx is done, returning ctx's
// error. Only regular files inside the folder are read (a named pipe, a
// device or a link leading outside is refused with a warning), each within
// the caps MaxLineBytes, MaxFieldBytes and MaxFileBytes.
func LoadContext(ctx context.Context, fsys fs.FS, opt Options) (*Set, error) {
	entries, err := fs.ReadDir(fsys, ".")
	if err != nil {
		return nil, &LoadError{File: ".", Reason: "cannot read the records folder: " + err.Error(), Err: err}
	}
	fac, loc, err := loadFacility(ctx, fsys)
	if err != nil {
		return nil, err
	}
	names := map[string]bool{}
	for _, e := range entries {
		names[e.Name()] = true
	}
	s := &Set{Facility: fac, Location: loc, Present: map[string]bool{facilityFile: true}}
	sources, sheetWarnings, err := findSources(fsys, names)
	if err != nil {
		return nil, err
	}
	for _, req := range []string{animalsFile, enclosuresFile} {
		if sources[req] == nil {
			return nil, &LoadError{File: req, Reason: "required file is missing", Err: fs.ErrNotExist}
		}
		if reason, _ := refusal(fsys, req); reason != "" {
			return nil, &LoadError{File: req, Reason: "required file " + reason}
		}
	}
	for _, name := range Files[1:] {
		if reason, present := refusal(fsys, name); present && reason != "" {
			s.Warnings = append(s.Warnings, Warning{File: name, Message: reason})
		}
	}
	for _, e := range entries {
		name := e.Name()
		if isRecordFile(name) {
			continue
		}
		msg := "unknown file, not read"
		if e.IsDir() {
			msg = "unknown folder, not read"
		}
		if lower := strings.ToLower(name); lower != name && fileOrder(lower) < len(Files) {
			msg += fmt.Sprintf(" (file names are lower case: did you mean %s?)", lower)
		}
		s.Warnings = append(s.Warnings, Warning{File: name, Message: msg})
	}

	s.Warnings = append(s.Warnings, sheetWarnings...)
	e := &env{loc: loc, sources: sources, window: dateWindow(opt.Now, loc), progress: opt.Progress}
	if len(opt.Species) > 0 {
		e.species = map[string]bool{}
		for _, sp := range opt.Species {
			e.species[sp] = true
		}
		list := slices.Clone(opt.Species)
		sort.Strings(list)
		e.speciesList = strings.Join(slices.Compact(list), ", ")
	} else {
		s.Warnings = append(s.Warnings, Warning{File: animalsFile, Column: "species",
			Message: "not checked against species profiles (no limits were given)"})
	}

	var (
		wg sync.WaitGroup
		ld loadedSet
	)
	// Files are independent until the cross-record rules, so they load in parallel.
	wg.Go(func() { ld.animals = loadFile(ctx, fsys, animalSpec, e) })
	wg.Go(func() { ld.enclosures = loadFile(ctx, fsys, enclosureSpec, e) })
	wg.Go(func() { ld.housing = loadFile(ctx, fsys, housingSpec, e) })
	wg.Go(func() { ld.staff = loadFile(ctx, fsys, staffSpec, e) })
	wg.Go(func() { ld.protocols = loadFile(ctx, fsys, protocolSpec, e) })
	wg.Go(func() { ld.care = loadFile(ctx, fsys, careSpec, e) })
	wg.Go(func() { ld.handling = loadFile(ctx, fsys, handlingSpec, e) })
	wg.Go(func() { ld.ppe = loadFile(ctx, fsys, ppeSpec, e) })
	wg.Go(func() { ld.weather = loadFile(ctx, fsys, weatherSpec, e) })
	wg.Go(func() { ld.work = loadFile(ctx, fsys, workSpec, e) })
	wg.Go(func() { ld.culls = loadFile(ctx, fsys, cullSpec, e) })
	wg.Go(func() { ld.deaths = loadFile(ctx, fsys, deathSpec, e) })
	wg.Go(func() { ld.observations = loadFile(ctx, fsys, observationSpec, e) })
	wg.Go(func() { ld.treatments = loadFile(ctx, fsys, treatmentSpec, e) })
	wg.Go(func() { ld.litters = loadFile(ctx, fsys, litterSpec, e) })
	wg.Go(func() { ld.environment = loadFile(ctx, fsys, environmentSpec, e) })
	wg.Go(func() { ld.corrective = loadFile(ctx, fsys, correctiveSpec, e) })
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}

	ld.crossCheck(&fac)

	collect(s, ld.animals)
	collect(s, ld.enclosures)
	collect(s, ld.housing)
	collect(s, ld.staff)
	collect(s, ld.protocols)
	collect(s, ld.care)
	collect(s, ld.handling)
	collect(s, ld.ppe)
	collect(s, ld.weather)
	collect(s, ld.work)
	collect(s, ld.culls)
	collect(s, ld.deaths)
	collect(s, ld.observations)
	collect(s, ld.treatments)
	collect(s, ld.litters)
	collect(s, ld.environment)
	collect(s, ld.corrective)
	s.CorrectiveActions = ld.corrective.rows
	s.Environment = ld.environment.rows
	s.Animals, s.Enclosures, s.Housing = ld.animals.rows, ld.enclosures.rows, ld.housing.rows
	s.Staff, s.Protocols, s.Handling = ld.staff.rows, ld.protocols.rows, ld.handling.rows
	s.care = newCareRounds(loc)
	if st, ok := ld.care.store.(*CareRounds); ok {
		s.care = st
	}
	s.PPEChecks, s.Weather, s.Work, s.Culls = ld.ppe.rows, ld.weather.rows, ld.work.rows, ld.culls.rows
	s.Deaths, s.Observations, s.Treatments, s.Litters = ld.deaths.rows, ld.observations.rows, ld.treatments.rows, ld.litters.rows
	s.Problems = append(s.Problems, ld.extra...)
	s.Warnings = groupWarnings(s.Warnings)
	sort.SliceStable(s.Problems, func(i, j int) bool {
		a, b := s.Problems[i], s.Problems[j]
		if oa, ob := kindOrder(&a), kindOrder(&b); oa != ob {
			return oa < ob
		}
		return a.Line < b.Line
	})
	return s, nil
}

// collect adds one file's account, problems and warnings to the set.
func collect[T any](s *Set, l *loaded[T]) {
	if !l.present {
		return
	}
	s.Present[l.spec.name] = true
	if l.plan != nil {
		if s.Columns == nil {
			s.Columns = map[string][]string{}
		}
		s.Columns[l.spec.name] = l.plan.columns()
	}
	if len(l.extra) > 0 {
		if s.Extra == nil {
			s.Extra = map[Ref]map[string]string{}
		}
		for ref, m := range l.extra {
			s.Extra[ref] = m
		}
	}
	s.Accounting = append(s.Accounting, l.count)
	s.Problems = append(s.Problems, l.problems...)
	s.Warnings = append(s.Warnings, l.warnings...)
}

// localColumns finds the committee's own columns of a header: names
// starting with x_, lower_snake_case (compared in lower case, as every
// column is), by header index.
func localColumns(p *plan) map[int]string {
	var out map[int]string
	for i, c := range p.cols {
		key := strings.ToLower(c.header)
		if c.field < 0 && strings.HasPrefix(key, "x_") && IsCode(key) {
			if out == nil {
				out = map[int]string{}
			}
			out[i] = key
		}
	}
	return out
}

// keepLocal keeps the local columns' cells of an accepted row, as text
// (an empty cell is kept empty: the rule can tell it from a column the
// file lacks).
func (l *loaded[T]) keepLocal(ref Ref, rec []string) {
	if l.extra == nil {
		l.extra = map[Ref]map[string]string{}
	}
	m := make(map[string]string, len(l.local))
	for i, name := range l.local {
		m[name] = strings.Clone(strings.TrimSpace(rec[i]))
	}
	l.extra[ref] = m
}
