#!/usr/bin/env bash
# The survey split into shards and merged gives the whole survey's bytes, for N = 1, 2, 3 and
# 7 and every report format; then the same with the shards run by GNU parallel (Debian
# package `parallel`, installed by .ci/setup), as docs/survey.md shows. Fails, never skips,
# when parallel is missing.
#
#   tests/survey/shards.sh LIMITLINE SOURCE_DIR WORK_DIR
# Weather: tests/data/greensboro-nc-tmy3.csv and pvgis-tmy-45n-8e.csv (open data sets, see
# tests/data/SOURCES.md); the manifest rows and the unit are examples/ (invented scenarios).
set -euo pipefail
exe=$1 src=$2 work=$3
rm -rf "$work" && mkdir -p "$work" && cd "$work"
export LIMITLINE_DATA_DIR="$src/data"

# Nine sites: the two real years under several zones, codes and elevations, and one row whose
# weather file is missing (a failed site must survive sharding too).
g=$src/tests/data/greensboro-nc-tmy3.csv p=$src/tests/data/pvgis-tmy-45n-8e.csv
cat > sites.csv <<CSV
site,weather,elevation,energy_code,climate_zone
A,$g,273m,ashrae-90.1-2019,4A
B,$p,250m,ashrae-90.1-2019,4A
C,$g,900ft,iecc-2021,3A
D,$p,,ashrae-90.1-2016,5A
E,missing.csv,,ashrae-90.1-2019,4A
F,$g,1500m,ashrae-90.1-2019,5B
G,$p,250m,,
H,$g,273m,ashrae-90.1-2019,2A
I,$p,250m,iecc-2021,4A
CSV
unit=$src/examples/survey-office.toml
status=0

for f in text json csv html; do
  "$exe" survey sites.csv "$unit" --format "$f" -o "whole.$f" || [[ $? == 2 ]]
done
"$exe" survey sites.csv "$unit" --format csv --table sites -o whole-sites.csv || [[ $? == 2 ]]
grep -q "E (missing.csv): " whole.text || { echo "FAIL: the missing file is not listed"; status=1; }
xmllint --noout whole.html || { echo "FAIL: the HTML is not well-formed"; status=1; }

for n in 1 2 3 7; do
  for k in $(seq 1 "$n"); do "$exe" survey sites.csv "$unit" --shard "$k/$n" -o "p$n-$k.jsonl"; done
  for f in text json csv html; do
    "$exe" merge p$n-*.jsonl --format "$f" -o "merged$n.$f" || [[ $? == 2 ]]
    cmp "whole.$f" "merged$n.$f" || { echo "FAIL: N=$n $f differs"; status=1; }
  done
  "$exe" merge p$n-*.jsonl --format csv --table sites -o "merged$n-sites.csv" || [[ $? == 2 ]]
  cmp whole-sites.csv "merged$n-sites.csv" || { echo "FAIL: N=$n sites csv differs"; status=1; }
done

# GNU parallel on this machine: three shards, two at a time, then the merge.
command -v parallel >/dev/null || { echo "FAIL: GNU parallel is not installed (bash .ci/setup)"; exit 1; }
parallel --will-cite --halt now,fail=1 -j2 \
  "$exe" survey sites.csv "$unit" --shard {}/3 -o gp-{}.jsonl ::: 1 2 3
"$exe" merge gp-*.jsonl --format json -o gp.json || [[ $? == 2 ]]
cmp whole.json gp.json || { echo "FAIL: the GNU parallel run differs"; status=1; }

[[ $status == 0 ]] && echo "survey shards: N = 1, 2, 3, 7 and GNU parallel merged byte for byte"
exit $status
