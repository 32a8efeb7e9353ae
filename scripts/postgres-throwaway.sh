#!/usr/bin/env bash
# Starts a throwaway PostgreSQL cluster (Debian's postgresql package) for tests and trials:
# a new data folder, trust authentication, listening on 127.0.0.1 only. Prints the URL of its
# postgres database; stop it with: pg_ctl -D <folder>/data stop (the script prints the line).
#
#   scripts/postgres-throwaway.sh [folder] [port]
set -euo pipefail
FOLDER="${1:-$(mktemp -d /tmp/chargewell-pg.XXXXXX)}"
PORT="${2:-55432}"
BIN="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1)"
if [ -z "$BIN" ]; then
  echo "PostgreSQL is not installed (apt-get install postgresql)." >&2
  exit 1
fi
mkdir -p "$FOLDER"
# PostgreSQL refuses to run as root: as root, run it as the postgres user the package created.
if [ "$(id -u)" = 0 ]; then
  chown postgres "$FOLDER"
  as_owner() { su postgres -s /bin/sh -c "$1"; }
else
  as_owner() { sh -c "$1"; }
fi
as_owner "'$BIN/initdb' -D '$FOLDER/data' -A trust -U postgres -E UTF8 >'$FOLDER/initdb.log'"
# A test cluster: durability off for speed (the app's own crash test kills the app, not the database).
as_owner "'$BIN/pg_ctl' -D '$FOLDER/data' -l '$FOLDER/server.log' -w -o \"-p $PORT -k '$FOLDER' -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c max_connections=300\" start >/dev/null"
echo "postgres://postgres@127.0.0.1:$PORT/postgres"
echo "stop with: $( [ "$(id -u)" = 0 ] && echo "su postgres -s /bin/sh -c \"'$BIN/pg_ctl' -D '$FOLDER/data' stop\"" || echo "'$BIN/pg_ctl' -D '$FOLDER/data' stop" )" >&2
