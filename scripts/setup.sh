#!/usr/bin/env bash
# Shared set-up for `npm start`, `npm run dev` and `npm test`: dependencies, secrets, database.
# Sourced, not run: it exports the environment the callers use.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

export NEXT_TELEMETRY_DISABLED=1
[ -f .env ] && set -a && . ./.env && set +a

export DB_PORT=${DB_PORT:-3307}
export DB_HOST=${DB_HOST:-127.0.0.1}
export DB_USER=${DB_USER:-app}
export DB_PASSWORD=${DB_PASSWORD:-platewright-dev}
export DB_NAME=${DB_NAME:-platewright}

# Dependencies: `npm ci` when node_modules is missing or older than the lock file.
lock_hash=$(sha256sum package-lock.json | cut -d' ' -f1)
if [ ! -f node_modules/.pw-lock-hash ] || [ "$(cat node_modules/.pw-lock-hash)" != "$lock_hash" ]; then
  echo "setup: installing dependencies (npm ci)…"
  npm ci --no-audit --no-fund --loglevel=error
  echo "$lock_hash" > node_modules/.pw-lock-hash
fi

# A signing secret for sessions, made once per checkout and kept out of git.
mkdir -p .data
if [ -z "${NEXTAUTH_SECRET:-}" ]; then
  # Readable by its owner only (0600), also when it was made before this rule.
  [ -s .data/nextauth-secret ] || (umask 077 && node -e 'process.stdout.write(require("crypto").randomBytes(32).toString("base64url"))' > .data/nextauth-secret)
  chmod 600 .data/nextauth-secret
  NEXTAUTH_SECRET=$(cat .data/nextauth-secret)
  export NEXTAUTH_SECRET
fi

bash scripts/db.sh start
if [ "${MAIL_MODE:-fake}" = fake ] || [ "${PAYMENTS_MODE:-fake}" = fake ]; then bash scripts/fakes.sh start; fi
