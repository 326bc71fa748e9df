#!/usr/bin/env bash
# Starts Roundtable with the demo scheme on an embedded PostgreSQL. Nothing to install but a JDK and Maven.
#   PORT                  HTTP port (default 8080)
#   ROUNDTABLE_DB_PORT    port of the embedded PostgreSQL (default 5488)
#   ROUNDTABLE_DATA_DIR   where the database and the session key live (default: data/ in the repository)
#   QUARKUS_HTTP_HOST     interface to listen on (default 127.0.0.1: this machine only; 0.0.0.0 for all)
#   JAVA_HEAP             the server's heap limit (default 768m)
# The first start writes a class-data archive (ROUNDTABLE_DATA_DIR/app-cds.jsa) when it stops; later starts use it.
# Ctrl-C stops the server and the embedded PostgreSQL.
set -euo pipefail

repo="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$repo"

jar="target/quarkus-app/quarkus-run.jar"
if [ ! -f "$jar" ] || [ -n "$(find pom.xml src -newer "$jar" -type f -print -quit)" ]; then
  echo "Building Roundtable (tests skipped; run 'mvn verify' for those)..."
  mvn -q -DskipTests package
fi

export ROUNDTABLE_DATA_DIR="${ROUNDTABLE_DATA_DIR:-$repo/data}"
mkdir -p "$ROUNDTABLE_DATA_DIR"
chmod 700 "$ROUNDTABLE_DATA_DIR"

# The key that encrypts session cookies is generated once and kept with the data, so sessions survive restarts.
key_file="$ROUNDTABLE_DATA_DIR/session.key"
if [ ! -s "$key_file" ]; then
  (umask 077; head -c 48 /dev/urandom | base64 | tr -d '\n=' > "$key_file")
fi
export QUARKUS_HTTP_AUTH_SESSION_ENCRYPTION_KEY="$(cat "$key_file")"

export PORT="${PORT:-8080}"
# listen on this machine only unless told otherwise
export QUARKUS_HTTP_HOST="${QUARKUS_HTTP_HOST:-127.0.0.1}"
export ROUNDTABLE_DEMO=true
# plain HTTP on localhost: cookies cannot be marked Secure
export ROUNDTABLE_SECURE_COOKIES="${ROUNDTABLE_SECURE_COOKIES:-false}"
# the demo's shared accounts sign in with a password only; production requires two-step sign-in for admins and coordinators
export ROUNDTABLE_TWO_STEP_REQUIRED_ROLES="${ROUNDTABLE_TWO_STEP_REQUIRED_ROLES:-}"

cat <<MSG
Roundtable demo
  URL:        http://localhost:${PORT}/
  API docs:   http://localhost:${PORT}/q/swagger-ui
  Data:       ${ROUNDTABLE_DATA_DIR} (delete it to start the demo afresh)
  The demo sign-ins are printed once the server is up. Stop with Ctrl-C.
MSG

# The server exits with status 3 when its embedded PostgreSQL died and could not be started again in-process:
# start both afresh. Any other exit (Ctrl-C included) ends the script with the server's status.
java_pid=
trap '[ -n "$java_pid" ] && kill -TERM "$java_pid" 2>/dev/null' TERM INT
while true; do
  # Class-data sharing: a start without an archive writes one of the classes it loaded when it stops (into the data
  # folder); the starts after it map that archive and are ready in about half the time, a restart after a crash
  # included. It is written again after the jar changed.
  cds="$ROUNDTABLE_DATA_DIR/app-cds.jsa"
  if [ -s "$cds" ] && [ "$cds" -nt "$jar" ]; then
    cds_option="-XX:SharedArchiveFile=$cds"
  else
    rm -f "$cds"
    cds_option="-XX:ArchiveClassesAtExit=$cds"
  fi
  java -Xmx"${JAVA_HEAP:-768m}" -XX:+ExitOnOutOfMemoryError "$cds_option" -Duser.timezone=UTC -jar "$jar" &
  java_pid=$!
  set +e
  wait "$java_pid"; status=$?
  # a signal interrupts the first wait: wait for the server to finish stopping
  if kill -0 "$java_pid" 2>/dev/null; then wait "$java_pid"; status=$?; fi
  set -e
  if [ "$status" -ne 3 ]; then
    exit "$status"
  fi
  echo "Roundtable stopped because its database was lost; starting again..." >&2
done
