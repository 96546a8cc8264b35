package records

import (
	"bytes"
	"math"
	"strconv"
	"time"
)

// CareRounds holds care rounds compactly: a year of rounds of a large
// colony is millions of rows, so each is kept as a small struct without
// pointers (ids and notes as indexes into one table of strings, the time as
// unix seconds, the yes/no answers and the water state as bits), in blocks
// of fixed size that grow as rows are added and are never joined or copied.
// Load fills one while daily_care is read; Set.CareRounds returns it.
//
// Reading a row: View(i) gives every field but the ref without allocating
// (its ids are the shared strings of the table), Ref(i) formats the ref
// when it is wanted, and Round(i) rebuilds the full CareRound for the rare
// path that needs one. A CareRounds is read-only once built and safe for
// concurrent readers.
type CareRounds struct {
	blocks [][]careRow
	n      int
	loc    *time.Location // the location of every compact row's At
	strs   []string       // ids and notes; strs[0] is ""
	ids    map[string]uint32
	srcs   []string // ref prefixes ("daily_care.csv:"), by index
	srcIdx map[string]uint32
	// hint speeds up interning while rows are added; done drops it.
	hint *internHint
	// wide are the rows the compact form cannot hold exactly (a time with
	// a fraction of a second or in another location, a yes/no or water
	// value outside the records contract in a set made by hand), kept whole.
	wide []CareRound
}

// careRow is one round, 48 bytes.
type careRow struct {
	at    int64   // unix seconds; noTime for the zero time
	feed  float64 // grams, when flags has careFeedSet
	day   Day
	line  uint32 // the ref's line (0: the ref is the prefix alone); for a wide row, its index in wide
	enc   uint32 // indexes into strs
	bld   uint32
	staff uint32
	anim  uint32 // concern_animal_id
	notes uint32
	flags uint32
}

// careBlockShift sets the rows in a block (4,096: 192 KiB).
const (
	careBlockShift = 12
	careBlockSize  = 1 << careBlockShift
	careBlockMask  = careBlockSize - 1
)

// The bits of careRow.flags: six Bools of 2 bits (observed, fed,
// water_restored, bedding_added, cleaned, health_concern), the water state,
// then single bits, then the ref prefix.
const (
	waterShift           = 12
	waterMask            = 7
	careFeedSet   uint32 = 1 << 15
	careDateOnly  uint32 = 1 << 16
	careWide      uint32 = 1 << 17
	srcShift             = 18
	maxCareSrcs          = 1 << (32 - srcShift)
	noTime               = math.MinInt64
	boolFieldMask        = 3
)

// waterStates are the water values of the records contract, by code.
var waterStates = [...]string{"", "ok", "low", "empty", "frozen", "not_checked"}

func waterCode(s string) (uint32, bool) {
	for i, w := range waterStates {
		if w == s {
			return uint32(i), true
		}
	}
	return 0, false
}

// NewCareRounds builds the compact store of rows (a set made by hand); loc
// is the location times are given in (the facility's; nil: that of the
// first row's time). Rows in another location are kept exactly all the same.
func NewCareRounds(rows []CareRound, loc *time.Location) *CareRounds {
	if loc == nil {
		loc = time.UTC
		if len(rows) > 0 && !rows[0].At.IsZero() {
			loc = rows[0].At.Location()
		}
	}
	c := newCareRounds(loc)
	for i := range rows {
		c.add(&rows[i])
	}
	c.done()
	return c
}

func newCareRounds(loc *time.Location) *CareRounds {
	if loc == nil {
		loc = time.UTC
	}
	return &CareRounds{loc: loc, strs: []string{""}, ids: map[string]uint32{}, srcIdx: map[string]uint32{}, hint: &internHint{}}
}

// done drops what only adding rows needs.
func (c *CareRounds) done() { c.hint = nil }

// internHint is, per id field of a round (the five of careRow), the key
// interned last and, by key, the key interned after it the last time:
// rounds repeat the keeper and visit the enclosures in the same order day
// after day, so the next id is most often one of the two, found without
// hashing it.
type internHint struct {
	last [5]uint32
	next [5][]uint32
}

