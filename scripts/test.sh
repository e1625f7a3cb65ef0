#!/usr/bin/env bash
# npm test: install what a fresh machine lacks (npm packages; Debian's PostgreSQL, Chromium,
# ngspice and poppler-utils (pdftotext, for the report checks) only when missing), then run every check against a throwaway database.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/lib/bootstrap.sh
ensure_node_modules
ensure_postgres_binaries
missing=()
command -v chromium >/dev/null 2>&1 || missing+=(chromium)
command -v ngspice >/dev/null 2>&1 || missing+=(ngspice)
command -v pdftotext >/dev/null 2>&1 || missing+=(poppler-utils)
[ ${#missing[@]} -eq 0 ] || apt_install "${missing[@]}"
exec node --import tsx scripts/run-tests.ts "$@"
