#!/usr/bin/env bash
# Speed benchmarks: every bench/*.bench.ts, each comparing against a baseline
# (numpy through python3, or plain PostgreSQL) measured in the same run, printing ratios.
set -euo pipefail
cd "$(dirname "$0")/.."
[ -d node_modules ] || npm ci --no-audit --no-fund
status=0
for file in bench/*.bench.ts; do
  [ -e "$file" ] || continue
  echo "== $file"
  node --import tsx "$file" || status=1
done
exit $status
