package checker

import (
	"context"
	"fmt"
	"io/fs"
	"os"
	"testing"

	"welfare/records"
	"welfare/records/synth"
)

// BenchmarkLoadCaptured loads a generated folder (welfare generate --days
// 365 --seed 7) at 1,000 and 10,000 animals the ways a command can: direct
// is records.LoadContext on the folder, what validate does; captured is
// the load of Policy.CheckWith, through the capturing FS that hashes and
// counts the lines of every byte read, then the fingerprint's list of
// files; sequential is captured with the folder's files hiding ReadAt, so
// the care rounds are read in one range with the hash on the reading
// goroutine (how a check loaded before the capture offered ReadAt). The
// three in one run give the capture's cost against the same machine load.
//
//	go test ./checker -run '^$' -bench 'LoadCaptured/animals=1000$/' -count 3
func BenchmarkLoadCaptured(b *testing.B) {
	lim := defaultLimits(b)
	opt := records.Options{Species: lim.SpeciesCodes()}
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("animals=%d", n), func(b *testing.B) {
			dir := b.TempDir()
			if _, err := synth.Generate(dir, synth.Options{Animals: n, Days: 365, Seed: 7}); err != nil {
				b.Fatal(err)
			}
			folder := os.DirFS(dir)
			want := ""
			load := func(b *testing.B, fsys fs.FS, capture bool) {
				b.ReportAllocs()
				defer reportCPU(b)()
				for b.Loop() {
					c := newCaptureFS(fsys)
					from := fs.FS(c)
					if !capture {
						from = fsys
					}
					if _, err := records.LoadContext(context.Background(), from, opt); err != nil {
						b.Fatal(err)
					}
					if !capture {
						continue
					}
					sum := fingerprint(c.read(), nil, nil, nil)
					if want == "" {
						want = sum
					} else if sum != want {
						b.Fatalf("fingerprint %s, another way gave %s", sum, want)
					}
					if err := c.err(); err != nil {
						b.Fatal(err)
					}
				}
			}
			b.Run("direct", func(b *testing.B) { load(b, folder, false) })
			b.Run("captured", func(b *testing.B) { load(b, folder, true) })
			b.Run("sequential", func(b *testing.B) { load(b, noReadAtFS{folder}, true) })
		})
	}
}

// noReadAtFS opens files that offer only fs.File's methods; the rest of
// the folder's methods pass through.
type noReadAtFS struct{ fsys fs.FS }

func (n noReadAtFS) ReadDir(name string) ([]fs.DirEntry, error) { return fs.ReadDir(n.fsys, name) }
func (n noReadAtFS) Stat(name string) (fs.FileInfo, error)      { return fs.Stat(n.fsys, name) }
func (n noReadAtFS) Lstat(name string) (fs.FileInfo, error)     { return fs.Lstat(n.fsys, name) }
func (n noReadAtFS) ReadLink(name string) (string, error)       { return fs.ReadLink(n.fsys, name) }

func (n noReadAtFS) Open(name string) (fs.File, error) {
	f, err := n.fsys.Open(name)
	if err != nil {
		return nil, err
	}
	return struct{ fs.File }{f}, nil
}
