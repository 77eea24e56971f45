#!/usr/bin/python3
# SPDX-License-Identifier: GPL-3.0-or-later
# check-translation.py — a translation is complete: every message of a
# template generated now from po/POTFILES.in has a non-empty, non-fuzzy
# translation in po/LANG.po, and msgfmt --check accepts the result.
#
# Usage: check-translation.py [--lang de] [SOURCE_ROOT]
# The template is made the way `meson compile quaver-pot` makes it (xgettext
# with meson's 'glib' preset), into a temporary directory; the source tree
# is not touched. LANG.po is merged with it by msgmerge (so a string that
# changed in the source turns fuzzy or untranslated, as it would for a
# translator) and the merge is counted with `msgfmt --statistics`.
# Exit 0 complete, 1 incomplete or invalid, 77 (skip) without xgettext,
# msgmerge or msgfmt.
#
# Registered as the desktop test translation-complete; by hand:
# tests/desktop/check-translation.py --lang de

import argparse
import os
import re
import shutil
import subprocess
import sys
import tempfile

# The xgettext arguments of meson's i18n.gettext(preset: 'glib'), read from
# the installed meson when possible so the two cannot drift apart.
try:
  from mesonbuild.modules.i18n import PRESET_ARGS
  GLIB_PRESET = list(PRESET_ARGS['glib'])
except Exception:  # an older or a differently installed meson
  GLIB_PRESET = ['--from-code=UTF-8', '--add-comments', '--keyword=_',
                 '--keyword=N_', '--keyword=C_:1c,2', '--keyword=NC_:1c,2',
                 '--keyword=g_dcgettext:2', '--keyword=g_dngettext:2,3',
                 '--keyword=g_dpgettext2:2c,3']


def run(cmd, **kw):
  return subprocess.run(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                        universal_newlines=True, **kw)


def main():
  here = os.path.dirname(os.path.abspath(__file__))
  ap = argparse.ArgumentParser()
  ap.add_argument('--lang', default='de')
  ap.add_argument('root', nargs='?',
                  default=os.environ.get('QV_SOURCE_ROOT',
                                         os.path.normpath(os.path.join(here, '..', '..'))))
  args = ap.parse_args()
  root = os.path.abspath(args.root)
  po = os.path.join(root, 'po', args.lang + '.po')

  for tool in ('xgettext', 'msgmerge', 'msgfmt'):
    if shutil.which(tool) is None:
      print('SKIP: %s not found' % tool)
      return 77
  if not os.path.isfile(po):
    print('FAIL: %s does not exist' % po)
    return 1

  linguas = open(os.path.join(root, 'po', 'LINGUAS'), encoding='utf-8').read().split()
  problems = []
  if args.lang not in linguas:
    problems.append('%s is not in po/LINGUAS' % args.lang)

  with tempfile.TemporaryDirectory(prefix='quaver-po-') as tmp:
    pot = os.path.join(tmp, 'quaver.pot')
    merged = os.path.join(tmp, args.lang + '.po')
    p = run(['xgettext', '--package-name=quaver', '-D', root, '-o', pot,
             '--files-from', os.path.join(root, 'po', 'POTFILES.in')] + GLIB_PRESET)
    if p.returncode != 0:
      print(p.stderr, end='')
      print('FAIL: xgettext could not make the template')
      return 1
    p = run(['msgmerge', '--quiet', '--no-fuzzy-matching', '-o', merged, po, pot])
    if p.returncode != 0:
      print(p.stderr, end='')
      print('FAIL: msgmerge could not merge %s' % po)
      return 1
    # The file as written must be valid too, not only the merge.
    for path in (po, merged):
      p = run(['msgfmt', '--check', '--statistics', '-o', os.devnull, path],
              env=dict(os.environ, LC_ALL='C'))
      if p.returncode != 0:
        print(p.stderr, end='')
        problems.append('msgfmt --check rejects %s' % (po if path == po else 'the merge'))
    p = run(['msgfmt', '--statistics', '-o', os.devnull, merged],
            env=dict(os.environ, LC_ALL='C'))
    stats = p.stderr.strip()
    print('%s against a fresh template: %s' % (os.path.relpath(po, root), stats))
    translated = int((re.search(r'(\d+) translated', stats) or [0, 0])[1])
    fuzzy = int((re.search(r'(\d+) fuzzy', stats) or [0, 0])[1])
    untranslated = int((re.search(r'(\d+) untranslated', stats) or [0, 0])[1])
    if translated == 0:
      problems.append('nothing is translated')
    if fuzzy or untranslated:
      problems.append('%d fuzzy and %d untranslated messages' % (fuzzy, untranslated))
      # Name them, so the translator knows where to look.
      p = run(['msgattrib', '--only-fuzzy', '--no-obsolete', merged])
      if p.stdout.strip():
        print('fuzzy:\n' + p.stdout)
      p = run(['msgattrib', '--untranslated', '--no-obsolete', merged])
      if p.stdout.strip():
        print('untranslated:\n' + p.stdout)

  for pr in problems:
    print('FAIL: ' + pr)
  if not problems:
    print('ok: %s is complete' % os.path.relpath(po, root))
  return 1 if problems else 0


if __name__ == '__main__':
  sys.exit(main())
