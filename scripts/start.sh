#!/usr/bin/env bash
# npm start: set everything up on a fresh machine, then build and serve with demo data.
# npm run dev: the same with `next dev`.
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/setup.sh

export PORT=${PORT:-3000}
export NEXTAUTH_URL=${NEXTAUTH_URL:-http://localhost:$PORT}

node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx db/seed.ts

print_accounts() {
  echo
  echo "Platewright demo accounts (invented workshop: Kettle Lane Workshop)"
  node_modules/.bin/tsx -e 'import("./db/seed-data.ts").then(({ demoUsers }) => { for (const u of demoUsers) console.log(`  ${u.role.padEnd(9)} ${u.email.padEnd(28)} ${u.password}`); })'
  echo
  echo "Open $NEXTAUTH_URL"
  echo
}

if [ "${1:-}" = "--dev" ]; then
  print_accounts
  exec node_modules/.bin/next dev -p "$PORT"
fi

node_modules/.bin/next build
print_accounts
exec node_modules/.bin/next start -p "$PORT" ${APP_HOST:+-H "$APP_HOST"}
