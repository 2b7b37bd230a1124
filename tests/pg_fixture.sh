#!/bin/sh
# CTest fixture around tests/pg_cluster.sh, so that `ctest` alone (the README's test command)
# runs the *_pg suites on a throwaway PostgreSQL cluster:
#
#   tests/pg_fixture.sh start ENVFILE        start a cluster in a new folder under /tmp and write
#                                            PHASEPLAN_TEST_PG_URI, PGPASSFILE and the folder to
#                                            ENVFILE; nothing when PHASEPLAN_TEST_PG_URI is set
#                                            already (a cluster from outside, as .ci/run starts)
#   tests/pg_fixture.sh run ENVFILE CMD...   run CMD with the cluster's variables from ENVFILE
#   tests/pg_fixture.sh stop ENVFILE         stop the cluster this fixture started; remove it
#
# When no cluster can be started (PostgreSQL not installed), start says so and the *_pg tests
# report "Skipped" with the reason, as without the fixture.
set -u
cmd=${1:-}
envfile=${2:-}
if [ -z "$cmd" ] || [ -z "$envfile" ]; then
  echo "usage: $0 start|stop ENVFILE | run ENVFILE CMD..." >&2
  exit 2
fi
shift 2
here=$(cd "$(dirname "$0")" && pwd)
value() { sed -n "s/^$1=//p" "$envfile"; }
case $cmd in
  start)
    rm -f "$envfile"
    if [ -n "${PHASEPLAN_TEST_PG_URI:-}" ]; then
      echo "pg_fixture: using the cluster at $PHASEPLAN_TEST_PG_URI"
      exit 0
    fi
    dir=$(mktemp -d /tmp/phaseplan-ctest-pg.XXXXXX) && rmdir "$dir" || exit 0
    if uri=$("$here/pg_cluster.sh" start "$dir"); then
      printf 'PHASEPLAN_TEST_PG_URI=%s\nPGPASSFILE=%s\nCLUSTER_DIR=%s\n' "$uri" "$dir/pgpass" "$dir" \
        > "$envfile"
      echo "pg_fixture: cluster started: $uri"
    else
      echo "pg_fixture: no PostgreSQL cluster could be started; the *_pg tests will skip"
    fi
    exit 0
    ;;
  stop)
    if [ -f "$envfile" ]; then
      dir=$(value CLUSTER_DIR)
      [ -n "$dir" ] && "$here/pg_cluster.sh" stop "$dir"
      rm -f "$envfile"
    fi
    exit 0
    ;;
  run)
    if [ -z "${PHASEPLAN_TEST_PG_URI:-}" ] && [ -f "$envfile" ]; then
      PHASEPLAN_TEST_PG_URI=$(value PHASEPLAN_TEST_PG_URI)
      PGPASSFILE=$(value PGPASSFILE)
      export PHASEPLAN_TEST_PG_URI PGPASSFILE
    fi
    exec "$@"
    ;;
  *)
    echo "$0: unknown command $cmd" >&2
    exit 2
    ;;
esac
