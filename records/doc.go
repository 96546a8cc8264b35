// Package records loads and validates a facility's records folder: the
// input contract of every check (facility.yaml plus the CSV files of the
// records contract).
//
// Load reads every known file into typed rows in SI units and accounts for
// each CSV row: for every file, Read == Accepted + Rejected. A row that
// cannot be used — a cell that does not parse, a value outside its plausible
// range, a reference to an unknown id, a duplicate id, an overlapping housing
// stay, dates out of order — is rejected and becomes exactly one Problem
// positioned by file, line, column and the value as written, so nothing
// disappears silently. A file that cannot be used as a whole (no header, a
// missing required column, a duplicate column, two units for one
// measurement) is marked Failed, and its rows count as rejected.
//
// Only failures of the folder itself are returned as an error (*LoadError):
// an unreadable folder, a missing facility.yaml, animals.csv or
// enclosures.csv, or a facility.yaml that does not parse, has an unknown key
// or names an unknown time zone.
//
// Care rounds, the one kind with millions of rows a year, are kept in a
// compact store rather than as a slice: Load fills it while daily_care is
// read, and Set.CareRounds returns it (CareRounds.View reads a round
// without allocating, CareRounds.Ref formats its ref when asked). Set.Care
// holds the rounds of a set made by hand; Load leaves it empty, and
// CareRounds serves both.
//
// A large CSV file whose rows carry no unique id (the care rounds above
// all) is read in byte ranges, one per core, and the ranges are joined in
// file order into exactly what reading it whole gives (split.go); when a
// cut falls inside a quoted cell, the rest of the file is read again from
// the row where the quote opened.
//
// Unknown files and columns are Warnings: nothing was lost, but something
// was not read. Judgements about the records (an animal culled without a
// matching departure, an event after an animal left, life stage defaults)
// are the checker's, not the loader's.
package records
