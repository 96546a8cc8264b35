#!/usr/bin/env bash
# The scale case of issue 11 through the real binary: generate a folder with
# `welfare generate`, then time `welfare validate` and
# `welfare check --pdf --json` with /usr/bin/time (wall time, peak resident
# memory), RUNS times each, print the medians, and compare the findings with
# PLANTED.json.
#
#   testdata/stress.sh [ANIMALS] [DAYS] [RUNS]     # default 10000 365 1
#
# Not part of `go test`: at the default size it takes minutes and about a
# gigabyte. Put its figures in README's Performance section when you change
# the loader, the facts or the rules.
set -euo pipefail
n=${1:-10000}
days=${2:-365}
runs=${3:-1}
top=$(cd "$(dirname "$0")/.." && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
(cd "$top" && go build -o "$work/welfare" ./cmd/welfare)
"$work/welfare" generate --animals "$n" --days "$days" --seed 7 "$work/records"
wc -l "$work"/records/*.csv | tail -1
du -sh "$work/records"
# validate exits 1: the planted problems include a rejected row.
tab="%e %U %S %M"
for i in $(seq "$runs"); do
  /usr/bin/time -a -o "$work/validate.times" -f "$tab" \
    "$work/welfare" validate --timings "$work/records" > /dev/null 2> "$work/validate.log" || true
  /usr/bin/time -a -o "$work/check.times" -f "$tab" "$work/welfare" check --timings --fail-on never \
    --previous "$work/records/previous/findings.json" \
    --generated-at 2027-01-01T00:00:00Z --pdf "$work/audit.pdf" --json "$work/findings.json" "$work/records" \
    > /dev/null 2> "$work/check.log"
  echo "run $i: validate $(grep "^[0-9]" "$work/validate.times" | tail -1); check $(grep "^[0-9]" "$work/check.times" | tail -1) (wall s, user s, sys s, peak RSS KB)"
done
echo "last check's phases:"; grep -A8 '^timings' "$work/check.log"
# Medians over the runs.
python3 - "$work/validate.times" "$work/check.times" <<'PY'
import statistics, sys
for path, name in zip(sys.argv[1:], ("validate", "check")):
    rows = [list(map(float, l.split())) for l in open(path) if l[:1].isdigit()]
    med = [statistics.median(c) for c in zip(*rows)]
    print(f"{name}: median of {len(rows)}: wall {med[0]:.2f} s, user {med[1]:.2f} s, sys {med[2]:.2f} s, peak RSS {med[3]/1024:.0f} MiB")
PY
# Findings against the answer key: check, subject, on, until (every entry, as
# the check had the previous review; without it, those marked "needs" are not found).
python3 - "$work/findings.json" "$work/records/PLANTED.json" <<'PY'
import json, sys
found = json.load(open(sys.argv[1]))["findings"]
key = lambda f: (f["check"], f["subject"], f["on"], f.get("until") or "")
got = sorted(key(f) for f in found)
want = sorted(key(p) for p in json.load(open(sys.argv[2])))
print("findings == PLANTED.json:", got == want, f"({len(got)} found, {len(want)} planted)")
PY
