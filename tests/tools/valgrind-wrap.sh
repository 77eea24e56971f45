#!/usr/bin/env bash
# valgrind-wrap.sh — the wrapper for `meson test --wrapper`: every quaver
# command the test scripts run goes through Valgrind memcheck
# (valgrind-quaver.sh stands in for $QUAVER), and C test programs run under
# it directly. Python itself is not run under Valgrind.
#
#   meson test -C BUILD --wrapper "$PWD/tests/tools/valgrind-wrap.sh" \
#       --timeout-multiplier 20 --suite cross
#
# Logs: $QV_VALGRIND_LOGS (default BUILD/valgrind-logs), one per process.
# run-valgrind.sh runs the chosen suites and sums the logs.
# SPDX-License-Identifier: GPL-3.0-or-later
set -u
here="$(cd "$(dirname "$0")" && pwd)"
export QV_VALGRIND_LOGS="${QV_VALGRIND_LOGS:-${QV_BUILD_ROOT:-.}/valgrind-logs}"
mkdir -p "$QV_VALGRIND_LOGS"
case "$(basename "$1")" in
  python*)
    if [ -n "${QUAVER:-}" ] && [ "$QUAVER" != "$here/valgrind-quaver.sh" ]; then
      export QV_VALGRIND_QUAVER="$QUAVER"
      export QUAVER="$here/valgrind-quaver.sh"
    fi
    exec "$@" ;;
  *)
    export G_SLICE=always-malloc G_DEBUG=gc-friendly
    exec valgrind --tool=memcheck --error-exitcode=99 --leak-check=full \
      --show-leak-kinds=definite --errors-for-leak-kinds=definite \
      --suppressions="$here/../valgrind.supp" --num-callers=30 \
      --log-file="$QV_VALGRIND_LOGS/$(basename "$1").%p.log" "$@" ;;
esac