// internAt is intern for the id field f of a round.
func (c *CareRounds) internAt(f int, s string) uint32 {
	h := c.hint
	if s == "" || h == nil {
		return c.intern(s)
	}
	last := h.last[f]
	if c.strs[last] == s {
		return last
	}
	next := h.next[f]
	if int(last) < len(next) {
		if k := next[last]; k != 0 && c.strs[k] == s {
			h.last[f] = k
			return k
		}
	}
	k := c.intern(s)
	if int(last) >= len(next) {
		next = append(next, make([]uint32, len(c.strs)-len(next))...)
		h.next[f] = next
	}
	next[last] = k
	h.last[f] = k
	return k
}

// Len is the number of rounds.
func (c *CareRounds) Len() int {
	if c == nil {
		return 0
	}
	return c.n
}

func (c *CareRounds) row(i int) *careRow {
	return &c.blocks[i>>careBlockShift][i&careBlockMask]
}

// push appends a zero row and returns it. Blocks are allocated as rows
// come: the first grows by doubling up to a block, the rest are a block
// each, so a file claims memory only for the rows it has.
func (c *CareRounds) push() *careRow {
	k := len(c.blocks) - 1
	if k < 0 || len(c.blocks[k]) == careBlockSize {
		size := careBlockSize
		if k < 0 {
			size = 64
		}
		c.blocks = append(c.blocks, make([]careRow, 0, size))
		k++
	} else if b := c.blocks[k]; len(b) == cap(b) {
		nb := make([]careRow, len(b), min(2*cap(b), careBlockSize))
		copy(nb, b)
		c.blocks[k] = nb
	}
	c.blocks[k] = c.blocks[k][:len(c.blocks[k])+1]
	c.n++
	return &c.blocks[k][len(c.blocks[k])-1]
}

func (c *CareRounds) intern(s string) uint32 {
	if s == "" {
		return 0
	}
	if i, ok := c.ids[s]; ok {
		return i
	}
	i := uint32(len(c.strs))
	c.strs = append(c.strs, s)
	c.ids[s] = i
	return i
}

// source is the index of a ref prefix, or false when the table is full.
func (c *CareRounds) source(prefix string) (uint32, bool) {
	if n := len(c.srcs); n > 0 && c.srcs[n-1] == prefix {
		return uint32(n - 1), true // the loader's one prefix
	}
	if i, ok := c.srcIdx[prefix]; ok {
		return i, true
	}
	if len(c.srcs) == maxCareSrcs {
		return 0, false
	}
	i := uint32(len(c.srcs))
	c.srcs = append(c.srcs, prefix)
	c.srcIdx[prefix] = i
	return i, true
}

// add appends a round made by hand: its ref is split into a prefix and a
// line where it ends in a line number.
func (c *CareRounds) add(r *CareRound) {
	prefix, line := splitRef(string(r.Ref))
	c.addAt(r, prefix, line)
}

// addAt appends a round whose ref is prefix followed by line (the prefix
// alone when line is 0): the loader's path, which never formats the ref.
func (c *CareRounds) addAt(r *CareRound, prefix string, line int) {
	src, ok := c.source(prefix)
	flags, fits := c.packFlags(r)
	at := int64(noTime)
	if !r.At.IsZero() {
		at = r.At.Unix()
		fits = fits && r.At.Nanosecond() == 0 && r.At.Location() == c.loc
	}
	if !ok || !fits || line < 0 || line > math.MaxUint32 {
		c.addWide(r, prefix, line)
		return
	}
	w := c.push()
	*w = careRow{at: at, day: r.Day, line: uint32(line), flags: flags | src<<srcShift,
		enc: c.internAt(0, r.EnclosureID), bld: c.internAt(1, r.BuildingID), staff: c.internAt(2, r.StaffID),
		anim: c.internAt(3, r.ConcernAnimalID), notes: c.internAt(4, r.Notes)}
	if r.FeedG != nil {
		w.feed = *r.FeedG
		w.flags |= careFeedSet
	}
}

func (c *CareRounds) addWide(r *CareRound, prefix string, line int) {
	cp := *r
	if line > 0 {
		cp.Ref = Ref(prefix + strconv.Itoa(line))
	} else {
		cp.Ref = Ref(prefix)
	}
	if r.FeedG != nil {
		v := *r.FeedG
		cp.FeedG = &v
	}
	w := c.push()
	// The ids are in the table too, so Keys serves wide rows as well.
	*w = careRow{day: r.Day, line: uint32(len(c.wide)), flags: careWide,
		enc: c.intern(r.EnclosureID), bld: c.intern(r.BuildingID), staff: c.intern(r.StaffID),
		anim: c.intern(r.ConcernAnimalID)}
	c.wide = append(c.wide, cp)
}

