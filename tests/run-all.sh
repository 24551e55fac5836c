#!/usr/bin/env bash
# `npm test`: everything, in order — production client build (the e2e tests serve it), client unit
# tests, server unit + API integration tests, end-to-end tests in Debian Chromium. Fails loudly (never
# skips) when Chromium is missing. Ends with one "N passed, N failed" line over all suites.
set -uo pipefail
cd "$(dirname "$0")/.."

CHROMIUM="${CHROMIUM_PATH:-/usr/bin/chromium}"
if [ ! -x "$CHROMIUM" ]; then
  echo "ERROR: the end-to-end tests need Debian's Chromium at $CHROMIUM." >&2
  echo "       Install it with: sudo apt-get install -y chromium   (or set CHROMIUM_PATH)" >&2
  exit 1
fi

LOGDIR="$(mktemp -d)"
status=0
run() {
  local name="$1"; shift
  echo "=== $name: $*"
  "$@" 2>&1 | tee "$LOGDIR/$name.log"
  local rc=${PIPESTATUS[0]}
  if [ "$rc" -ne 0 ]; then echo "=== $name FAILED (exit $rc)"; status=1; fi
  return 0
}

run build npm run --silent build
if [ "$status" -ne 0 ]; then echo "0 passed, 1 failed"; exit 1; fi
run client npm run --silent test:client
run server npm run --silent test:server
run e2e npm run --silent test:e2e

node tests/summarise.mjs "$LOGDIR"/client.log "$LOGDIR"/server.log "$LOGDIR"/e2e.log || status=1
exit $status
