#!/usr/bin/env bash
# npm start: install what is missing, then run PostgreSQL, the mail stand-in and the app.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/lib/bootstrap.sh
ensure_node_modules
[ -n "${DATABASE_URL:-}" ] || ensure_postgres_binaries
exec node --import tsx scripts/start.ts
