#!/usr/bin/env bash
# Install the npm packages from package-lock.json when they are missing or out of date.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
stamp=node_modules/.thermotome-lock-hash
want=$(sha256sum package-lock.json | cut -d' ' -f1)
if [[ ! -f $stamp || "$(cat "$stamp")" != "$want" ]]; then
  printf '\n== Installing packages (npm ci)\n'
  npm ci --no-audit --no-fund --loglevel=error
  echo "$want" > "$stamp"
fi
