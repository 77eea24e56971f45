#!/usr/bin/env bash
# valgrind-quaver.sh — runs the real quaver ($QV_VALGRIND_QUAVER) under
# Valgrind memcheck. Put in place of $QUAVER by valgrind-wrap.sh; not meant
# to be called by hand (see run-valgrind.sh).
#
# A memcheck error or a definite leak makes the command exit 99, which the
# tests see as a wrong exit code: they fail. Valgrind's report goes to one
# log per process in $QV_VALGRIND_LOGS, so the messages the tests check on
# stderr stay as they are.
# SPDX-License-Identifier: GPL-3.0-or-later
set -u
: "${QV_VALGRIND_QUAVER:?set by valgrind-wrap.sh}"
: "${QV_VALGRIND_LOGS:?set by valgrind-wrap.sh}"
supp="$(cd "$(dirname "$0")/.." && pwd)/valgrind.supp"
export G_SLICE=always-malloc G_DEBUG=gc-friendly
exec valgrind --tool=memcheck --error-exitcode=99 --leak-check=full \
  --show-leak-kinds=definite --errors-for-leak-kinds=definite \
  --suppressions="$supp" --num-callers=30 \
  --log-file="$QV_VALGRIND_LOGS/quaver.%p.log" \
  "$QV_VALGRIND_QUAVER" "$@"
