package reports

import (
	"time"

	"welfare/records"
)

// Audit is the PDF audit report as plain data: what goes on which page, in
// what order. BuildAudit makes it from a checker.Result without any PDF
// library; package reports/pdf draws it (and is the only code that knows
// fonts, millimetres or gofpdf). Serialised as JSON it is golden-tested, so
// a change to the report's content shows up as a readable diff.
//
// Pages: the cover is page 1, and every section with NewPage starts a new
// page; within a section, blocks flow down the page, and the renderer breaks
// pages between blocks and table rows (a table row, a key-value pair, a
// notice, a chart or a sign-off block never splits).
type Audit struct {
	Title       string    `json:"title"`   // document properties
	Subject     string    `json:"subject"` //
	Author      string    `json:"author,omitempty"`
	GeneratedAt time.Time `json:"generated_at"`
	// Header is printed at the top of every page: left, then right-aligned.
	Header [2]string `json:"header"`
	// Footer is printed at the foot of every page, with "page N of M" on the right.
	Footer      string         `json:"footer"`
	Sections    []AuditSection `json:"sections"`
	Attachments []Attachment   `json:"attachments"`
}

// AuditSection is one part of the report, bookmarked by its Title.
type AuditSection struct {
	Title string `json:"title"`
	// NewPage starts the section on a new page, under Heading (when set).
	// A section without NewPage follows on the current page; its block
	// places its own bookmark (the sign-off keeps with its boxes).
	NewPage bool    `json:"new_page"`
	Heading string  `json:"heading,omitempty"`
	Blocks  []Block `json:"blocks"`
}

// BlockKind says which of a Block's fields are set.
type BlockKind string

// The kinds of block, each with the Block field of the same name.
const (
	KindTitle         BlockKind = "title"          // Text, Subtitle: the cover's title
	KindKeyValue      BlockKind = "key-value"      // Label, Text, Mono, Size
	KindSubheading    BlockKind = "subheading"     // Text; Keep: millimetres of following content kept with it
	KindParagraph     BlockKind = "paragraph"      // Text, Style, Size, Indent
	KindBullet        BlockKind = "bullet"         // Text
	KindNotice        BlockKind = "notice"         // Text, boxed
	KindSpace         BlockKind = "space"          // Size: vertical space in millimetres
	KindTable         BlockKind = "table"          // Table
	KindDomainHeading BlockKind = "domain-heading" // Text, Bookmark: a findings domain
	KindCheckFindings BlockKind = "check-findings" // Text (heading), Subtitle (counts and source), Table, More
	KindBarChart      BlockKind = "bar-chart"      // Bars: findings per domain, stacked by severity
	KindCareBar       BlockKind = "care-bar"       // Care
	KindDayChart      BlockKind = "day-chart"      // Chart: a daily series with bands, lines and marks
	KindSignOff       BlockKind = "sign-off"       // Text (heading), Subtitle, Roles, Fields, Bookmark
)

// Block is one piece of a section. Only the fields its Kind names are set.
type Block struct {
	Kind     BlockKind `json:"kind"`
	Text     string    `json:"text,omitempty"`
	Subtitle string    `json:"subtitle,omitempty"`
	Label    string    `json:"label,omitempty"`
	Bookmark string    `json:"bookmark,omitempty"`
	// Style is "", "bold" or "italic".
	Style string `json:"style,omitempty"`
	// Size is a font size in points (a space's height in millimetres).
	Size   float64 `json:"size,omitempty"`
	Indent float64 `json:"indent,omitempty"` // millimetres
	Keep   float64 `json:"keep,omitempty"`   // millimetres
	Mono   bool    `json:"mono,omitempty"`
	Table  *Table  `json:"table,omitempty"`
	More   string  `json:"more,omitempty"`
	Bars   []Bar   `json:"bars,omitempty"`
	// Keys name the bar chart's segments in legend order (Segment.Key);
	// without them the segments are severities.
	Keys   []string  `json:"keys,omitempty"`
	Care   *CareBar  `json:"care,omitempty"`
	Chart  *DayChart `json:"chart,omitempty"`
	Roles  []string  `json:"roles,omitempty"`
	Fields []string  `json:"fields,omitempty"`
}

// Table is a table whose rows never split across pages; on a continuation
// page the caption (with "(continued)") and the header row are repeated.
type Table struct {
	Caption string   `json:"caption"`
	Size    float64  `json:"size"`                // font size, points
	MinRowH float64  `json:"min_row_h,omitempty"` // millimetres, e.g. room to write by hand
	Columns []Column `json:"columns"`
	Rows    []Row    `json:"rows"`
}

