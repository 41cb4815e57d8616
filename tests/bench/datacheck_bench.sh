#!/usr/bin/env bash
# Data check benchmark side by side with wc -l and sqlite3 .import (figures printed, not asserted).
#   tests/bench/datacheck_bench.sh BENCH_BINARY [RECORDS] [DIR]   (default 450000 records x 300 items)
set -euo pipefail
bench=$1; records=${2:-450000}; dir=${3:-$(mktemp -d)}
"$bench" generate "$dir" "$records" 300
ls -l "$dir/bench.csv"
echo "wc -l:";            /usr/bin/time -f "%e s, peak %M KB" wc -l "$dir/bench.csv"
echo "sqlite3 .import:";  /usr/bin/time -f "%e s, peak %M KB" sqlite3 :memory: -cmd '.mode csv' ".import $dir/bench.csv t" 'select count(*) from t'
echo "data check:";       "$bench" run "$dir"
