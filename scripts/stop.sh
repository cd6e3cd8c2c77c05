#!/usr/bin/env bash
# npm run stop: stops what npm start started (app server, local services, PostgreSQL).
set -uo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/local-env.sh"
cd "$ROOT"
stop_pidfile "$TW_RUN_DIR/app.pid" "the app server"
stop_pidfile "$TW_RUN_DIR/services.pid" "the local services"
bash scripts/pg.sh stop
