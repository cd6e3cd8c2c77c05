#!/usr/bin/env bash
# npm test: from a fresh clone, installs what is missing, starts what the tests need,
# runs typecheck, Vitest (unit + integration on a fresh test database), the build and
# Playwright in Chromium, stops what it started, and ends with
# "N passed, N failed, N flaky, N skipped".
set -uo pipefail
# The tests run their own local services on their own ports, beside a running demo.
export TW_SMTP_PORT="${TW_TEST_SMTP_PORT:-2626}" TW_MAIL_API_PORT="${TW_TEST_MAIL_API_PORT:-2627}"
export TW_S3_PORT="${TW_TEST_S3_PORT:-2628}"
export TW_PAY_PORT="${TW_TEST_PAY_PORT:-2629}"
export TW_PAY_WEBHOOK_URL="http://127.0.0.1:${E2E_PORT:-3100}/api/webhooks/payments"
source "$(dirname "${BASH_SOURCE[0]}")/local-env.sh"
# the test object store starts empty each run (its objects belong to the dropped test databases)
export TW_S3_DIR="$TW_DATA_DIR/s3-test"; rm -rf "$TW_S3_DIR"
export TW_RUN_DIR="$TW_DATA_DIR/run-test"; mkdir -p "$TW_RUN_DIR"
cd "$ROOT"
RESULTS="$TW_DATA_DIR/test-results"
rm -rf "$RESULTS"; mkdir -p "$RESULTS"
started_pg=0
status=0

cleanup() {
  stop_pidfile "$TW_RUN_DIR/services.pid" "the test services" >/dev/null
  if [ "$started_pg" = 1 ]; then bash scripts/pg.sh stop; fi
}
trap cleanup EXIT

ensure_node_modules || exit 1
if [ ! -x /usr/bin/chromium ] && [ -z "${CHROMIUM_PATH:-}" ]; then
  echo "setup: installing Debian's chromium…"
  (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium) >"$TW_DATA_DIR/log/chromium-install.log" 2>&1 \
    || { echo "setup: could not install chromium; see $TW_DATA_DIR/log/chromium-install.log"; exit 1; }
fi

if [ -z "${DATABASE_URL:-}" ]; then
  if ! bash scripts/pg.sh status; then started_pg=1; fi
  bash scripts/pg.sh start || exit 1
  BASE_URL="$(bash scripts/pg.sh url)"
else
  BASE_URL="$DATABASE_URL"
fi
export TEST_DATABASE_URL="$(node -e 'const u=new URL(process.argv[1]);u.pathname="/torquewright_test";console.log(u.toString())' "$BASE_URL")"
export E2E_DATABASE_URL="$(node -e 'const u=new URL(process.argv[1]);u.pathname="/torquewright_e2e";console.log(u.toString())' "$BASE_URL")"
unset DATABASE_URL
start_local_services || exit 1

step() { echo ""; echo "== $1"; }
LOG="$TW_DATA_DIR/log"; mkdir -p "$LOG"

# For focused runs while developing (CI sets none of these):
#   TW_SKIP_STATIC=1           skip typecheck and lint
#   VITEST_ARGS="files…"       run only these Vitest files ("skip" skips Vitest)
#   PLAYWRIGHT_ARGS="files…"   run only these Playwright files ("skip" skips the build and e2e)
#   TW_TEST_SERIAL=1           run the steps one after another even with cores to spare

# Typecheck, lint and the build need no database: with two cores or more they run in the
# background while Vitest runs, one after another (typecheck and build both write
# .react-router/), and their output is shown once they are done.
static_and_build() {
  local rc=0
  if [ -z "${TW_SKIP_STATIC:-}" ]; then
    echo "== typecheck"
    if ! npm run -s typecheck; then echo "typecheck failed"; rc=1; fi
    echo "== lint and format"
    if ! npx eslint . || ! npx prettier --check . >/dev/null; then
      npx prettier --check . 2>&1 | tail -20; echo "lint or format failed"; rc=1
    fi
  fi
  if [ "${PLAYWRIGHT_ARGS:-}" != "skip" ]; then
    echo "== build"
    if ! npx react-router build >"$LOG/build-test.log" 2>&1; then
      tail -40 "$LOG/build-test.log"; echo "build failed"; rc=2
    fi
  fi
  return $rc
}

