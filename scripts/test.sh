#!/usr/bin/env bash
# Sets up, builds and runs every test (the long fuzz/kill runs are behind the
# "long" label and stay out of this run).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
QT_QPA_PLATFORM=offscreen ctest --preset default --label-exclude long
