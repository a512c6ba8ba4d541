#!/usr/bin/env bash
# Runs before `npm test`: the HTML report's browser test (test/cli/report-browser.test.ts) needs Debian's
# Chromium. On a fresh machine where we are root and apt-get exists, install it; otherwise say how.
set -euo pipefail
if command -v chromium >/dev/null 2>&1 || [ -n "${UNDERFOOT_CHROMIUM:-}" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "pretest: installing Debian's chromium for the report's browser test (apt-get)…" >&2
  (apt-get update -qq && apt-get install -y -qq chromium >/dev/null) || {
    echo "pretest: could not install chromium; the browser test will fail (apt-get install -y chromium)" >&2
  }
else
  echo "pretest: Chromium is missing; the report's browser test will fail. Install it: sudo apt-get install -y chromium (or set UNDERFOOT_CHROMIUM to a Chromium binary)" >&2
fi
