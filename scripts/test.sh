#!/usr/bin/env bash
# npm test: type-check, lint, unit + integration tests, production build, end-to-end tests.
# Installs Debian's chromium (and poppler-utils for PDF checks) first when missing; Playwright
# never downloads a browser here.
set -euo pipefail
cd "$(dirname "$0")/.."

need=()
[ -x /usr/bin/chromium ] || need+=(chromium)
command -v pdftoppm >/dev/null 2>&1 || need+=(poppler-utils)
if [ ${#need[@]} -gt 0 ]; then
  echo "== installing ${need[*]} from Debian"
  SUDO=""; [ "$(id -u)" -eq 0 ] || SUDO="sudo"
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${need[@]}" >/dev/null
fi

export NEXT_TELEMETRY_DISABLED=1
start=$(date +%s)
step() { echo; echo "== $1 ($(( $(date +%s) - start )) s)"; }

step "type-check"
npx tsc --noEmit -p tsconfig.json
step "lint"
npx eslint . --max-warnings=0
step "unit and integration tests"
npx vitest run --config tests/vitest.config.ts
step "integration tests on PostgreSQL and the S3 fake"
# Starts (and installs when missing) a throwaway PostgreSQL server; see scripts/pg-test.ts.
npx tsx scripts/pg-test.ts
step "production build"
npx next build --webpack
step "end-to-end tests"
npx playwright test -c tests/e2e/playwright.config.ts
step "benchmark smoke"
NEXT_DIST_DIR=.next npx tsx tests/bench/run.ts --smoke --no-build
step "done"
