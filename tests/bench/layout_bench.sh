#!/bin/sh
# Route-map layout vs Graphviz dot (see layout_bench.cpp). Not a ctest test.
# Usage: tests/bench/layout_bench.sh [BUILD_DIR] [OPTIONS] [SIZES...]
#   BUILD_DIR: a configured build directory (default: build-bench, created as Release)
#   OPTIONS: --no-dot (ours only), --keep-dot DIR (leave the DOT files there),
#            --max-skip K (skips 2..K items ahead; default 25)
#   SIZES: items per generated instrument (default 200 1000 3000; dot needs
#          minutes at 3,000 on a loaded machine)
# Needs: graphviz (dot), pkg-config, the Qt 6 / yaml-cpp / sqlite dev packages.
set -eu
root=$(cd "$(dirname "$0")/../.." && pwd)
build=${1:-$root/build-bench}
[ $# -gt 0 ] && shift
if [ ! -f "$build/CMakeCache.txt" ]; then
    cmake -S "$root" -B "$build" -G "Unix Makefiles" -DCMAKE_BUILD_TYPE=Release -DBUILD_TESTING=OFF
fi
cmake --build "$build" --target routebook_model -j2
exe="$build/layout_bench"
# shellcheck disable=SC2046
g++ -std=c++20 -O2 -fPIC -DQT_NO_CAST_FROM_ASCII -I"$root/model" \
    $(pkg-config --cflags Qt6Core Qt6Gui) \
    "$root/tests/bench/layout_bench.cpp" "$build/model/libroutebook_model.a" \
    -lyaml-cpp -lsqlite3 $(pkg-config --libs Qt6Core Qt6Gui) -o "$exe"
"$exe" "$@"