// packFlags packs the yes/no answers and the water state, and reports
// whether they fit.
func (c *CareRounds) packFlags(r *CareRound) (uint32, bool) {
	var f uint32
	fits := true
	for k, b := range [...]Bool{r.Observed, r.Fed, r.WaterRestored, r.BeddingAdded, r.Cleaned, r.HealthConcern} {
		if b < NotRecorded || b > Yes {
			fits = false
		}
		f |= uint32(b) & boolFieldMask << (2 * k)
	}
	w, ok := waterCode(r.Water)
	if r.DateOnly {
		f |= careDateOnly
	}
	return f | w<<waterShift, fits && ok
}

// splitRef splits a ref into its prefix and its line: "daily_care.csv:12"
// is ("daily_care.csv:", 12). A ref that does not end in a line number
// (no digits, a leading zero, too long) is all prefix, with line 0.
func splitRef(s string) (string, int) {
	i := len(s)
	for i > 0 && s[i-1] >= '0' && s[i-1] <= '9' {
		i--
	}
	digits := s[i:]
	if digits == "" || digits[0] == '0' || len(digits) > 9 {
		return s, 0
	}
	n, _ := strconv.Atoi(digits)
	return s[:i], n
}

func (r *careRow) boolAt(k int) Bool { return Bool(r.flags >> (2 * k) & boolFieldMask) }

// CareView is one care round as the checks read it: every field of
// CareRound but the ref (CareRounds.Ref formats it), with the feed as a
// value and a flag. Its strings are shared with the store.
type CareView struct {
	At              time.Time // for a date-only row, midnight local
	Day             Day
	DateOnly        bool
	EnclosureID     string
	BuildingID      string
	StaffID         string
	Observed        Bool
	Fed             Bool
	FeedG           float64 // grams, when HasFeed
	HasFeed         bool    // the row recorded a feed amount (FeedG may be 0)
	Water           string
	WaterRestored   Bool
	BeddingAdded    Bool
	Cleaned         Bool
	HealthConcern   Bool
	ConcernAnimalID string
	Notes           string
}

// View returns round i without its ref, without allocating.
func (c *CareRounds) View(i int) CareView {
	r := c.row(i)
	if r.flags&careWide != 0 {
		w := &c.wide[r.line]
		v := CareView{At: w.At, Day: w.Day, DateOnly: w.DateOnly, EnclosureID: w.EnclosureID, BuildingID: w.BuildingID,
			StaffID: w.StaffID, Observed: w.Observed, Fed: w.Fed, Water: w.Water, WaterRestored: w.WaterRestored,
			BeddingAdded: w.BeddingAdded, Cleaned: w.Cleaned, HealthConcern: w.HealthConcern,
			ConcernAnimalID: w.ConcernAnimalID, Notes: w.Notes}
		if w.FeedG != nil {
			v.FeedG, v.HasFeed = *w.FeedG, true
		}
		return v
	}
	v := CareView{Day: r.day, DateOnly: r.flags&careDateOnly != 0,
		EnclosureID: c.strs[r.enc], BuildingID: c.strs[r.bld], StaffID: c.strs[r.staff],
		Observed: r.boolAt(0), Fed: r.boolAt(1), WaterRestored: r.boolAt(2), BeddingAdded: r.boolAt(3),
		Cleaned: r.boolAt(4), HealthConcern: r.boolAt(5),
		Water:           waterStates[r.flags>>waterShift&waterMask],
		ConcernAnimalID: c.strs[r.anim], Notes: c.strs[r.notes],
		FeedG: r.feed, HasFeed: r.flags&careFeedSet != 0}
	if r.at != noTime {
		v.At = time.Unix(r.at, 0).In(c.loc)
	}
	return v
}

// CareKeys are a round's ids as keys of the store's table of strings
// (Strings()[k] is the id; 0 is ""): a loop over millions of rounds can
// resolve each id once per key, in a slice indexed by key, instead of once
// per round in a map.
type CareKeys struct {
	Enclosure, Building, Staff, ConcernAnimal uint32
}

