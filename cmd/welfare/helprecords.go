package main

import (
	"io"

	"welfare/records"
)

// runHelpRecords prints the records reference ("welfare help records"), or
// one file of it ("welfare help records daily_care.csv"). The text is
// records/FORMAT.md, written from the loader's own tables.
func runHelpRecords(args []string, stdout io.Writer) error {
	switch len(args) {
	case 0:
		return records.WriteReference(stdout, "")
	case 1:
		if err := records.WriteReference(stdout, args[0]); err != nil {
			return usagef("help records: %v", err)
		}
		return nil
	}
	return usagef("help records takes at most one file name")
}
