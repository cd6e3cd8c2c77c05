# Sourced by start.sh and test.sh: the environment of the local default.
# Anything already set in the environment wins.
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export TW_DATA_DIR="${TW_DATA_DIR:-$ROOT/.data}"
export TW_RUN_DIR="$TW_DATA_DIR/run"
mkdir -p "$TW_RUN_DIR" "$TW_DATA_DIR/log"

# Generated once per data folder, never committed.
if [ -z "${SESSION_SECRET:-}" ]; then
  if [ ! -s "$TW_DATA_DIR/session-secret" ]; then
    (umask 077; node -e 'process.stdout.write(require("crypto").randomBytes(32).toString("hex"))' > "$TW_DATA_DIR/session-secret")
  fi
  SESSION_SECRET="$(cat "$TW_DATA_DIR/session-secret")"
  export SESSION_SECRET
fi

# Local fakes of the hosted services, on loopback (scripts/local-services.ts).
export TW_SMTP_PORT="${TW_SMTP_PORT:-2526}"
export TW_MAIL_API_PORT="${TW_MAIL_API_PORT:-2527}"
export TW_S3_PORT="${TW_S3_PORT:-2528}"
export TW_S3_DIR="${TW_S3_DIR:-$TW_DATA_DIR/s3}"

# The S3 SDK is pinned to a release that still supports Node 20 (see STACK.md); its notice
# about later releases is known.
export AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED="${AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED:-true}"
# Uploads go to the local object store unless S3_ENDPOINT names a real one.
if [ -z "${S3_ENDPOINT:-}" ]; then
  export S3_ENDPOINT="http://127.0.0.1:$TW_S3_PORT"
fi

# Mail goes to the local catcher (and /dev/outbox shows it) unless SMTP_URL names a real server.
if [ -z "${SMTP_URL:-}" ]; then
  export SMTP_URL="smtp://127.0.0.1:$TW_SMTP_PORT"
  export LOCAL_MAIL_API_URL="${LOCAL_MAIL_API_URL:-http://127.0.0.1:$TW_MAIL_API_PORT}"
fi

# The payment service: the local fake (scripts/services/payment-fake.ts) unless
# STRIPE_SECRET_KEY names a real account (then STRIPE_API_URL stays unset).
export TW_PAY_PORT="${TW_PAY_PORT:-2529}"
if [ -z "${STRIPE_SECRET_KEY:-}" ]; then
  export STRIPE_SECRET_KEY="sk_test_local"
  export STRIPE_API_URL="${STRIPE_API_URL:-http://127.0.0.1:$TW_PAY_PORT}"
  if [ -z "${STRIPE_WEBHOOK_SECRET:-}" ]; then
    if [ ! -s "$TW_DATA_DIR/payment-webhook-secret" ]; then
      (umask 077; node -e 'process.stdout.write("whsec_"+require("crypto").randomBytes(24).toString("hex"))' > "$TW_DATA_DIR/payment-webhook-secret")
    fi
    STRIPE_WEBHOOK_SECRET="$(cat "$TW_DATA_DIR/payment-webhook-secret")"
    export STRIPE_WEBHOOK_SECRET
  fi
  export TW_PAY_WEBHOOK_URL="${TW_PAY_WEBHOOK_URL:-http://127.0.0.1:${PORT:-3000}/api/webhooks/payments}"
fi

ensure_node_modules() {
  if [ ! -d "$ROOT/node_modules" ] || [ "$ROOT/package-lock.json" -nt "$ROOT/node_modules/.package-lock.json" ]; then
    echo "setup: installing npm packages (npm ci)…"
    (cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error)
  fi
}

# Starts the local service fakes in the background unless they already run.
start_local_services() {
  local pidfile="$TW_RUN_DIR/services.pid"
  if [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null; then
    echo "services: reusing local services (pid $(cat "$pidfile"))"
    return 0
  fi
  rm -f "$TW_RUN_DIR/services.ready"
  # setsid: the services outlive this script and hold none of its pipes
  setsid node --import tsx "$ROOT/scripts/local-services.ts" </dev/null >"$TW_DATA_DIR/log/services.log" 2>&1 &
  echo $! >"$pidfile"
  for _ in $(seq 1 100); do
    [ -f "$TW_RUN_DIR/services.ready" ] && break
    if ! kill -0 "$(cat "$pidfile")" 2>/dev/null; then
      echo "services: failed to start; see $TW_DATA_DIR/log/services.log" >&2
      tail -20 "$TW_DATA_DIR/log/services.log" >&2
      return 1
    fi
    sleep 0.1
  done
  cat "$TW_RUN_DIR/services.ready"
}

stop_pidfile() {
  local pidfile="$1" what="$2"
  if [ -f "$pidfile" ]; then
    local pid; pid=$(cat "$pidfile")
    if kill -0 "$pid" 2>/dev/null; then
      kill "$pid" 2>/dev/null || true
      for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
      kill -9 "$pid" 2>/dev/null || true
      echo "stop: stopped $what (pid $pid)"
    fi
    rm -f "$pidfile"
  fi
}
