#!/bin/sh
# Runs every libFuzzer target for SECONDS seconds each and prints the number of
# executions and any crash found.
#   cmake --preset fuzz && cmake --build --preset fuzz
#   tests/fuzz/run.sh 600            # 10 minutes per target, one after another
# Environment: FUZZ_BUILD_DIR (default: build-fuzz in the repository),
#   FUZZ_TARGETS (default: "condition yaml csv csv_blocks project"), FUZZ_PARALLEL=1 runs
#   the targets at the same time.
# Seeds come from tests/fuzz/corpus/TARGET (read only); new inputs go to
# $FUZZ_BUILD_DIR/fuzz-corpus/TARGET, crashes to $FUZZ_BUILD_DIR/fuzz-artifacts/.
# A crash file becomes a regression test: add it to the seed corpus and a test
# in tests/reliability/ (see README there). Exit status 1 if any target crashed.
set -u
seconds=${1:?usage: run.sh SECONDS}
here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../.." && pwd)
build=${FUZZ_BUILD_DIR:-$root/build-fuzz}
targets=${FUZZ_TARGETS:-condition yaml csv csv_blocks project}
status=0

run_one() {
    t=$1
    exe="$build/tests/fuzz/fuzz_$t"
    if [ ! -x "$exe" ]; then
        echo "fuzz_$t: not built (expected $exe)" >&2
        return 2
    fi
    mkdir -p "$build/fuzz-corpus/$t" "$build/fuzz-artifacts"
    log="$build/fuzz-artifacts/$t.log"
    # -rss_limit_mb: bounded memory is part of the contract; -timeout: a single
    # input running 10 s counts as a hang.
    nice -n 19 "$exe" -max_total_time="$seconds" -rss_limit_mb=2048 -timeout=10 \
        -print_final_stats=1 -artifact_prefix="$build/fuzz-artifacts/$t-" \
        "$build/fuzz-corpus/$t" "$here/corpus/$t" >"$log" 2>&1
    rc=$?
    runs=$(grep -o 'stat::number_of_executed_units: *[0-9]*' "$log" | grep -o '[0-9]*$')
    crashes=$(ls "$build/fuzz-artifacts" 2>/dev/null | grep -c "^$t-" || true)
    echo "fuzz_$t: ${seconds}s, ${runs:-?} executions, exit $rc, $crashes artifact(s), log $log"
    return $rc
}

if [ "${FUZZ_PARALLEL:-0}" = 1 ]; then
    pids=""
    for t in $targets; do run_one "$t" & pids="$pids $!"; done
    for p in $pids; do wait "$p" || status=1; done
else
    for t in $targets; do run_one "$t" || status=1; done
fi
exit $status
