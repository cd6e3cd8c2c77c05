#!/usr/bin/env bash
# npm run db:migrate | db:reset | db:seed — on DATABASE_URL, or the local default database.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
if [ -z "${DATABASE_URL:-}" ]; then
  bash scripts/pg.sh start
  export DATABASE_URL="$(bash scripts/pg.sh url)"
fi
case "${1:-}" in
  migrate) npx tsx db/migrate.ts "${2:-}" ;;
  reset) npx tsx db/reset.ts && npx tsx db/seed.ts ;;
  seed) npx tsx db/seed.ts ;;
  *) echo "usage: scripts/db.sh migrate [down]|reset|seed" >&2; exit 2 ;;
esac
