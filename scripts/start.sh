#!/usr/bin/env bash
# npm start: the product with its demo data on http://127.0.0.1:3000 (PORT overridable).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/local-env.sh"
cd "$ROOT"

ensure_node_modules
bash scripts/pg.sh start
export DATABASE_URL="${DATABASE_URL:-$(bash scripts/pg.sh url)}"
npx tsx db/migrate.ts
# the services first: the demo's dyno runs and photos go to the local object store
start_local_services
npx tsx db/seed.ts --if-empty
npx tsx db/seed/auth.ts

echo "build: building the app…"
npx react-router build >"$TW_DATA_DIR/log/build.log" 2>&1 || { tail -30 "$TW_DATA_DIR/log/build.log"; exit 1; }

export PORT="${PORT:-3000}" HOST="${HOST:-127.0.0.1}" NODE_ENV=production
export APP_URL="${APP_URL:-http://$HOST:$PORT}"
stop_pidfile "$TW_RUN_DIR/app.pid" "the previous app server"
setsid node scripts/serve.mjs build/server/index.js </dev/null >"$TW_DATA_DIR/log/app.log" 2>&1 &
echo $! >"$TW_RUN_DIR/app.pid"
for _ in $(seq 1 100); do
  if curl -fsS "http://$HOST:$PORT/healthz" >/dev/null 2>&1; then break; fi
  if ! kill -0 "$(cat "$TW_RUN_DIR/app.pid")" 2>/dev/null; then
    echo "app: failed to start; see $TW_DATA_DIR/log/app.log" >&2; tail -20 "$TW_DATA_DIR/log/app.log" >&2; exit 1
  fi
  sleep 0.2
done
npx tsx scripts/print-demo.ts || true
echo ""
echo "Torquewright is running at $APP_URL"
echo "  database: $DATABASE_URL"
echo "  logs:     $TW_DATA_DIR/log/"
echo "  stop everything with: npm run stop"
