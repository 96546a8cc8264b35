package checker

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
	"io"
	"io/fs"
	"strings"

	"welfare/records"
)

// Fingerprint is the SHA-256 over the inputs a check used: the record files
// the loader reads (records.FilesRead: regular files inside the folder, CSV files and workbooks alike, so
// an unknown file, a named pipe or a link leading outside is not in it),
// every rule file of the sources (tests excluded: they do
// not change findings) and the limits text, each framed by its name and
// length so that moving bytes between files changes the sum. The same
// inputs always give the same fingerprint, so a signed report can be tied
// to the records it came from.
func Fingerprint(recordsFS fs.FS, sources []Source, limits []byte) (string, error) {
	h := sha256.New()
	if err := hashRecords(h, recordsFS); err != nil {
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

// hashRecords hashes each record file through the loader's own bounded
// reader, streaming: its frame holds the file's length and SHA-256.
func hashRecords(h hash.Hash, fsys fs.FS) error {
	for _, name := range records.FilesRead(fsys) {
		// A file the loader could not read (over its cap) is framed with
		// the reason, as the report shows it unused.
		f, err := records.OpenFile(context.Background(), fsys, name)
		if err != nil {
			fmt.Fprintf(h, "records/%s\x00unread\x00%s\x00", name, err)
			continue
		}
		sub := sha256.New()
		n, err := io.Copy(sub, f)
		f.Close()
		if err != nil {
			fmt.Fprintf(h, "records/%s\x00unread\x00%s\x00", name, err)
			continue
		}
		fmt.Fprintf(h, "records/%s\x00%d\x00", name, n)
		h.Write(sub.Sum(nil))
	}
	return nil
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
