#!/usr/bin/env bash
# npm test: the same preparation as npm start (browser included) against a separate test database
# instance (own folder and port), then unit, integration and end-to-end tests. Stops what it started.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
started=$(date +%s)

export DB_PORT="${TEST_DB_PORT:-3407}"
export DB_DIR="${TEST_DB_DIR:-$ROOT/.data/test-mariadb}"
export DB_NAME="${TEST_DB_NAME:-platewright_test}"
export DB_USER=platewright DB_PASSWORD=platewright-test
export TEST_APP_PORT="${TEST_APP_PORT:-4327}"
export NODE_ENV=test
# The test run's own build, beside the app's dist/ (several runs at once never share one).
export PLATEWRIGHT_DIST="${PLATEWRIGHT_DIST:-$ROOT/.data/dist-test-$TEST_APP_PORT}"
unset DATABASE_URL
# Mail goes to a local catcher of the test run's own (port + folder), never to a real server.
export MAIL_FAKE_PORT="${MAIL_FAKE_PORT:-2527}"
if [ "$MAIL_FAKE_PORT" = 2527 ]; then MAIL_FAKE_DIR_DEFAULT="$ROOT/.data/test-mail"; else MAIL_FAKE_DIR_DEFAULT="$ROOT/.data/test-mail-$MAIL_FAKE_PORT"; fi
export MAIL_FAKE_DIR="${TEST_MAIL_FAKE_DIR:-$MAIL_FAKE_DIR_DEFAULT}"
export SMTP_URL="smtp://127.0.0.1:$MAIL_FAKE_PORT"
unset APP_URL
# Runs on other ports (several at once) keep their uploads and result files apart.
run_suffix=""; [ "$TEST_APP_PORT" = 4327 ] || run_suffix="-$TEST_APP_PORT"
export UPLOAD_DIR="${TEST_UPLOAD_DIR:-$ROOT/.data/test-uploads$run_suffix}"
# Payments go to a local payment fake of the test run's own port, never to the real service.
export PAYMENTS_FAKE_PORT="${PAYMENTS_FAKE_PORT:-12112}"
export STRIPE_SECRET_KEY=sk_test_platewright_local_fake_key STRIPE_WEBHOOK_SECRET=whsec_platewright_local_fake_secret
export PAYMENTS_API_BASE="http://127.0.0.1:$PAYMENTS_FAKE_PORT"
unset PAYMENTS_FAKE_WEBHOOK_URL

bash scripts/prepare.sh --with-browser

db_was_running=0
bash scripts/db.sh status >/dev/null 2>&1 && db_was_running=1
mail_was_running=0
bash scripts/mail-fake.sh status >/dev/null 2>&1 && mail_was_running=1
payments_was_running=0
bash scripts/payments-fake.sh status >/dev/null 2>&1 && payments_was_running=1
cleanup() {
  if [ "$db_was_running" = 0 ]; then bash scripts/db.sh stop >/dev/null 2>&1 || true; fi
  if [ "$mail_was_running" = 0 ]; then bash scripts/mail-fake.sh stop >/dev/null 2>&1 || true; fi
  if [ "$payments_was_running" = 0 ]; then bash scripts/payments-fake.sh stop >/dev/null 2>&1 || true; fi
}
trap cleanup EXIT

rm -rf "$MAIL_FAKE_DIR"
bash scripts/mail-fake.sh start
bash scripts/payments-fake.sh start
bash scripts/db.sh start
# A fresh test database every run; the demo instance is never touched.
mariadb --no-defaults --socket="$DB_DIR/mysqld.sock" -uroot -e "DROP DATABASE IF EXISTS \`$DB_NAME\`"
bash scripts/db.sh start >/dev/null
npx tsx scripts/migrate.ts
ensure_build

mkdir -p .test-artifacts
filters=("$@")
status=0
summary=()
# TEST_SUITES="unit e2e" runs only those suites (default: types unit integration e2e); arguments (npm test -- FILTER…) go to vitest as
# file filters, e.g. `TEST_SUITES=e2e npm test -- editor`.
suites="${TEST_SUITES:-types unit integration e2e}"
run_suite() {
  local name="$1" config="$2"
  case " $suites " in *" $name "*) ;; *) return 0 ;; esac
  say "running $name tests"
  local out=".test-artifacts/$name-results$run_suffix.json"
  rm -f "$out"
  if npx vitest run --config "$config" --reporter=default --reporter=json --outputFile.json="$out" "${filters[@]}"; then :; else status=1; fi
  if [ -f "$out" ]; then
    summary+=("$name: $(node scripts/test-summary.cjs "$out")")
  else
    summary+=("$name: did not run"); status=1
  fi
}
# The type check (tsc --noEmit over src, tests, bench and scripts) counts as a suite of its own.
case " $suites " in *" types "*)
  say "checking types"
  if npx tsc --noEmit -p .; then summary+=("types: no errors"); else summary+=("types: errors (see above)"); status=1; fi ;;
esac
run_suite unit vitest.config.ts
run_suite integration vitest.integration.config.ts
# End-to-end tests start from a fresh database with the demo shop (integration tests leave their
# own plates and part numbers behind).
mariadb --no-defaults --socket="$DB_DIR/mysqld.sock" -uroot -e "DROP DATABASE IF EXISTS \`$DB_NAME\`"
bash scripts/db.sh start >/dev/null
npx tsx scripts/migrate.ts
run_suite e2e vitest.e2e.config.ts

say "finished in $(( $(date +%s) - started )) s"
for s in "${summary[@]}"; do say "$s"; done
results=()
for n in unit integration e2e; do case " $suites " in *" $n "*) results+=(".test-artifacts/$n-results$run_suffix.json") ;; esac; done
node scripts/test-summary.cjs "${results[@]}"
exit $status