bg_pid=""
started_at=$SECONDS
if [ "$(nproc 2>/dev/null || echo 1)" -ge 2 ] && [ -z "${TW_TEST_SERIAL:-}" ]; then
  static_and_build >"$LOG/static-build-test.log" 2>&1 &
  bg_pid=$!
else
  static_and_build; bg_rc=$?
fi

step "vitest (unit and integration)"
if [ "${VITEST_ARGS:-}" != "skip" ]; then
# shellcheck disable=SC2086
npx vitest run ${VITEST_ARGS:-} --reporter=default --reporter=json --outputFile.json="$RESULTS/vitest.json" || status=1
fi
echo "(vitest done at $((SECONDS - started_at)) s)"

if [ -n "$bg_pid" ]; then
  wait "$bg_pid"; bg_rc=$?
  echo ""; cat "$LOG/static-build-test.log"
  echo "(typecheck, lint and build done at $((SECONDS - started_at)) s)"
fi
[ "$bg_rc" != 0 ] && status=1

#   FAULTS_ARGS="all" or "files…"   also run the fault tests (tests/faults) after the e2e.
#                              They are not part of the default run until they follow the
#                              working copy's version counter (see DEVELOPERS.md, "Fault tests").
FAULTS_ARGS="${FAULTS_ARGS:-skip}"
[ "$FAULTS_ARGS" = "all" ] && FAULTS_ARGS=""
if [ "${PLAYWRIGHT_ARGS:-}" = "skip" ] && [ "$FAULTS_ARGS" = "skip" ]; then :
elif [ "$bg_rc" = 2 ]; then echo "playwright and fault tests: not run, the build failed"
elif [ "${PLAYWRIGHT_ARGS:-}" = "skip" ] && step "build" && ! npx react-router build >"$LOG/build-test.log" 2>&1; then
  tail -40 "$LOG/build-test.log"; echo "build failed"; status=1
else
  if [ "${PLAYWRIGHT_ARGS:-}" != "skip" ]; then
  step "playwright (e2e in Chromium)"
  DATABASE_URL="$E2E_DATABASE_URL" npx tsx db/reset.ts && DATABASE_URL="$E2E_DATABASE_URL" npx tsx db/seed.ts || status=1
  # shellcheck disable=SC2086
  npx playwright test ${PLAYWRIGHT_ARGS:-} || status=1
  echo "(playwright done at $((SECONDS - started_at)) s)"
  fi
  if [ "$FAULTS_ARGS" != "skip" ]; then
  # the built server and a PostgreSQL cluster of their own (TW_FAULT_PG_PORT, else a free port)
  step "faults (database restart, killed server, headers, fresh clone)"
  # shellcheck disable=SC2086
  npx vitest run --config vitest.faults.config.ts ${FAULTS_ARGS:-} --reporter=default --reporter=json --outputFile.json="$RESULTS/vitest-faults.json" || status=1
  echo "(faults done at $((SECONDS - started_at)) s)"
  fi
fi

echo ""
# the summary exits non-zero when a test was skipped without a reason (listed on stderr)
summary=$(node scripts/test-summary.mjs "$RESULTS") || status=1
if [ "$status" != 0 ] && [ "$(echo "$summary" | sed -E 's/.* ([0-9]+) failed.*/\1/')" = "0" ]; then
  # a failure outside any test (typecheck, build, a crashed runner, a skip) still counts
  summary=$(echo "$summary" | sed -E 's/ 0 failed,/ 1 failed,/')
fi
# stop what we started first, so the summary is the very last line
trap - EXIT
cleanup
echo "$summary"
exit $status
