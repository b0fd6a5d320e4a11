#!/usr/bin/env bash
# The whole proof, as CI runs it: installs what is missing, builds once (debug profile),
# runs every cargo test suite (calc, api, e2e with real Chromium) and schemathesis against a
# real server. Any missing tool, failing suite or skipped test makes it exit non-zero.
set -euo pipefail

cd "$(dirname "$0")/.."
ROOT=$(pwd)
START=$(date +%s)
TARGET="${CARGO_TARGET_DIR:-$ROOT/target}"
VENV="$TARGET/schemathesis-venv"
ARTIFACTS="$TARGET/e2e-artifacts"
SCHEMATHESIS_TIME=${SCHEMATHESIS_TIME:-480}

say() { printf '\n==> [%4ss] %s\n' "$(( $(date +%s) - START ))" "$*"; }
die() { printf '\nFAIL: %s\n' "$*" >&2; exit 1; }
# A suite that fails is recorded and the run goes on, so one run shows every failure; the
# run still exits non-zero at the end.
FAILED=()
fail_later() { printf '\nFAIL: %s\n' "$*" >&2; FAILED+=("$*"); }

as_root() {
    if [ "$(id -u)" -eq 0 ]; then "$@"
    elif command -v sudo >/dev/null; then sudo "$@"
    else die "need root or sudo to run: $*"
    fi
}

# --- tools -----------------------------------------------------------------------------
say "checking tools"
command -v cargo >/dev/null || die "cargo is not installed"
command -v python3 >/dev/null || die "python3 is not installed"

if ! command -v chromium >/dev/null || ! command -v chromedriver >/dev/null; then
    say "installing Debian chromium and chromium-driver"
    as_root apt-get update -qq
    as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium chromium-driver
fi
command -v chromium >/dev/null || die "chromium is still missing after apt-get"
command -v chromedriver >/dev/null || die "chromedriver is still missing after apt-get"
chromium --version 2>/dev/null | grep -v 'unexpected operator' || true
chromedriver --version

if [ ! -x "$VENV/bin/schemathesis" ]; then
    say "installing schemathesis from PyPI into $VENV"
    if ! python3 -m venv "$VENV"; then
        say "installing Debian python3-venv"
        as_root apt-get update -qq
        as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq python3-venv
        rm -rf "$VENV"
        python3 -m venv "$VENV" || die "python3 -m venv still fails"
    fi
    "$VENV/bin/pip" install -q --upgrade pip
    # Pinned: the version these settings and the spec were checked with.
    "$VENV/bin/pip" install -q "schemathesis==4.32.5"
fi
"$VENV/bin/schemathesis" --version || die "schemathesis does not run"

# --- cargo test suites -----------------------------------------------------------------
say "building (debug profile, one build for every suite)"
cargo build --bins --tests

say "running every cargo test suite"
rm -rf "$ARTIFACTS"
TEST_LOG="$TARGET/run-all-cargo-test.log"
set +e
cargo test --no-fail-fast 2>&1 | tee "$TEST_LOG"
CARGO_STATUS=${PIPESTATUS[0]}
set -e
[ "$CARGO_STATUS" -eq 0 ] || fail_later "cargo test failed (see above and $TEST_LOG)"

# Nothing silently skipped: every suite ran tests and none was ignored or filtered out.
for suite in calc api e2e; do
    grep -q "Running tests/$suite/main.rs" "$TEST_LOG" || fail_later "suite $suite did not run"
done
if grep -E '^test result:' "$TEST_LOG" | grep -vE ' 0 ignored; 0 measured; 0 filtered out' ; then
    fail_later "some tests were ignored or filtered out (lines above); run them or remove them"
fi
awk '/Running tests\//{suite=$2} /^test result:/{ if (suite != "" && $4 == "0") { print "suite " suite " ran zero tests"; bad=1 } suite="" } END{exit bad}' "$TEST_LOG" \
    || fail_later "a test suite ran zero tests"
