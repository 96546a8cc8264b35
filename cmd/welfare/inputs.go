package main

import (
	"context"
	"flag"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"welfare/checker"
	"welfare/records"
	"welfare/rules"
)

// limitsFiles are the --limits and --limits-replace flags of a command.
type limitsFiles struct {
	over, replace string
}

// addLimitsFlags registers --limits and --limits-replace on fs.
func addLimitsFlags(fs *flag.FlagSet, l *limitsFiles) {
	fs.StringVar(&l.over, "limits", "", "limits `FILE` holding the committee's changes, laid over the built-in limits (see 'welfare limits show')")
	fs.StringVar(&l.replace, "limits-replace", "", "a whole limits `FILE` used instead of the built-in limits")
}

// loadLimits reads --limits FILE laid over the shipped defaults, or
// --limits-replace FILE alone, or the shipped defaults when neither is given.
func loadLimits(l limitsFiles) (*rules.Limits, error) {
	if l.over != "" && l.replace != "" {
		return nil, usagef("give --limits (changes laid over the built-in limits) or --limits-replace (a whole file), not both")
	}
	path, parse := l.over, rules.ParseLimitsOver
	if l.replace != "" {
		path, parse = l.replace, rules.ParseLimits
	}
	if path == "" {
		return rules.Default()
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("limits: %w", err)
	}
	return parse(path, b)
}

// ruleSources are the shipped rules (unless rulesOnly) plus each --rules DIR.
func ruleSources(dirs []string, rulesOnly bool) ([]checker.Source, error) {
	var out []checker.Source
	if !rulesOnly {
		out = append(out, checker.Source{Name: "rules", FS: rules.FS()})
	}
	for _, d := range dirs {
		st, err := os.Stat(d)
		if err != nil {
			return nil, fmt.Errorf("--rules: %w", err)
		}
		if !st.IsDir() {
			return nil, usagef("--rules %s is not a folder", d)
		}
		out = append(out, checker.Source{Name: filepath.Clean(d), FS: os.DirFS(d), Local: true})
	}
	if len(out) == 0 {
		return nil, usagef("--rules-only needs at least one --rules DIR")
	}
	return out, nil
}

// recordsFolder opens a records folder for reading: reads stay inside the
// folder, so a link leading out of it is not followed.
func recordsFolder(dir string) (fs.FS, error) {
	st, err := os.Stat(dir)
	if err != nil {
		return nil, fmt.Errorf("records folder: %w", err)
	}
	if !st.IsDir() {
		return nil, fmt.Errorf("records folder: %s is not a folder", dir)
	}
	fsys, err := records.OpenFolder(dir)
	if err != nil {
		return nil, fmt.Errorf("records folder: %w", err)
	}
	return fsys, nil
}

// loadRecordsCounted reads a records folder with the species of the limits
// in force, telling progress (when not nil) the rows read.
func loadRecordsCounted(ctx context.Context, dir string, lim *rules.Limits, progress func(rows int)) (fs.FS, *records.Set, error) {
	fsys, err := recordsFolder(dir)
	if err != nil {
		return nil, nil, err
	}
	set, err := records.LoadContext(ctx, fsys, records.Options{Species: lim.SpeciesCodes(), Progress: progress})
	if err != nil {
		return nil, nil, err
	}
	return fsys, set, nil
}
