#!/usr/bin/env bash
# npm run dev: like npm start, but the client is served by Vite with hot reload.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/lib/bootstrap.sh
ensure_node_modules
[ -n "${DATABASE_URL:-}" ] || ensure_postgres_binaries
exec node --import tsx scripts/start.ts --dev