// key is the f-th of the keys, in the order of the fields of CareKeys.
func (k CareKeys) key(f int) uint32 {
	return [4]uint32{k.Enclosure, k.Building, k.Staff, k.ConcernAnimal}[f]
}

// Keys returns round i's ids as keys of Strings.
func (c *CareRounds) Keys(i int) CareKeys {
	r := c.row(i)
	return CareKeys{Enclosure: r.enc, Building: r.bld, Staff: r.staff, ConcernAnimal: r.anim}
}

// CareAnswers are a round's recorded answers: its yes/no fields, water
// state and feed, read without the time and ids View also gives.
type CareAnswers struct {
	Observed, Fed, WaterRestored, BeddingAdded, Cleaned, HealthConcern Bool
	Water                                                              string
	FeedG                                                              float64 // grams, when HasFeed
	HasFeed                                                            bool
}

// Answers returns round i's answers.
func (c *CareRounds) Answers(i int) CareAnswers {
	r := c.row(i)
	if r.flags&careWide != 0 {
		w := &c.wide[r.line]
		a := CareAnswers{Observed: w.Observed, Fed: w.Fed, WaterRestored: w.WaterRestored, BeddingAdded: w.BeddingAdded,
			Cleaned: w.Cleaned, HealthConcern: w.HealthConcern, Water: w.Water}
		if w.FeedG != nil {
			a.FeedG, a.HasFeed = *w.FeedG, true
		}
		return a
	}
	return CareAnswers{Observed: r.boolAt(0), Fed: r.boolAt(1), WaterRestored: r.boolAt(2), BeddingAdded: r.boolAt(3),
		Cleaned: r.boolAt(4), HealthConcern: r.boolAt(5), Water: waterStates[r.flags>>waterShift&waterMask],
		FeedG: r.feed, HasFeed: r.flags&careFeedSet != 0}
}

// Strings is the store's table of ids and notes, by key (read-only: it is
// the store's own).
func (c *CareRounds) Strings() []string {
	if c == nil {
		return []string{""}
	}
	return c.strs
}

// Day is the day of round i, the field most loops filter on first.
func (c *CareRounds) Day(i int) Day { return c.row(i).day }

// Ref formats the ref of round i ("daily_care.csv:12",
// "records.xlsx:daily_care!12").
func (c *CareRounds) Ref(i int) Ref {
	var buf [64]byte
	return Ref(c.appendRef(buf[:0], i))
}

func (c *CareRounds) appendRef(b []byte, i int) []byte {
	r := c.row(i)
	if r.flags&careWide != 0 {
		return append(b, c.wide[r.line].Ref...)
	}
	b = append(b, c.srcs[r.flags>>srcShift]...)
	if r.line > 0 {
		b = strconv.AppendUint(b, uint64(r.line), 10)
	}
	return b
}

// CompareRefs compares the refs of rounds i and j as strings (as sorting
// by Ref does), without allocating.
func (c *CareRounds) CompareRefs(i, j int) int {
	var bi, bj [64]byte
	return bytes.Compare(c.appendRef(bi[:0], i), c.appendRef(bj[:0], j))
}

// line is the line of round i's ref.
func (c *CareRounds) line(i int) int {
	r := c.row(i)
	if r.flags&careWide != 0 {
		_, n := splitRef(string(c.wide[r.line].Ref))
		return n
	}
	return int(r.line)
}

// Round returns round i in full.
func (c *CareRounds) Round(i int) CareRound {
	r := c.row(i)
	if r.flags&careWide != 0 {
		w := c.wide[r.line]
		if w.FeedG != nil {
			v := *w.FeedG
			w.FeedG = &v
		}
		return w
	}
	v := c.View(i)
	out := CareRound{Ref: c.Ref(i), At: v.At, Day: v.Day, DateOnly: v.DateOnly,
		EnclosureID: v.EnclosureID, BuildingID: v.BuildingID, StaffID: v.StaffID,
		Observed: v.Observed, Fed: v.Fed, Water: v.Water, WaterRestored: v.WaterRestored,
		BeddingAdded: v.BeddingAdded, Cleaned: v.Cleaned, HealthConcern: v.HealthConcern,
		ConcernAnimalID: v.ConcernAnimalID, Notes: v.Notes}
	if v.HasFeed {
		g := v.FeedG
		out.FeedG = &g
	}
	return out
}

