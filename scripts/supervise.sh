#!/usr/bin/env bash
# Keeps one process of the stack running (used by scripts/start.sh for the API and the mail server).
#   scripts/supervise.sh NAME MAX WINDOW_S -- COMMAND [ARGS...]
# Runs COMMAND; when it exits without being asked to, says so on stderr and starts it again after
# a pause that doubles from 1 s (at most 30 s). More than MAX exits within WINDOW_S seconds means
# something is wrong that a restart will not fix: it says so and exits with status 1.
# SIGINT/SIGTERM are passed to COMMAND, and the supervisor then exits 0 when COMMAND has stopped.
set -uo pipefail
name=${1:?name}; max=${2:?max restarts}; window=${3:?window seconds}; shift 3
[ "${1:-}" = "--" ] && shift
[ $# -gt 0 ] || { echo "supervise.sh: no command" >&2; exit 2; }

child=0
stopping=0
stop() {
  stopping=1
  [ "$child" -gt 0 ] && kill -TERM "$child" 2>/dev/null
}
trap stop INT TERM

exits=()   # times of recent unexpected exits
pause=1
while :; do
  "$@" &
  child=$!
  started=$(date +%s)
  # wait returns early when a trapped signal arrives: wait again until the child has really exited
  while :; do
    wait "$child"; status=$?
    kill -0 "$child" 2>/dev/null || break
  done
  [ "$stopping" = 1 ] && exit 0
  now=$(date +%s)
  recent=()
  for t in "${exits[@]}"; do [ $((now - t)) -lt "$window" ] && recent+=("$t"); done
  exits=("${recent[@]}" "$now")
  if [ "${#exits[@]}" -gt "$max" ]; then
    echo "Starsway: the $name exited $(( ${#exits[@]} )) times within ${window} s (last status $status); not restarting it again. Read the messages above, fix the cause and start again." >&2
    exit 1
  fi
  # a process that ran for a while gets a quick restart; repeated quick failures back off
  if [ $((now - started)) -ge "$window" ]; then pause=1; fi
  echo "Starsway: the $name stopped unexpectedly (status $status); restarting it in ${pause} s (exit ${#exits[@]} of at most $max within ${window} s)." >&2
  sleep "$pause" & wait $! || true
  [ "$stopping" = 1 ] && exit 0
  pause=$(( pause * 2 > 30 ? 30 : pause * 2 ))
done
