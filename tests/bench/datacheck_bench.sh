#!/usr/bin/env bash
# Data check benchmark side by side with wc -l, a plain byte loop and sqlite3 .import
# (figures printed, not asserted). The machine load is printed before and after: on a
# shared machine the figures are only comparable within one run.
#   tests/bench/datacheck_bench.sh BENCH_BINARY [RECORDS] [DIR]   (default 450000 records x 300 items)
set -euo pipefail
bench=$1; records=${2:-450000}; dir=${3:-$(mktemp -d)}
[ -f "$dir/bench.csv" ] || "$bench" generate "$dir" "$records" 300
ls -l "$dir/bench.csv"
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg), $(nproc) cores"
cat "$dir/bench.csv" > /dev/null # into the page cache, for every contender alike
echo "wc -l:";            /usr/bin/time -f "%e s, peak %M KB" wc -l "$dir/bench.csv"
echo "byte loop:";        /usr/bin/time -f "%e s, peak %M KB" "$bench" loop "$dir"
echo "sqlite3 .import:";  /usr/bin/time -f "%e s, peak %M KB" sqlite3 :memory: -cmd '.mode csv' ".import $dir/bench.csv t" 'select count(*) from t'
echo "data check, 1 thread:";   /usr/bin/time -f "%e s wall, %U s user, peak %M KB" "$bench" run "$dir" 1
echo "data check, all cores:";  /usr/bin/time -f "%e s wall, %U s user, peak %M KB" "$bench" run "$dir"
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
