#!/usr/bin/env bash
# Starts `npm run demo` on spare ports with a throw-away database, checks health, a token on /api/me,
# and the outsider's 404, then stops everything it started.
set -euo pipefail
dir=$(mktemp -d)
export PORT=${SMOKE_PORT:-3300} SMTP_PORT=${SMOKE_SMTP_PORT:-2727}
export DATABASE_URL="file:$dir/smoke.db" UPLOADS_DIR="$dir/uploads" MAIL_SINK_DIR="$dir/mail"
setsid npm run demo >"$dir/demo.log" 2>&1 &
pid=$!
cleanup() { kill -TERM -- "-$pid" 2>/dev/null || true; sleep 1; kill -KILL -- "-$pid" 2>/dev/null || true; }
trap cleanup EXIT
for _ in $(seq 1 180); do
  curl -fsS "http://localhost:$PORT/api/health" >/dev/null 2>&1 && break
  sleep 1
done
curl -fsS "http://localhost:$PORT/api/health" | grep -q '"ok":true' || { cat "$dir/demo.log"; echo "smoke: health failed"; exit 1; }
token=$(npm run -s token -- pi@lab.example.org | tail -n 1)
curl -fsS -H "Authorization: Bearer $token" "http://localhost:$PORT/api/me" | grep -q '"email":"pi@lab.example.org"' || { echo "smoke: /api/me failed"; exit 1; }
outsider=$(npm run -s token -- outsider@elsewhere.example.org | tail -n 1)
code=$(curl -s -o /dev/null -w '%{http_code}' -H "Authorization: Bearer $outsider" "http://localhost:$PORT/api/manuscripts/demo-manuscript")
[ "$code" = "404" ] || { echo "smoke: outsider got $code, expected 404"; exit 1; }
grep -q "pi@lab.example.org" "$dir/demo.log" || { echo "smoke: demo did not print the accounts"; exit 1; }
echo "smoke: npm run demo serves health, tokens work on /api/me, the outsider gets 404"
