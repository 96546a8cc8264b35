package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"welfare/records"
)

// starterFacility is the commented facility.yaml of a new records folder.
// Its one building is a placeholder so that the folder validates at once;
// the comments say what to change.
const starterFacility = `# facility.yaml: the facility, its buildings and its weather sites.
# Fill this in first: every other record names a building or weather site
# defined here. The reference: welfare help records facility.yaml

name: New facility (change this to its name)   # shown on every report
time_zone: UTC      # the IANA name of your time zone, such as America/Winnipeg

# Every shed, barn or room that holds enclosures. enclosures.csv names
# them in building_id. exposure is outdoor, sheltered or indoor.
buildings:
  - id: B1
    exposure: indoor
    # weather_site: YARD   # outdoor and sheltered buildings: the site whose readings apply

# The places weather is read (weather.csv and outdoor_work.csv name them in
# site_id), for example [YARD, ROOF].
weather_sites: []
`

func initFlags() *flag.FlagSet {
	return flag.NewFlagSet("init", flag.ContinueOnError)
}

// runInit writes a starter records folder: the commented facility.yaml and
// every record file with its header row (required columns first), taken
// from the loader's own tables. It never overwrites a file.
func runInit(_ context.Context, args []string, stdout, _ io.Writer) error {
	flags := initFlags()
	pos, err := parseArgs(flags, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return usagef("init needs one folder to create")
	}
	dir := pos[0]
	files := map[string][]byte{"facility.yaml": []byte(starterFacility)}
	for _, name := range records.ReferenceFiles()[1:] {
		head, err := records.Header(name)
		if err != nil {
			return err
		}
		files[name] = []byte(strings.Join(head, ",") + "\n")
	}
	for _, name := range records.ReferenceFiles() {
		if _, err := os.Stat(filepath.Join(dir, name)); err == nil {
			return fmt.Errorf("init: %s already exists; nothing was written (init does not overwrite records)", filepath.Join(dir, name))
		} else if !errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("init: %w", err)
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("init: %w", err)
	}
	for _, name := range records.ReferenceFiles() {
		f, err := os.OpenFile(filepath.Join(dir, name), os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err != nil {
			return fmt.Errorf("init: %w", err)
		}
		_, werr := f.Write(files[name])
		if err := errors.Join(werr, f.Close()); err != nil {
			return fmt.Errorf("init: %w", err)
		}
	}
	fmt.Fprintf(stdout, `Wrote a starter records folder to %s: facility.yaml and every record file
with its header row (required columns first).

Fill in first:
  1. facility.yaml: the name, the time zone, and each building (id and exposure).
  2. enclosures.csv: one row per cage, pen, run or room, in a building of facility.yaml.
  3. animals.csv: one row per animal, with the enclosure it lives in.
  4. staff.csv: everyone a record names.
Then the daily records as they happen (daily_care.csv first). A file you do not
keep can be deleted; its checks are then reported as not evaluated.

Check the folder as you go:
  welfare validate %s
The columns of every file:
  welfare help records
`, dir, dir)
	return nil
}
