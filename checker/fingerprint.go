package checker

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
	"io/fs"
	"strings"

	"welfare/records"
)

// Fingerprint is the SHA-256 over the inputs a check used: every file the
// records loader reads (records.IsRecordFile: CSV files and workbooks
// alike), every rule file of the sources (tests excluded: they do not
// change findings) and the limits text, each framed by its name and
// length so that moving bytes between files changes the sum. The same
// inputs always give the same fingerprint, so a signed report can be tied
// to the records it came from.
func Fingerprint(recordsFS fs.FS, sources []Source, limits []byte) (string, error) {
	h := sha256.New()
	// The files the loader reads (CSV files, workbooks, facility.yaml):
	// what was checked, and nothing a note left beside them could change.
	if err := hashTree(h, "records", recordsFS, records.IsRecordFile); err != nil {
		return "", err
	}
	for _, s := range sources {
		rule := func(p string) bool { return strings.HasSuffix(p, ".rego") && !strings.HasSuffix(p, "_test.rego") }
		if err := hashTree(h, "rules:"+s.Name, s.FS, rule); err != nil {
			return "", err
		}
	}
	frame(h, "limits", limits)
	return hex.EncodeToString(h.Sum(nil)), nil
}

func hashTree(h hash.Hash, prefix string, fsys fs.FS, keep func(string) bool) error {
	// WalkDir visits in lexical order, so the sum does not depend on the
	// order the operating system lists files in.
	return fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() || !keep(p) {
			return nil
		}
		b, err := fs.ReadFile(fsys, p)
		if err != nil {
			return fmt.Errorf("fingerprint: %w", err)
		}
		frame(h, prefix+"/"+p, b)
		return nil
	})
}

func frame(h hash.Hash, name string, b []byte) {
	fmt.Fprintf(h, "%s\x00%d\x00", name, len(b))
	h.Write(b)
}
