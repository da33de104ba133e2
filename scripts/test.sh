#!/usr/bin/env bash
# Runs every test: type-check, client build, and one Vitest run (numerics, API against a real
# PostgreSQL, components, and the browser end-to-end tests in Debian's Chromium).
# Starts (and stops) its own PostgreSQL cluster on 127.0.0.1. The last line is `N passed, N failed`.
set -uo pipefail
cd "$(dirname "$0")/.."
here=$PWD
port=${STARSWAY_TEST_PG_PORT:-54391}
cluster=${STARSWAY_TEST_PG_CLUSTER:-pg-test}
failed_steps=0

bash scripts/ensure-deps.sh || { echo "0 passed, 1 failed"; exit 1; }
if [ ! -x /usr/bin/chromium ]; then
  echo "Chromium missing: installing Debian's chromium for the browser tests"
  sudo=""; [ "$(id -u)" = 0 ] || sudo="sudo"
  DEBIAN_FRONTEND=noninteractive $sudo apt-get update -qq && DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq chromium >/dev/null
fi

# Outside readers of our exports (LaTeX compile, PDF text, pandas/astropy reading the CSV and ECSV):
# Debian's packages; a test whose reader is missing says so and checks the text only.
missing=()
[ -x /usr/bin/pdflatex ] || missing+=(texlive-latex-base)
[ -x /usr/bin/pdftotext ] || missing+=(poppler-utils)
/usr/bin/python3 -c 'import pandas, astropy' 2>/dev/null || missing+=(python3-pandas python3-astropy)
if [ ${#missing[@]} -gt 0 ]; then
  echo "Installing Debian packages for the export checks: ${missing[*]}"
  sudo=""; [ "$(id -u)" = 0 ] || sudo="sudo"
  { DEBIAN_FRONTEND=noninteractive $sudo apt-get update -qq && DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null; } \
    || echo "Could not install ${missing[*]}: those checks will be skipped with a message"
fi

bash scripts/pg.sh start "$cluster" "$port" || { echo "0 passed, 1 failed"; exit 1; }
trap 'bash scripts/pg.sh stop "$cluster"' EXIT
export TEST_DATABASE_URL=$(bash scripts/pg.sh url "$cluster" "$port" postgres)
export NODE_ENV=test

echo "== type-check"
if ! npx vue-tsc --noEmit -p tsconfig.app.json; then failed_steps=$((failed_steps+1)); fi
if ! npx tsc --noEmit -p tsconfig.node.json; then failed_steps=$((failed_steps+1)); fi
if ! npx tsc --noEmit -p tsconfig.server.json; then failed_steps=$((failed_steps+1)); fi

echo "== client build"
if ! npx vite build --logLevel warn; then failed_steps=$((failed_steps+1)); fi

echo "== tests"
mkdir -p out
rm -f out/vitest.json
npx vitest run --reporter=default --reporter=json --outputFile.json=out/vitest.json "$@"
rc=$?
node -e "
const fs = require('fs')
let p = 0, f = 0
try {
  const r = JSON.parse(fs.readFileSync('out/vitest.json', 'utf8'))
  p = r.numPassedTests; f = r.numFailedTests
  // a file that failed outside any test (import error, failing hook) counts once
  for (const file of r.testResults) if (file.status === 'failed' && !file.assertionResults.some(a => a.status === 'failed')) f += 1
} catch { f = 1 }
if ($rc !== 0 && f === 0) f = 1
f += $failed_steps
console.log(p + ' passed, ' + f + ' failed')
process.exit(f > 0 ? 1 : 0)
"
