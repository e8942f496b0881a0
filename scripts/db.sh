#!/usr/bin/env bash
# npm run db:stop | db:status — manage the private PostgreSQL cluster.
source "$(dirname "$0")/lib.sh"
case "${1:-status}" in
  stop) stop_cluster ;;
  start) ensure_cluster; log "PostgreSQL running on 127.0.0.1:$PG_PORT" ;;
  url) choose_pg_port; echo "$(managed_url "${2:-joulebook}")" ;;
  status)
    bin="$(pg_bindir || true)"
    if [ -n "$bin" ] && [ -f "$PG_DIR/PG_VERSION" ] && as_pg "$bin/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
      log "PostgreSQL running on 127.0.0.1:$(cat "$PG_PORT_FILE"), data in $PG_DIR"
    else
      log "PostgreSQL not running"
    fi ;;
  *) die "usage: db.sh start|stop|status|url [database]" ;;
esac
