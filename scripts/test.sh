#!/usr/bin/env bash
# Run every test suite: unit tests, then API and browser tests against one freshly built
# server and a fresh database on the private PostgreSQL. Ends with "N passed, N failed".
set -uo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
bash scripts/ensure-packages.sh || exit 1
bash scripts/ensure-system.sh || exit 1
# A checkout that shares installed packages (a git worktree) has no generated .nuxt yet.
[[ -f .nuxt/tsconfig.json ]] || npx nuxt prepare >/dev/null || exit 1
mkdir -p test-artifacts
rm -f test-artifacts/vitest.json
NO_COLOR=1 npx vitest run --reporter=default --reporter=json --outputFile.json=test-artifacts/vitest.json "$@"
status=$?
node scripts/test-summary.mjs test-artifacts/vitest.json || status=1
exit $status
