# Sourced by tools/start.sh and tools/test.sh after the build. Unless SMTP_HOST names a real
# mail server, starts the fake SMTP server (tools/fake-smtp.ts) on loopback for this run and
# points the app at it. The fake exits by itself when the calling shell ends.
if [ -z "${SMTP_HOST:-}" ]; then
  fake_smtp_port=${FAKE_SMTP_PORT:-2525}
  fake_smtp_web=${FAKE_SMTP_WEB_PORT:-8025}
  fake_smtp_ready="$DATA_DIR/fake-smtp.$$.ready"
  rm -f "$fake_smtp_ready"
  node "$ROOT/dist/tools/tools/fake-smtp.js" --smtp-port "$fake_smtp_port" --web-port "$fake_smtp_web" \
    --parent $$ --ready-file "$fake_smtp_ready" &
  for _ in $(seq 1 50); do [ -s "$fake_smtp_ready" ] && break; sleep 0.1; done
  if [ -s "$fake_smtp_ready" ]; then
    rm -f "$fake_smtp_ready"
    export SMTP_HOST=127.0.0.1 SMTP_PORT=$fake_smtp_port
    export MAIL_FROM=${MAIL_FROM:-"Fluxwalk <fluxwalk@localhost>"}
    say "mail goes to the fake SMTP server: read it at http://127.0.0.1:$fake_smtp_web/"
  else
    say "the fake SMTP server did not start (port $fake_smtp_port or $fake_smtp_web taken?): e-mail will fail"
  fi
fi
