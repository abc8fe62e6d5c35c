#!/usr/bin/env bash
# Install the Debian packages the test suites need, when missing: Chromium for the browser
# tests (never a downloaded browser). PostgreSQL is installed by scripts/postgres.sh.
set -euo pipefail
missing=()
[[ -x /usr/bin/chromium ]] || missing+=(chromium)
command -v pdftotext > /dev/null || missing+=(poppler-utils)
command -v qpdf > /dev/null || missing+=(qpdf)
if ((${#missing[@]})); then
  if [[ $(id -u) -ne 0 ]]; then
    echo "Missing Debian packages: ${missing[*]}. Install them (as root: apt-get install ${missing[*]}) and run again." >&2
    exit 1
  fi
  printf '\n== Installing Debian packages: %s\n' "${missing[*]}"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" > /dev/null
fi
