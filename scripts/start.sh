#!/usr/bin/env bash
# Runs Starsway on the demo data: installs what is missing, starts a private PostgreSQL on
# 127.0.0.1, migrates, seeds the demo (only into an empty database), builds the client, starts
# the local mail server and the API. Ctrl-C stops everything it started.
# The API and the mail server run under scripts/supervise.sh: when one dies it is restarted (with a
# message); after 5 deaths within 60 s the whole stack stops with a message and exit status 1.
set -euo pipefail
cd "$(dirname "$0")/.."

PG_PORT=${STARSWAY_PG_PORT:-54390}
PORT=${PORT:-3000}
MAIL_PORT=${STARSWAY_MAIL_PORT:-2525}
DB=${STARSWAY_DB:-starsway}

bash scripts/ensure-deps.sh
bash scripts/pg.sh start pg "$PG_PORT"
pids=()
cleanup() {
  trap - INT TERM EXIT
  for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done
  wait 2>/dev/null || true
  bash scripts/pg.sh stop pg
  echo "Starsway stopped."
}
trap 'cleanup; exit 0' INT TERM
trap cleanup EXIT

# the API, workers, migrations and seed reach PostgreSQL through its Unix socket (PostgreSQL still
# listens on 127.0.0.1 for psql and other tools): a round trip over loopback TCP cost the API's event
# loop ~0.35 ms per query under load (CPU profile, issue 11)
export DATABASE_URL=$(bash scripts/pg.sh local-url pg "$PG_PORT" "$DB")
ADMIN_URL=$(bash scripts/pg.sh url pg "$PG_PORT" postgres) DB="$DB" node -e "
const { Client } = require('pg')
const c = new Client({ connectionString: process.env.ADMIN_URL })
c.connect()
  .then(() => c.query('select 1 from pg_database where datname = \$1', [process.env.DB]))
  .then(r => r.rowCount ? null : c.query('create database \"' + process.env.DB + '\"'))
  .then(() => c.end())
  .catch(e => { console.error(e.message); process.exit(1) })
"
export NODE_ENV=${NODE_ENV:-development}
export PORT HOST=127.0.0.1 APP_URL=${APP_URL:-http://127.0.0.1:$PORT}
export SMTP_HOST=127.0.0.1 SMTP_PORT=$MAIL_PORT MAIL_DIR=${MAIL_DIR:-$PWD/.data/mail}

echo "== migrating"; node --import tsx scripts/migrate.ts
echo "== seeding the demo (skipped when the database already has users)"; node --import tsx scripts/seed.ts
echo "== building the client"; npx vite build --logLevel warn

# node --import tsx (not npx): one process each, so a signal reaches the server itself
bash scripts/supervise.sh "mail server" 5 60 -- node --import tsx scripts/dev-mail.ts --port "$MAIL_PORT" --dir "$MAIL_DIR" & pids+=($!)
bash scripts/supervise.sh API 5 60 -- node --import tsx server/index.ts & pids+=($!)

node -e "
const url = 'http://127.0.0.1:$PORT/api/health'
const until = Date.now() + 60000
const poll = () => fetch(url).then(r => { if (!r.ok) throw 0 }).catch(() => Date.now() < until ? new Promise(r => setTimeout(r, 500)).then(poll) : null)
poll()
"
cat <<TXT

  Starsway is running at http://127.0.0.1:$PORT
  Demo sign-ins (password: starsway-demo)
    owner     nadia.owner@lanternfield.test
    analyst   tomas.analyst@lanternfield.test
    reviewer  ines.reviewer@lanternfield.test
    other team (owner)  piet@quillmere.test
  Mail received by the local SMTP server: http://127.0.0.1:$PORT/dev/mail  (files in $MAIL_DIR)
  Press Ctrl-C to stop.

TXT
# a supervisor returns only when its process keeps dying (or on Ctrl-C): then everything stops
status=0
wait -n "${pids[@]}" || status=$?
if [ "$status" != 0 ]; then
  echo "Starsway: stopping everything because a part of it cannot be kept running (see above)." >&2
  exit "$status"
fi
