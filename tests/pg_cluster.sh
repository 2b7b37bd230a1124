#!/bin/sh
# A throwaway PostgreSQL cluster for the test suites (PostgreSQL 15 from Debian).
#
#   tests/pg_cluster.sh start DIR   initdb into DIR/data, listen only on a Unix socket in DIR/sock
#                                   (no TCP: listen_addresses=''), start, create the database
#                                   "phaseplan", write the password to DIR/pgpass (a ~/.pgpass-format
#                                   file: point PGPASSFILE at it) and print the URI on stdout:
#                                   postgresql://phaseplan@/phaseplan?host=DIR/sock
#   tests/pg_cluster.sh stop DIR    stop the server and remove DIR
#
# DIR must not exist yet (start) and should be short: a socket path is at most 107 bytes. initdb
# refuses to run as root, so as root the cluster belongs to the unprivileged user `nobody`
# (PHASEPLAN_PG_OWNER overrides it); otherwise to the caller. Authentication is scram-sha-256
# with a random password, so the tests go through libpq's password file like a lab's bench.
# Durability is off (fsync, full_page_writes): the cluster lives for one test run.
set -eu
cmd=${1:-}
dir=${2:-}
if [ -z "$cmd" ] || [ -z "$dir" ]; then
  echo "usage: $0 start|stop DIR" >&2
  exit 2
fi
bindir=${PHASEPLAN_PG_BINDIR:-$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)}
if [ ! -x "$bindir/initdb" ]; then
  echo "$0: initdb not found (Debian package postgresql); set PHASEPLAN_PG_BINDIR" >&2
  exit 2
fi

if [ "$(id -u)" = 0 ]; then
  owner=${PHASEPLAN_PG_OWNER:-nobody}
  as_owner() { runuser -u "$owner" -- "$@"; }
else
  owner=$(id -un)
  as_owner() { "$@"; }
fi

case "$cmd" in
start)
  if [ -e "$dir" ]; then
    echo "$0: $dir exists; give a new folder" >&2
    exit 2
  fi
  mkdir -p "$dir/sock"
  dir=$(cd "$dir" && pwd)
  if [ ${#dir} -gt 80 ]; then
    echo "$0: $dir is too long for a socket path (at most 80 characters here)" >&2
    exit 2
  fi
  password=$(od -An -N18 -tx1 /dev/urandom | tr -d ' \n')
  printf '%s\n' "$password" > "$dir/pwfile"
  chown -R "$owner" "$dir"
  chmod 700 "$dir"
  as_owner "$bindir/initdb" -D "$dir/data" -U phaseplan --pwfile="$dir/pwfile" \
    --auth=scram-sha-256 --encoding=UTF8 --locale=C --no-sync > "$dir/initdb.log" 2>&1 || {
    cat "$dir/initdb.log" >&2
    exit 1
  }
  rm -f "$dir/pwfile"
  cat >> "$dir/data/postgresql.conf" <<EOF
listen_addresses = ''
unix_socket_directories = '$dir/sock'
fsync = off
full_page_writes = off
synchronous_commit = off
max_connections = 200
EOF
  as_owner "$bindir/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 start > /dev/null || {
    cat "$dir/server.log" >&2
    exit 1
  }
  # host:port:database:user:password, as in ~/.pgpass (readable by its owner only).
  printf '%s:5432:*:phaseplan:%s\n' "$dir/sock" "$password" > "$dir/pgpass"
  chmod 600 "$dir/pgpass"
  # The caller (root or the owner) reads the password file; the cluster's owner need not.
  PGPASSFILE="$dir/pgpass" "$bindir/psql" -X -q -h "$dir/sock" -U phaseplan -d postgres \
    -c "CREATE DATABASE phaseplan" > /dev/null
  echo "postgresql://phaseplan@/phaseplan?host=$dir/sock"
  ;;
stop)
  if [ -d "$dir/data" ]; then
    as_owner "$bindir/pg_ctl" -D "$dir/data" -m immediate -w stop > /dev/null 2>&1 || true
  fi
  rm -rf "$dir"
  ;;
*)
  echo "usage: $0 start|stop DIR" >&2
  exit 2
  ;;
esac
