#!/usr/bin/env bash
# The integration suite on PostgreSQL: starts a throw-away cluster on a free loopback port
# (scripts/pg-cluster.sh), runs vitest's integration-pg project against it, and stops it again.
# Extra arguments go to vitest (e.g. one test file).
set -euo pipefail
cd "$(dirname "$0")/.."
PG_STATE="$(mktemp -d /tmp/sunreckon-pgstate.XXXXXX)"
export PG_STATE
PORT="$(node -e "const s=require('node:net').createServer();s.listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})")"
URL="$(bash scripts/pg-cluster.sh start "$PORT")"
trap 'bash scripts/pg-cluster.sh stop' EXIT
echo "PostgreSQL test cluster on 127.0.0.1:$PORT"
TEST_POSTGRES_URL="$URL" npx vitest run --project integration-pg "$@"
