#!/usr/bin/env bash
# The stress case of DESIGN.md, end to end through the real binary: an
# invented facility of N single-fox outdoor cages (default 10,000) with one
# care round per cage per day for DAYS days (default 365), weather every 3
# hours (mild: 2-10 °C, so one round a day keeps the water checks within
# limits), a weighing per animal per month and a keeper's stint per day. It
# writes the records folder, then times `welfare validate` and
# `welfare check` with /usr/bin/time and prints wall time and peak memory.
#
#   testdata/stress.sh [N] [DAYS] [DIR]
#
# Not part of `go test`: it takes minutes and a few GB. Put its figures in
# the issue note when you change the loader, the facts or the rules.
set -euo pipefail
n=${1:-10000}
days=${2:-365}
dir=${3:-$(mktemp -d)/stress}
top=$(cd "$(dirname "$0")/.." && pwd)
mkdir -p "$dir"
cd "$dir"

cat > facility.yaml <<YAML
name: Stress Test Station (invented)
time_zone: America/Winnipeg
buildings:
  - {id: S, exposure: outdoor, weather_site: MAST}
weather_sites: [MAST]
YAML

awk -v n="$n" 'BEGIN{print "enclosure_id,building_id,kind,length_cm,width_cm,height_cm,max_occupants,nest_box,platform";
  for(i=0;i<n;i++) printf "C%05d,S,cage,100,100,75,1,yes,yes\n", i}' > enclosures.csv
awk -v n="$n" 'BEGIN{print "animal_id,species,sex,arrived_on,enclosure_id,protocol_id";
  for(i=0;i<n;i++) printf "F%05d,vulpes_vulpes,%s,2025-03-01,C%05d,\n", i, (i%2?"f":"m"), i}' > animals.csv
cat > staff.csv <<CSV
staff_id,name,role,handling_trained_on,rabies_primary_on
K1,Keeper One,keeper,2025-07-01,2025-06-01
K2,Keeper Two,keeper,2025-07-01,2025-06-01
CSV

# Day arithmetic in awk: days since 1970-01-01 to a civil date.
civil='function civil(z,  era,doe,yoe,y,doy,mp,d,m){z+=719468; era=int(z/146097); doe=z-era*146097;
  yoe=int((doe-int(doe/1460)+int(doe/36524)-int(doe/146096))/365); y=yoe+era*400; doy=doe-(365*yoe+int(yoe/4)-int(yoe/100));
  mp=int((5*doy+2)/153); d=doy-int((153*mp+2)/5)+1; m=mp<10?mp+3:mp-9; if(m<=2)y++; return sprintf("%04d-%02d-%02d",y,m,d)}'
start=20270   # 2025-07-01

awk -v n="$n" -v days="$days" -v s="$start" "$civil"'
BEGIN{print "checked_at,enclosure_id,staff_id,observed,fed,water,bedding_added";
  for(d=0;d<days;d++){ day=civil(s+d); for(i=0;i<n;i++) printf "%sT07:30,C%05d,K1,yes,yes,ok,yes\n", day, i } }' > daily_care.csv
awk -v days="$days" -v s="$start" "$civil"'
BEGIN{print "observed_at,site_id,air_temp_c,wind_kmh";
  for(d=0;d<days;d++){ day=civil(s+d); for(h=0;h<24;h+=3) printf "%sT%02d:00,MAST,%d,%d\n", day, h, 2+(h%9), 8 } }' > weather.csv
awk -v days="$days" -v s="$start" "$civil"'
BEGIN{print "staff_id,started_at,ended_at,site_id,activity";
  for(d=0;d<days;d++){ day=civil(s+d); printf "K2,%sT09:00,%sT09:30,MAST,moderate\n", day, day } }' > outdoor_work.csv
awk -v n="$n" -v days="$days" -v s="$start" "$civil"'
BEGIN{print "handled_at,animal_id,staff_id,purpose,restraint,duration_min,glove,ppe";
  for(m=0;m*30<days;m++) for(i=0;i<n;i++){ d=m*30+i%28; if(d>=days) continue;
    printf "%sT10:00,F%05d,K2,weighing,gloved_hand,2,bite_resistant,coverall\n", civil(s+d), i } }' > handling.csv

wc -l ./*.csv | tail -1
du -sh .
(cd "$top" && go build -o "$dir/../welfare" ./cmd/welfare)
to=$(awk -v s="$start" -v days="$days" "$civil"'BEGIN{print civil(s+days-1)}')
for cmd in "validate ." "check --from 2025-07-01 --to $to --fail-on never --json $dir/../findings.json ."; do
  echo "== welfare $cmd"
  /usr/bin/time -f "wall %e s, peak memory %M KB" "$dir/../welfare" $cmd > "$dir/../out.txt" || true
  tail -3 "$dir/../out.txt"
done
