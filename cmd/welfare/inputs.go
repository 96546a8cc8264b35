package main

import (
	"context"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"welfare/checker"
	"welfare/records"
	"welfare/rules"
)

// loadLimits reads --limits FILE, or the shipped defaults when empty.
func loadLimits(path string) (*rules.Limits, error) {
	if path == "" {
		return rules.Default()
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("limits: %w", err)
	}
	return rules.ParseLimits(path, b)
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

// loadRecords reads a records folder with the species of the limits in force.
func loadRecords(ctx context.Context, dir string, lim *rules.Limits) (fs.FS, *records.Set, error) {
	return loadRecordsCounted(ctx, dir, lim, nil)
}

// loadRecordsCounted is loadRecords telling progress (when not nil) the rows read.
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
