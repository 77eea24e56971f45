#!/usr/bin/python3
# SPDX-License-Identifier: GPL-3.0-or-later
# run-validator.py — runs desktop-file-validate or appstreamcli validate on a
# built file and fails on any error or warning, not only on a non-zero exit.
#
# Usage: run-validator.py desktop FILE | run-validator.py metainfo FILE
# desktop-file-validate exits 0 when it only warns or hints, so its output
# is read too: any "error:", "warning:" or "hint:" line fails (a hint such
# as "no registered main category" hides the app in menus). appstreamcli (--no-net: no network here or in CI) exits non-zero
# on errors and warnings; its pedantic notes are not asked for. Exit 77
# (skip) when the tool is not installed.

import shutil
import subprocess
import sys


def main():
  if len(sys.argv) != 3 or sys.argv[1] not in ('desktop', 'metainfo'):
    print('usage: run-validator.py desktop|metainfo FILE', file=sys.stderr)
    return 2
  kind, path = sys.argv[1], sys.argv[2]
  if kind == 'desktop':
    cmd = ['desktop-file-validate', path]
  else:
    cmd = ['appstreamcli', 'validate', '--no-net', '--explain', path]
  if shutil.which(cmd[0]) is None:
    print('SKIP: %s not found' % cmd[0])
    return 77
  print('$ ' + ' '.join(cmd))
  proc = subprocess.run(cmd, stdout=subprocess.PIPE, stderr=subprocess.STDOUT,
                        universal_newlines=True)
  print(proc.stdout, end='')
  bad = [l for l in proc.stdout.splitlines()
         if 'error:' in l or 'warning:' in l or 'hint:' in l
         or l.startswith(('E:', 'W:'))]
  if proc.returncode != 0 or bad:
    print('FAIL: %s exited %d with %d error/warning/hint line(s)'
          % (cmd[0], proc.returncode, len(bad)))
    return 1
  print('ok: %s is valid' % path)
  return 0


if __name__ == '__main__':
  sys.exit(main())