// Rounds returns every round in full, for tests and small sets.
func (c *CareRounds) Rounds() []CareRound {
	out := make([]CareRound, c.Len())
	for i := range out {
		out[i] = c.Round(i)
	}
	return out
}

// Filter returns a store of the rounds keep accepts, sharing the string
// table (the original is left as it is).
func (c *CareRounds) Filter(keep func(i int) bool) *CareRounds {
	out := &CareRounds{loc: c.loc, strs: c.strs, srcs: c.srcs, wide: c.wide}
	for i := range c.Len() {
		if keep(i) {
			*out.push() = *c.row(i)
		}
	}
	return out
}

// retain keeps, in place and in order, the rounds keep accepts; blocks
// left empty are let go.
func (c *CareRounds) retain(keep func(i int) bool) { c.retainFrom(0, keep) }

// retainFrom is retain for the rounds from start on: those before it are
// kept without asking.
func (c *CareRounds) retainFrom(start int, keep func(i int) bool) {
	n := start
	for i := start; i < c.n; i++ {
		if !keep(i) {
			continue
		}
		if n != i {
			*c.row(n) = *c.row(i)
		}
		n++
	}
	c.truncate(n)
}

func (c *CareRounds) truncate(n int) {
	if n >= c.n {
		return
	}
	c.n = n
	full := n >> careBlockShift
	if rest := n & careBlockMask; rest > 0 {
		c.blocks[full] = c.blocks[full][:rest]
		full++
	}
	clear(c.blocks[full:])
	c.blocks = c.blocks[:full]
}

// reset drops every row (a file that could not be read to its end).
func (c *CareRounds) reset() {
	c.blocks, c.n, c.wide = nil, 0, nil
}

// appendStore moves the rounds of o (a store of rounds read after c's)
// after c's, as if each had been added to c in order: o's strings join
// c's table in o's order of first use, which is the table c would have
// built, and o's rows take c's keys. The rows are moved within o's own
// blocks rather than copied to new ones, so joining needs no memory beyond
// the two stores. It reports false, leaving the rows where they are, when
// o is not a store c can take (another location, more ref prefixes than a
// store holds); o is left empty when it reports true.
func (c *CareRounds) appendStore(other rowStore[CareRound]) bool {
	o, ok := other.(*CareRounds)
	if !ok || o.loc != c.loc {
		return false
	}
	if o.n == 0 {
		return true
	}
	srcs := make([]uint32, len(o.srcs))
	for i, p := range o.srcs {
		if srcs[i], ok = c.source(p); !ok {
			return false
		}
	}
	keys := make([]uint32, len(o.strs))
	for i := 1; i < len(o.strs); i++ {
		keys[i] = c.intern(o.strs[i])
	}
	wideBase := uint32(len(c.wide))
	c.wide = append(c.wide, o.wide...)
	fix := func(r *careRow) {
		r.enc, r.bld, r.staff, r.anim, r.notes = keys[r.enc], keys[r.bld], keys[r.staff], keys[r.anim], keys[r.notes]
		if r.flags&careWide != 0 {
			r.line += wideBase
		} else {
			r.flags = r.flags&(1<<srcShift-1) | srcs[r.flags>>srcShift]<<srcShift
		}
	}
	// First fill c's last block, row by row.
	j := 0
	if k := len(c.blocks); k > 0 {
		for j < o.n && len(c.blocks[k-1]) < careBlockSize {
			w := c.push()
			*w = *o.row(j)
			fix(w)
			j++
		}
	}
	// The rest, o's rows from j on, are c's next blocks: each is made in
	// o's block k from its rows after the first j and the first j rows of
	// block k+1 (read before block k+1 is itself moved).
	for k, blk := range o.blocks {
		if len(blk) <= j {
			break // its rows went into the block before
		}
		nb := copy(blk, blk[j:])
		if j > 0 && k+1 < len(o.blocks) {
			nb += copy(blk[nb:], o.blocks[k+1][:min(j, len(o.blocks[k+1]))])
		}
		blk = blk[:nb]
		for i := range blk {
			fix(&blk[i])
		}
		c.blocks = append(c.blocks, blk)
		c.n += nb
		o.blocks[k] = nil
	}
	o.reset()
	o.strs, o.ids, o.srcs, o.srcIdx = []string{""}, map[string]uint32{}, nil, map[string]uint32{}
	return true
}
