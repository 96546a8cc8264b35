package main

import (
	"bytes"
	"context"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"welfare/checker"
	"welfare/records"
	"welfare/rules"
)

// limitsIn is the limits in force and the text they came from.
type limitsIn struct {
	limits *rules.Limits
	src    []byte
	data   map[string]any
}

// loadLimits reads --limits FILE, or the shipped defaults when empty.
func loadLimits(path string) (*limitsIn, error) {
	src, name := rules.DefaultLimits(), "limits.yaml (built in)"
	if path != "" {
		b, err := os.ReadFile(path)
		if err != nil {
			return nil, fmt.Errorf("limits: %w", err)
		}
		src, name = b, path
	}
	l, err := rules.LoadLimits(bytes.NewReader(src), name)
	if err != nil {
		return nil, err
	}
	data, err := l.Data()
	if err != nil {
		return nil, err
	}
	return &limitsIn{limits: l, src: src, data: data}, nil
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
		out = append(out, checker.Source{Name: filepath.Clean(d), FS: os.DirFS(d)})
	}
	if len(out) == 0 {
		return nil, usagef("--rules-only needs at least one --rules DIR")
	}
	return out, nil
}

// loadRecords reads a records folder with the species of the limits in force.
func loadRecords(ctx context.Context, dir string, lim *limitsIn) (fs.FS, *records.Set, error) {
	return loadRecordsCounted(ctx, dir, lim, nil)
}

// loadRecordsCounted is loadRecords telling progress (when not nil) the rows read.
func loadRecordsCounted(ctx context.Context, dir string, lim *limitsIn, progress func(rows int)) (fs.FS, *records.Set, error) {
	st, err := os.Stat(dir)
	if err != nil {
		return nil, nil, fmt.Errorf("records folder: %w", err)
	}
	if !st.IsDir() {
		return nil, nil, fmt.Errorf("records folder: %s is not a folder", dir)
	}
	// Reads stay inside the folder: a link leading out of it is not followed.
	fsys, err := records.OpenFolder(dir)
	if err != nil {
		return nil, nil, fmt.Errorf("records folder: %w", err)
	}
	set, err := records.LoadContext(ctx, fsys, records.Options{Species: lim.limits.SpeciesCodes(), Progress: progress})
	if err != nil {
		return nil, nil, err
	}
	return fsys, set, nil
}
