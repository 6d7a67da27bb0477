#!/usr/bin/env bash
# npm test: set-up, then type-check, lint, unit and integration tests, a production build and
# the end-to-end tests in Debian's Chromium. Exits non-zero on the first failure.
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/setup.sh

step() { printf '\n== %s\n' "$*"; }

if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = 0 ]; then
    step "installing Debian's chromium for the end-to-end tests"
    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  else
    echo "test: /usr/bin/chromium is missing; as root run: apt-get install -y chromium" >&2; exit 1
  fi
fi

# The 3MF Consortium's reference library, a second 3MF reader in tests/unit/mesh/lib3mf.test.ts
# (skipped, with a message, where it is missing).
if [ ! -f /usr/include/lib3mf/Model/COM/NMR_DLLInterfaces.h ] || ! command -v g++ >/dev/null; then
  if [ "$(id -u)" = 0 ]; then
    step "installing Debian's lib3mf-dev and g++ for the 3MF cross-check"
    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq lib3mf-dev g++ >/dev/null
  else
    echo "test: lib3mf-dev or g++ is missing (as root: apt-get install -y lib3mf-dev g++); the lib3mf cross-check will be skipped" >&2
  fi
fi

step "type-check"
node_modules/.bin/tsc --noEmit -p .
step "lint"
node_modules/.bin/eslint --max-warnings=0 .
step "unit tests"
node_modules/.bin/vitest run --project unit
step "integration tests (MariaDB database ${DB_TEST_NAME:-platewright_test})"
DB_NAME=${DB_TEST_NAME:-platewright_test} node_modules/.bin/vitest run --project integration
step "production build and end-to-end tests (Chromium)"
bash scripts/e2e.sh
