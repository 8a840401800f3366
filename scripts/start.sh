#!/usr/bin/env bash
# npm start: install what is missing, start the private MariaDB, migrate, seed the demo, build, serve.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
started=$(date +%s)

bash scripts/prepare.sh
bash scripts/db.sh start
export DB_PORT="${DB_PORT:-3406}"
npx tsx scripts/migrate.ts
npx tsx scripts/seed.ts
# Mail: SMTP_URL when set (production); otherwise the local mail catcher, readable at /admin/mail.
if [ -z "${SMTP_URL:-}" ] && [ "${NODE_ENV:-}" != "production" ]; then
  export MAIL_FAKE_PORT="${MAIL_FAKE_PORT:-2526}" MAIL_FAKE_DIR="${MAIL_FAKE_DIR:-$ROOT/.data/mail}"
  export SMTP_URL="smtp://127.0.0.1:$MAIL_FAKE_PORT"
  bash scripts/mail-fake.sh start
fi
# Payments: real keys from the environment in production; otherwise the local payment fake.
if [ "${NODE_ENV:-}" != "production" ] && [ -z "${STRIPE_SECRET_KEY:-}" ] && [ -z "${PAYMENTS_API_BASE:-}" ]; then
  export PAYMENTS_FAKE_PORT="${PAYMENTS_FAKE_PORT:-12111}"
  export STRIPE_SECRET_KEY=sk_test_platewright_local_fake_key STRIPE_WEBHOOK_SECRET=whsec_platewright_local_fake_secret
  export PAYMENTS_API_BASE="http://127.0.0.1:$PAYMENTS_FAKE_PORT"
  bash scripts/payments-fake.sh start
fi
npx tsx scripts/check-config.ts
ensure_build

export HOST="${HOST:-127.0.0.1}"
export PORT="${PORT:-4321}"
say "ready in $(( $(date +%s) - started )) s — serving on http://$HOST:$PORT"
if [ "${NODE_ENV:-}" != "production" ] || [ -n "${SEED_DEMO:-}" ]; then
  say "demo sign-ins (demo only): designer@ / engineer@ / machinist@ / admin@example.test, password: ${DEMO_PASSWORD:-platewright-demo}"
fi
say "stop with Ctrl-C; the database keeps running (npm run db:stop stops it)"
exec node scripts/serve.mjs
