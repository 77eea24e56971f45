#!/bin/sh
# run-fuzz.sh TARGET SEEDS DICT SECONDS ARTIFACTS — one bounded libFuzzer run
# of TARGET over the committed seed corpus SEEDS (read only: new inputs go to
# a temporary folder), with the dictionary DICT ("-" for none). Fails on any
# crash, leak, timeout (5 s for one input) or memory blow-up (2 GiB); the
# input that did it is kept as ARTIFACTS/crash-… (or leak-, timeout-, oom-).
# QV_FUZZ_SECONDS in the environment overrides SECONDS.
# SPDX-License-Identifier: GPL-3.0-or-later
set -eu
target=$1 seeds=$2 dict=$3 seconds=${QV_FUZZ_SECONDS:-$4} artifacts=$5
mkdir -p "$artifacts"
work=$(mktemp -d "${TMPDIR:-/tmp}/qv-fuzz-corpus.XXXXXX")
trap 'rm -rf "$work"' EXIT INT TERM
set -- -max_total_time="$seconds" -timeout=5 -rss_limit_mb=2048 -print_final_stats=1 \
  -artifact_prefix="$artifacts/"
if [ "$dict" != "-" ]; then
  set -- "$@" -dict="$dict"
fi
# detect_leaks: libFuzzer reports a leak as a failure only with LeakSanitizer
# on. Its own exit status for a crash is 77, which meson would count as a
# skipped test: any failure becomes 1.
status=0
ASAN_OPTIONS=${ASAN_OPTIONS:+$ASAN_OPTIONS:}detect_leaks=1 \
  "$target" "$@" -error_exitcode=1 -timeout_exitcode=1 "$work" "$seeds" || status=$?
if [ "$status" -ne 0 ]; then
  echo "run-fuzz: $(basename "$target") failed (exit status $status); the input is in $artifacts" >&2
  exit 1
fi