// Column is one table column.
type Column struct {
	Head  string  `json:"head"`
	Width float64 `json:"width"` // millimetres
	Align string  `json:"align"` // "L", "R" or "C"
	Mono  bool    `json:"mono,omitempty"`
}

// Row is one table row.
type Row struct {
	Cells []string `json:"cells"`
	Bold  bool     `json:"bold,omitempty"`
}

// Bar is one domain's findings in the bar chart: a segment per severity
// (most severe first, zero counts left out) and the domain's total, which
// also counts findings of any other severity.
type Bar struct {
	Label    string    `json:"label"`
	Segments []Segment `json:"segments"`
	Total    int       `json:"total"`
}

// Segment is one severity's count in a bar, or with Key one named part's
// (a cause of death) when the block has Keys.
type Segment struct {
	Severity string `json:"severity,omitempty"`
	Key      string `json:"key,omitempty"`
	Count    int    `json:"count"`
}

// CareBar is the care coverage as a bar: Complete of Occupied days.
type CareBar struct {
	Complete int    `json:"complete"`
	Occupied int    `json:"occupied"`
	Caption  string `json:"caption"`
}

// DayChart is a series of days against shaded bands, reference lines and
// marked days: the cold season per weather site (daily minima against the
// wind chill hazard bands, the cold checks' thresholds, the days with cold
// findings), the warm season (daily maxima against the heat index bands and
// hot_day_c), the indoor temperature per building against its species'
// ranges, and a flagged animal's weighings.
type DayChart struct {
	// Title heads the chart ("Weather site S1"); Summary is the line under it.
	Title   string      `json:"title"`
	Summary string      `json:"summary"`
	From    records.Day `json:"from"`
	To      records.Day `json:"to"`
	Unit    string      `json:"unit"`
	YMin    float64     `json:"y_min"`
	YMax    float64     `json:"y_max"`
	YTicks  []Tick      `json:"y_ticks"`
	// Height of the plot in millimetres; 0 is the full-size chart.
	Height float64 `json:"height,omitempty"`
	// Series are drawn in order: the first as a solid line with dots, the
	// second dashed with squares; a day without readings is a gap, unless
	// the series is Joined (points days apart, such as weighings).
	Series []Series `json:"series"`
	// Lines are the thresholds, those outside the value range left out;
	// Style numbers the dash pattern.
	Lines []RefLine `json:"lines"`
	// Marks count the findings per day; MarksLabel explains them.
	Marks      []Mark   `json:"marks"`
	MarksLabel []string `json:"marks_label"`
	// Bands are shaded inside the plot (clipped to the value range),
	// mildest first, and listed in the key.
	Bands []Band `json:"bands"`
}

// Tick is one labelled value on an axis.
type Tick struct {
	Value float64 `json:"value"`
	Label string  `json:"label"`
}

// Series is one line of a chart.
type Series struct {
	Name   string  `json:"name"`
	Points []Point `json:"points"`
	Joined bool    `json:"joined,omitempty"`
}

// Point is one day's value.
type Point struct {
	Day   records.Day `json:"day"`
	Value float64     `json:"value"`
}

// RefLine is a horizontal reference line with its label.
type RefLine struct {
	Value float64 `json:"value"`
	Label string  `json:"label"`
	Style int     `json:"style"`
}

// Mark is a day with findings and their number.
type Mark struct {
	Day   records.Day `json:"day"`
	Count int         `json:"count"`
}

// Band is one hazard band (wind chill, heat index) or range: Hi is its
// upper edge and Lo its lower edge in the chart's unit; OpenBelow marks a
// band without a lower edge (the coldest wind chill band), OpenAbove one
// without an upper edge (the hottest heat index band). Level is 1 for the
// mildest band.
type Band struct {
	Hi        float64 `json:"hi"`
	Lo        float64 `json:"lo"`
	OpenBelow bool    `json:"open_below,omitempty"`
	OpenAbove bool    `json:"open_above,omitempty"`
	Level     int     `json:"level"`
	Label     string  `json:"label"`
}

// Attachment is a file embedded in the PDF.
type Attachment struct {
	Name        string `json:"name"`
	Description string `json:"description"`
	Content     []byte `json:"-"`
	Bytes       int    `json:"bytes"`
}
