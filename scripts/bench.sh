#!/usr/bin/env bash
# Runs every benchmark in turn. Benchmarks print figures and ratios; they are not tests.
set -euo pipefail
cd "$(dirname "$0")/.."
for b in bench:mesh bench:orient bench:plan; do
  echo "== npm run $b"
  npm run -s "$b"
done
