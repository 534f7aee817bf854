#!/usr/bin/env bash
# Runs a command with a throwaway PostgreSQL cluster: initdb in /tmp on a free port, trust auth,
# DATABASE_URL exported for the command, cluster stopped and removed afterwards (also on failure).
#   bash test/server/with-postgres.sh npx vitest run --project server
# Needs Debian's PostgreSQL server binaries (apt-get install -y postgresql). As root, initdb and
# the server run as the postgres user (initdb refuses root); as any other user, as that user.
set -euo pipefail
if (($# == 0)); then echo "usage: bash $0 <command> [args…]" >&2; exit 2; fi

PGBIN=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1)
if [ -z "$PGBIN" ] || [ ! -x "$PGBIN/initdb" ]; then
  echo "PostgreSQL server binaries not found under /usr/lib/postgresql: apt-get install -y postgresql" >&2
  exit 1
fi
PGTMP=$(mktemp -d /tmp/pg.XXXXXX)
as_pg() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }
[ "$(id -u)" = 0 ] && chown postgres:postgres "$PGTMP"
trap 'as_pg "$PGBIN/pg_ctl" -D "$PGTMP/data" -m immediate stop >/dev/null 2>&1 || true; rm -rf "$PGTMP"' EXIT
PGPORT_T=$(node -e "const s=require('net').createServer().listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})")
PGUSER_T=$(if [ "$(id -u)" = 0 ]; then echo postgres; else id -un; fi)

as_pg "$PGBIN/initdb" -D "$PGTMP/data" -U "$PGUSER_T" -A trust --no-sync -E UTF8 >/dev/null
as_pg "$PGBIN/pg_ctl" -D "$PGTMP/data" -l "$PGTMP/log" -w \
  -o "-p $PGPORT_T -k $PGTMP -c listen_addresses=127.0.0.1 -c fsync=off -c full_page_writes=off" start >/dev/null \
  || { cat "$PGTMP/log" >&2; exit 1; }
export DATABASE_URL="postgres://$PGUSER_T@127.0.0.1:$PGPORT_T/postgres"
echo "throwaway PostgreSQL at $DATABASE_URL ($PGTMP)" >&2
"$@"
