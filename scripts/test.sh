#!/usr/bin/env bash
# Sets up, builds and runs every test (the long fuzz/kill runs are behind the
# "long" label and stay out of this run), then the same suite once more built
# with AddressSanitizer + UBSan (preset "sanitize"). ROUTEBOOK_SKIP_SANITIZE=1
# skips that second pass for a quick local run; CI never sets it.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
QT_QPA_PLATFORM=offscreen ctest --preset default --label-exclude long

if [ "${ROUTEBOOK_SKIP_SANITIZE:-0}" != 1 ]; then
  cmake --preset sanitize >/dev/null
  cmake --build --preset sanitize
  QT_QPA_PLATFORM=offscreen ctest --preset sanitize --label-exclude long
fi
