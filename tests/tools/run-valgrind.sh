#!/usr/bin/env bash
# run-valgrind.sh — the command-line tests with every quaver process under
# Valgrind memcheck, then a sum of what memcheck reported.
#
#   tests/tools/run-valgrind.sh BUILD [SUITE…]      (default: cross export reliability)
#
# BUILD is a build directory without sanitizers (ASan and Valgrind cannot
# share a process), with -Dtests=true. The tests are the normal ones, run
# through `meson test --wrapper tests/tools/valgrind-wrap.sh` with their
# time limits multiplied by 30 (memcheck is 20–50 times slower). A memcheck
# error or a definite leak makes that quaver process exit 99, so the test
# that ran it fails; the summary lists the logs that reported something.
# Suppressions: tests/valgrind.supp (GTK, Mesa, fontconfig only).
# Valgrind's emulated CPU makes OpenBLAS choose other kernels than a native
# run: tests compare numbers with tolerances, never bit for bit.
# Exit status: 0 when every test passed and no log reported an error or a
# definite leak; 1 otherwise; 2 on a usage error.
# SPDX-License-Identifier: GPL-3.0-or-later
set -u
if [ $# -lt 1 ] || [ ! -d "$1" ]; then
  echo "usage: $0 BUILD [SUITE…]" >&2
  exit 2
fi
build=$(cd "$1" && pwd); shift
suites=("$@")
[ ${#suites[@]} -gt 0 ] || suites=(cross export reliability)
here="$(cd "$(dirname "$0")" && pwd)"
command -v valgrind >/dev/null || { echo "$0: valgrind is not installed" >&2; exit 2; }
if ldd "$build/src/cli/quaver" | grep -q libasan; then
  echo "$0: $build is a sanitizer build; use one without -Db_sanitize" >&2
  exit 2
fi
logs="$build/valgrind-logs"
rm -rf "$logs"; mkdir -p "$logs"
export QV_VALGRIND_LOGS="$logs"

args=()
for s in "${suites[@]}"; do args+=(--suite "$s"); done
start=$(date +%s)
meson test -C "$build" --wrapper "$here/valgrind-wrap.sh" --timeout-multiplier 30 \
  --num-processes 2 --print-errorlogs "${args[@]}"
tests_status=$?
end=$(date +%s)

n=$(find "$logs" -name '*.log' | wc -l)
bad=$(grep -L -E 'ERROR SUMMARY: 0 errors' "$logs"/*.log 2>/dev/null | wc -l)
definite=$(grep -h 'definitely lost:' "$logs"/*.log 2>/dev/null \
           | awk '{gsub(",", "", $4); s += $4} END {print s + 0}')
echo "valgrind: ${#suites[@]} suite(s) (${suites[*]}), $n processes checked in $((end - start)) s;" \
     "$bad with errors or definite leaks; definitely lost in all: $definite bytes"
if [ "$bad" -gt 0 ]; then
  echo "valgrind: logs that reported something:"
  grep -L -E 'ERROR SUMMARY: 0 errors' "$logs"/*.log | head -20
fi
[ $tests_status -eq 0 ] && [ "$bad" -eq 0 ] && [ "$definite" -eq 0 ]
