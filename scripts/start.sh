#!/usr/bin/env bash
# Start Thermotome with the demo lab on http://127.0.0.1:3000 (or $PORT):
# installs the packages, installs and starts a private PostgreSQL on loopback, migrates,
# seeds the demo lab on the first start, builds and serves.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

say() { printf '\n== %s\n' "$*"; }

bash scripts/ensure-packages.sh

say "Database"
# Two connections: the owner's (DATABASE_OWNER_URL) migrates and seeds; the app role's
# (DATABASE_URL) is all the server gets, so it cannot disable triggers or rewrite history.
if [[ -z "${DATABASE_URL:-}" ]]; then
  bash scripts/postgres.sh start
  DATABASE_OWNER_URL=$(bash scripts/postgres.sh url)
  DATABASE_URL=$(bash scripts/postgres.sh url app)
  export DATABASE_OWNER_URL DATABASE_URL
fi

DATA_DIR=${THERMOTOME_DATA_DIR:-$PWD/.data}
mkdir -p "$DATA_DIR"
export THERMOTOME_DATA_DIR=$DATA_DIR
if [[ -z "${NUXT_SESSION_PASSWORD:-}" ]]; then
  # Sessions are sealed with this secret; made once and kept private in the data folder.
  if [[ ! -s "$DATA_DIR/session-password" ]]; then
    (umask 077; node -e "process.stdout.write(require('crypto').randomBytes(36).toString('base64url'))" > "$DATA_DIR/session-password")
  fi
  NUXT_SESSION_PASSWORD=$(cat "$DATA_DIR/session-password")
  export NUXT_SESSION_PASSWORD
fi

# The records key signs the published key list and the audit checkpoints; it lives in a file,
# never in the database (THERMOTOME_RECORDS_KEY_FILE to keep it elsewhere).
npx tsx scripts/records-key.ts

say "Migrations and demo lab"
npx tsx scripts/migrate.ts
npx tsx scripts/seed.ts
unset DATABASE_OWNER_URL # the server never sees the owner's connection

say "Build"
npx nuxi build > "$DATA_DIR/build.log" 2>&1 || { tail -40 "$DATA_DIR/build.log"; echo "The build failed; the full log is $DATA_DIR/build.log"; exit 1; }

export HOST=${HOST:-127.0.0.1}
export PORT=${PORT:-3000}
export NUXT_DEMO_MODE=true NUXT_PUBLIC_DEMO_MODE=true
export THERMOTOME_PUBLIC_URL=${THERMOTOME_PUBLIC_URL:-http://$HOST:$PORT}

catcher_pid=""
if [[ -z "${THERMOTOME_SMTP_URL:-}" ]]; then
  # Locally, mail (witness requests, declines) goes to a catcher that keeps it in the data
  # folder; administrators read it on the "Caught mail" page.
  say "Mail catcher"
  MAIL_PORT=${THERMOTOME_MAIL_PORT:-2525}
  node --import tsx scripts/mail-catcher.ts --port "$MAIL_PORT" &
  catcher_pid=$!
  export THERMOTOME_SMTP_URL=smtp://127.0.0.1:$MAIL_PORT THERMOTOME_MAIL_CATCHER=1
fi
stop_catcher() { [[ -n $catcher_pid ]] && kill "$catcher_pid" 2> /dev/null || true; }
trap stop_catcher EXIT

say "Thermotome is serving on http://$HOST:$PORT (demo mode). Stop it with Ctrl-C."
node .output/server/index.mjs
