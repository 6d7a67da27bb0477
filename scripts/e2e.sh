#!/usr/bin/env bash
# Production build + a fresh e2e database + Playwright in Debian's Chromium. Extra arguments go
# to Playwright (e.g. a spec file). One run at a time per machine: the build folder and the
# e2e port are shared, so runs queue on a lock.
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/setup.sh >/dev/null
exec 9>/tmp/platewright-e2e.lock
flock 9
export DB_NAME=${DB_E2E_NAME:-platewright_e2e}
node_modules/.bin/next build
bash scripts/db.sh sql -e "DROP DATABASE IF EXISTS \`$DB_NAME\`"
bash scripts/db.sh start >/dev/null
node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx db/seed.ts
node_modules/.bin/playwright test "$@"
