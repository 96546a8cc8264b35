#!/usr/bin/env bash
# The care round file read in ranges when a quoted cell holds a newline
# where a range would start (records/split.go): the cut moves to a newline
# with even quotes on both sides (a note of two or three lines), or, when
# the cell runs over more lines, the range before stops at the row the
# quote opened in and the rest of the file is read again from there.
# This script measures those paths through the real binary: it copies a
# generated folder into variants whose daily_care.csv differs in one cell,
# then times `welfare validate` and `welfare check --pdf --json` on each
# with /usr/bin/time (wall s, CPU s user+sys, peak resident memory), RUNS
# times, and prints the medians.
#
#   testdata/split_fallback.sh [DIR] [RUNS]   # default: a new 10000-animal year, 3 runs
#   KEEP=1 testdata/split_fallback.sh ...     # leave the binary, variants and logs
#   WELFARE=/path/to/welfare testdata/split_fallback.sh ...  # time that binary
#
# DIR is a folder made by `welfare generate` (it is only read). Variants:
#   normal      DIR as it is
#   notes       a notes column added (every note blank): the control for
#   mid-notes   ... one note "gate<newline>left open" holding the newline
#               the cut of two ranges falls after (an accepted row)
#   mid-bad     no notes column; the last cell (cleaned) of the row at the
#               cut is "yes<newline>no" (a rejected row)
#   mid-long    a note of six lines at the cut: the rest is read again
#   end-notes   one note with a newline in the file's last rows (inside the
#               last range: the ranges join)
# Each variant is checked to hold the first newline after half its size
# (where two ranges were cut before) inside its quote, or, for end-notes
# and the controls, not. Needs about 2 GB in $TMPDIR at
# the default size; not part of `go test`.
set -euo pipefail
src=${1:-}
runs=${2:-3}
top=$(cd "$(dirname "$0")/.." && pwd)
work=$(mktemp -d)
if [ -n "${KEEP:-}" ]; then echo "work folder (kept): $work"; else trap 'rm -rf "$work"' EXIT; fi
if [ -n "${WELFARE:-}" ]; then cp "$WELFARE" "$work/welfare"; else (cd "$top" && go build -o "$work/welfare" ./cmd/welfare); fi
if [ -z "$src" ]; then
  src="$work/generated"
  "$work/welfare" generate --animals 10000 --days 365 --seed 7 "$src" > /dev/null
fi
for v in notes mid-notes mid-bad mid-long end-notes; do
  mkdir "$work/$v"
  find "$src" -maxdepth 1 -type f ! -name daily_care.csv -exec cp {} "$work/$v/" \;
done
python3 - "$src/daily_care.csv" "$work" <<'PY'
import sys
data = open(sys.argv[1], "rb").read()
work = sys.argv[2]
assert data.endswith(b"\n") and b'"' not in data, "a generated file: no quotes, a final newline"
head, _, body = data.partition(b"\n")
with_notes = head + b",notes\n" + body.replace(b"\n", b",\n")

def cut_of_two(d):
    # splitPoints with two ranges: just after the first newline at or after half the size.
    return d.index(b"\n", len(d) // 2) + 1

def edit_row(d, at, cell):
    # Ends the row holding offset at (of the file after the edit) with cell,
    # in place of its last cell. The file grows by extra bytes before at's
    # row ends, so at is taken in the file before the edit, and the quote's
    # newline is then the first newline at or after it.
    start = d.rindex(b"\n", 0, at) + 1
    end = d.index(b"\n", at)
    last = d.rindex(b",", start, end) + 1
    return d[:last] + cell + d[end:]

def write(name, d, inside):
    cut = cut_of_two(d)
    q = d.count(b'"', 0, cut)
    assert (q % 2 == 1) == inside, (name, cut, q)
    open(f"{work}/{name}/daily_care.csv", "wb").write(d)
    print(f"{name}: {len(d)} bytes, first newline after half at {cut - 1}, inside a quote: {inside}")

write("notes", with_notes, False)
note = b'"gate\nleft open"'
# The notes cell is empty (the row ends in ","): the file grows by len(note).
write("mid-notes", edit_row(with_notes, (len(with_notes) + len(note)) // 2, note), True)
bad = b'"yes\nno"'
# cleaned is yes or no (3 or 2 bytes): the file grows by 5 or 6; either half
# lies before the quote's newline, which is past the cell's old end.
write("mid-bad", edit_row(data, (len(data) + len(bad) - 3) // 2, bad), True)
long = b'"gate\nleft\nopen\nby\nthe\nkeeper"'
# Its first newline is the first at or after half the file; the second and
# third have even lines (no quote) on both sides: the cut falls inside.
write("mid-long", edit_row(with_notes, (len(with_notes) + len(long)) // 2, long), True)
end_at = len(with_notes) - 200
write("end-notes", edit_row(with_notes, end_at, note), False)
PY
tab="%e %U %S %M"
declare -A dirs=([normal]="$src" [notes]="$work/notes" [mid-notes]="$work/mid-notes" [mid-bad]="$work/mid-bad" [mid-long]="$work/mid-long" [end-notes]="$work/end-notes")
for v in normal notes mid-notes mid-bad mid-long end-notes; do
  d=${dirs[$v]}
  for i in $(seq "$runs"); do
    # validate exits 1 on a rejected row (the generated year plants one).
    /usr/bin/time -a -o "$work/$v.validate" -f "$tab" \
      "$work/welfare" validate --timings "$d" > /dev/null 2> "$work/$v.validate.log" || true
    /usr/bin/time -a -o "$work/$v.check" -f "$tab" "$work/welfare" check --timings --fail-on never \
      --pdf "$work/audit.pdf" --json "$work/findings.json" "$d" > /dev/null 2> "$work/$v.check.log"
  done
  grep -m1 '^  load' "$work/$v.check.log" | sed "s/^/$v check, last run: /"
done
python3 - "$work" "$runs" <<'PY'
import statistics, sys
work = sys.argv[1]
print(f"medians of {sys.argv[2]} runs: wall s, CPU s (user+sys), peak RSS MiB")
for v in ("normal", "notes", "mid-notes", "mid-bad", "mid-long", "end-notes"):
    out = []
    for cmd in ("validate", "check"):
        rows = [list(map(float, l.split())) for l in open(f"{work}/{v}.{cmd}") if l[:1].isdigit()]
        wall = statistics.median(r[0] for r in rows)
        cpu = statistics.median(r[1] + r[2] for r in rows)
        rss = statistics.median(r[3] for r in rows) / 1024
        out.append(f"{cmd} {wall:5.2f} s {cpu:5.2f} s {rss:4.0f} MiB")
    print(f"{v:10s} " + "   ".join(out))
PY
