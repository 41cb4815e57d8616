#!/usr/bin/env bash
# Sets up, builds and opens the editor on a sample project. Without a display
# it runs the headless main job on the same project instead.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
sample="sample_projects/household-energy.yaml"
bin="build/app/routebook"
if [ -n "${DISPLAY:-}" ] || [ -n "${WAYLAND_DISPLAY:-}" ]; then
  exec "$bin" "$sample"
fi
echo "No display: running the headless checks on $sample"
echo "== routebook check $sample"
"$bin" check "$sample" || true
if "$bin" gates "$sample" >/dev/null 2>&1; then
  echo "== routebook gates $sample"
  "$bin" gates "$sample"
fi
out="${TMPDIR:-/tmp}/household-energy-dictionary.html"
"$bin" export "$sample" --format html -o "$out"
echo "== data dictionary written to $out"
