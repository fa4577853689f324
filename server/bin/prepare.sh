#!/usr/bin/env bash
# First half of `npm start` / `npm test`: make sure what the project needs is on the machine.
# - npm packages (npm ci when node_modules is missing or older than the lock file)
# - MariaDB from Debian's packages when mariadbd is missing (skipped when DB_HOST points elsewhere)
# - for tests: Debian's Chromium (browser tests) and poppler-utils (PDF text and page images)
set -euo pipefail
cd "$(dirname "$0")/../.."

mode=start
[ "${1:-}" = "--test" ] && mode=test

say() { printf '[titrata] %s\n' "$*"; }

# npm packages
if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  say "installing npm packages (npm ci)"
  npm ci --no-audit --no-fund
fi

need=()
if [ -z "${DB_HOST:-}" ] && ! command -v mariadbd >/dev/null 2>&1 && [ ! -x /usr/sbin/mariadbd ]; then
  need+=(mariadb-server)
fi
if [ "$mode" = test ]; then
  command -v chromium >/dev/null 2>&1 || need+=(chromium)
  command -v pdftotext >/dev/null 2>&1 || need+=(poppler-utils)
fi

if [ ${#need[@]} -gt 0 ]; then
  say "installing Debian packages: ${need[*]}"
  if [ "$(id -u)" -eq 0 ]; then
    sudo=()
  elif command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then
    sudo=(sudo -n)
  else
    say "cannot install ${need[*]}: run as root or give this user sudo, or install the Debian package(s) ${need[*]} yourself."
    exit 1
  fi
  export DEBIAN_FRONTEND=noninteractive
  "${sudo[@]}" apt-get update -qq
  "${sudo[@]}" apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
  say "installed ${need[*]}"
fi
