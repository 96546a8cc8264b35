package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"welfare/rules"
)

// exportRules writes the shipped rules and their tests to dir as an
// editable copy, used in their place with --rules DIR --rules-only. It
// writes nothing when any of the files is already there.
func exportRules(args []string, w io.Writer) error {
	if len(args) != 1 {
		return &usageError{cmd: "rules", msg: "rules export " + countMsg("one DIR", args)}
	}
	dir := args[0]
	names, err := fs.Glob(rules.FS(), "*.rego")
	if err != nil {
		return err
	}
	for _, n := range names {
		if _, err := os.Lstat(filepath.Join(dir, n)); err == nil {
			return fmt.Errorf("%s already exists; nothing written", filepath.Join(dir, n))
		} else if !errors.Is(err, fs.ErrNotExist) {
			return err
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tests := 0
	for _, n := range names {
		b, err := fs.ReadFile(rules.FS(), n)
		if err != nil {
			return err
		}
		if err := os.WriteFile(filepath.Join(dir, n), b, 0o644); err != nil {
			return err
		}
		if strings.HasSuffix(n, "_test.rego") {
			tests++
		}
	}
	fmt.Fprintf(w, "Wrote the shipped rules to %s: %d rule files and %d test files, to edit.\n", dir, len(names)-tests, tests)
	fmt.Fprintf(w, "Use them in place of the shipped rules (both at once define every check twice):\n")
	fmt.Fprintf(w, "  welfare rules test --rules %s --rules-only\n", dir)
	fmt.Fprintf(w, "  welfare check RECORDS --rules %s --rules-only\n", dir)
	return nil
}
