#!/usr/bin/python3
# SPDX-License-Identifier: GPL-3.0-or-later
# check-potfiles.py — po/POTFILES.in names every file with translatable
# strings, and only files that exist.
#
# Usage: check-potfiles.py [--potfiles FILE] [SOURCE_ROOT]
# SOURCE_ROOT defaults to $QV_SOURCE_ROOT, then to the tree this script is
# in; FILE defaults to SOURCE_ROOT/po/POTFILES.in. Exit 0 when complete,
# 1 naming each problem.
#
# A file "has translatable strings" when it is (conventions of gettext,
# GtkBuilder, the desktop-entry spec, AppStream, GSettings and
# shared-mime-info; common practice):
#   - C source or header (.c, .h) calling _( ), N_( ), C_( ), NC_( ),
#     ngettext( ), g_dngettext( ) or g_dpgettext2( );
#   - a GtkBuilder file (.ui) with translatable="yes";
#   - a desktop entry template (.desktop.in) or an AppStream template
#     (.metainfo.xml.in, .appdata.xml.in);
#   - a GSettings schema (.gschema.xml or .gschema.xml.in) with <summary> or
#     <description>;
#   - a shared-mime-info file (.mime.xml) with <comment>.
# Tests, po/ and build directories are not scanned.

import argparse
import os
import re
import sys

C_CALL = re.compile(r'(?<![A-Za-z0-9_])(?:_|N_|C_|NC_|ngettext|g_dngettext|g_dpgettext2)\s*\(')
UI_TRANSLATABLE = re.compile(r'translatable\s*=\s*["\'](?:yes|true|1)["\']')
SCHEMA_TEXT = re.compile(r'<(?:summary|description)\b')
MIME_COMMENT = re.compile(r'<comment\b')

SKIP_DIRS = {'.git', 'po', 'tests', 'subprojects', '.ci', 'node_modules'}


def is_build_dir(path):
  return (os.path.isdir(os.path.join(path, 'meson-private'))
          or os.path.isfile(os.path.join(path, 'build.ninja')))


def read(path):
  with open(path, encoding='utf-8', errors='replace') as f:
    return f.read()


def translatable(path):
  """Why PATH needs to be in POTFILES.in, or None."""
  name = os.path.basename(path)
  if name.endswith(('.desktop.in', '.metainfo.xml.in', '.appdata.xml.in')):
    return 'a desktop or AppStream template'
  if name.endswith(('.c', '.h')):
    return 'calls _( ) or another gettext macro' if C_CALL.search(read(path)) else None
  if name.endswith('.ui'):
    return 'has translatable="yes"' if UI_TRANSLATABLE.search(read(path)) else None
  if name.endswith(('.gschema.xml', '.gschema.xml.in')):
    return 'a schema with <summary>/<description>' if SCHEMA_TEXT.search(read(path)) else None
  if name.endswith(('.mime.xml', '.mime.xml.in')):
    return 'a MIME type with <comment>' if MIME_COMMENT.search(read(path)) else None
  return None


def scan(root):
  found = {}
  for dirpath, dirnames, filenames in os.walk(root):
    rel_dir = os.path.relpath(dirpath, root)
    keep = []
    for d in dirnames:
      full = os.path.join(dirpath, d)
      if rel_dir == '.' and d in SKIP_DIRS:
        continue
      if d.startswith('.') or is_build_dir(full):
        continue
      keep.append(d)
    dirnames[:] = sorted(keep)
    for f in sorted(filenames):
      full = os.path.join(dirpath, f)
      why = translatable(full)
      if why:
        found[os.path.relpath(full, root).replace(os.sep, '/')] = why
  return found


def read_potfiles(path):
  listed = []
  for lineno, line in enumerate(read(path).splitlines(), 1):
    line = line.strip()
    if not line or line.startswith('#'):
      continue
    listed.append((lineno, line))
  return listed


def main():
  here = os.path.dirname(os.path.abspath(__file__))
  ap = argparse.ArgumentParser(description=__doc__)
  ap.add_argument('--potfiles', help='POTFILES.in to check')
  ap.add_argument('root', nargs='?',
                  default=os.environ.get('QV_SOURCE_ROOT',
                                         os.path.normpath(os.path.join(here, '..', '..'))))
  args = ap.parse_args()
  root = os.path.abspath(args.root)
  potfiles = args.potfiles or os.path.join(root, 'po', 'POTFILES.in')

  listed = read_potfiles(potfiles)
  names = {name for _, name in listed}
  found = scan(root)
  problems = []
  for lineno, name in listed:
    if not os.path.isfile(os.path.join(root, name)):
      problems.append('%s:%d: %s is listed but does not exist' % (potfiles, lineno, name))
  for name, why in sorted(found.items()):
    if name not in names:
      problems.append('%s: %s (%s) is missing; add it to %s'
                      % (name, 'has translatable strings', why, potfiles))
  for p in problems:
    print(p)
  print('%d files with translatable strings found, %d listed, %d problems'
        % (len(found), len(listed), len(problems)))
  return 1 if problems else 0


if __name__ == '__main__':
  sys.exit(main())
