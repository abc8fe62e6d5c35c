#!/usr/bin/env bash
# Start Thermotome with the demo lab on http://127.0.0.1:3000 (or $PORT):
# installs the packages, installs and starts a private PostgreSQL on loopback, migrates,
# seeds the demo lab on the first start, builds and serves.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

say() { printf '\n== %s\n' "$*"; }

bash scripts/ensure-packages.sh

say "Database"
if [[ -z "${DATABASE_URL:-}" ]]; then
  bash scripts/postgres.sh start
  DATABASE_URL=$(bash scripts/postgres.sh url)
  export DATABASE_URL
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

say "Migrations and demo lab"
npx tsx scripts/migrate.ts
npx tsx scripts/seed.ts

say "Build"
npx nuxi build > "$DATA_DIR/build.log" 2>&1 || { tail -40 "$DATA_DIR/build.log"; echo "The build failed; the full log is $DATA_DIR/build.log"; exit 1; }

export HOST=${HOST:-127.0.0.1}
export PORT=${PORT:-3000}
export NUXT_DEMO_MODE=true NUXT_PUBLIC_DEMO_MODE=true
say "Thermotome is serving on http://$HOST:$PORT (demo mode). Stop it with Ctrl-C."
exec node .output/server/index.mjs