ls "$ARTIFACTS"/*/*.png >/dev/null 2>&1 || fail_later "the browser suite left no screenshots in $ARTIFACTS"

# --- benchmark smoke: every bench phase runs against a small fleet; timings are not judged ---
say "benchmark smoke mode (seconds; timings are never asserted)"
cargo test --bench loadhold-bench -- --smoke || fail_later "the benchmark's smoke run failed"

# GET a URL with Python's standard library (no curl on a bare Debian): fetch URL [OUT]
fetch() {
    python3 - "$@" <<'PY'
import sys, urllib.request
try:
    body = urllib.request.urlopen(sys.argv[1], timeout=5).read()
except Exception as error:
    sys.exit(f"{sys.argv[1]}: {error}")
if len(sys.argv) > 2:
    open(sys.argv[2], "wb").write(body)
PY
}

# --- schemathesis against a real server ------------------------------------------------
say "schemathesis against a real server (${SCHEMATHESIS_TIME}s budget)"
WORK=$(mktemp -d)
SERVER_PID=""
cleanup() {
    if [ -n "$SERVER_PID" ]; then kill "$SERVER_PID" 2>/dev/null || true; wait "$SERVER_PID" 2>/dev/null || true; fi
    rm -rf "$WORK"
}
trap cleanup EXIT
BIN="$TARGET/debug/loadhold"
DB="$WORK/schemathesis.sqlite"
PORT=$(python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1",0)); print(s.getsockname()[1])')
"$BIN" seed-demo --db "$DB" >"$WORK/seed.log" 2>&1 || { cat "$WORK/seed.log"; die "seed-demo failed"; }
# An admin's bearer token, so that protected routes are exercised, not just refused.
TOKEN=$("$BIN" token create schemathesis --role admin --db "$DB" 2>/dev/null | tail -1) \
    || die "loadhold token create failed"
[ "${#TOKEN}" -ge 20 ] || die "loadhold token create printed no token"
HEADERS=(-H "Authorization: Bearer $TOKEN")
mkdir -p "$ARTIFACTS"
LOADHOLD_LOG=warn "$BIN" serve --db "$DB" --addr "127.0.0.1:$PORT" >"$ARTIFACTS/schemathesis-server.log" 2>&1 &
SERVER_PID=$!
for _ in $(seq 1 200); do
    fetch "http://127.0.0.1:$PORT/healthz" 2>/dev/null && break
    kill -0 "$SERVER_PID" 2>/dev/null || die "the server exited (see $ARTIFACTS/schemathesis-server.log)"
    sleep 0.1
done
fetch "http://127.0.0.1:$PORT/healthz" || die "the server never became healthy"
fetch "http://127.0.0.1:$PORT/api/v1/openapi.json" "$ARTIFACTS/openapi.json" \
    || die "GET /api/v1/openapi.json failed"
# One worker: with two, hypothesis's source inspection broke under CPython 3.11 ("AST
# constructor recursion depth mismatch"). Concurrent writers are the e2e crash suite's job.
set +e
"$VENV/bin/schemathesis" --config-file "$ROOT/tests/schemathesis.toml" run "http://127.0.0.1:$PORT/api/v1/openapi.json" \
    --checks all --exclude-checks use_after_free \
    --max-time "$SCHEMATHESIS_TIME" --seed 7 --workers 1 \
    --report junit --report-dir "$ARTIFACTS/schemathesis" "${HEADERS[@]}"
SCHEMA_STATUS=$?
set -e
[ "$SCHEMA_STATUS" -eq 0 ] || fail_later "schemathesis found failures (report in $ARTIFACTS/schemathesis)"
if grep -q ' panicked at ' "$ARTIFACTS/schemathesis-server.log"; then
    fail_later "the server panicked during schemathesis (see $ARTIFACTS/schemathesis-server.log)"
fi

if [ "${#FAILED[@]}" -gt 0 ]; then
    say "FAILED: ${#FAILED[@]} problem(s)"
    printf '  - %s\n' "${FAILED[@]}" >&2
    exit 1
fi
say "all suites passed"
