#!/usr/bin/python3
# SPDX-License-Identifier: GPL-3.0-or-later
# check-icons.py — the app icons are what the icon theme and GTK expect.
#
# Usage: check-icons.py [SOURCE_ROOT]
# Checks, from the freedesktop Icon Theme spec and GTK's handling of
# symbolic icons (GTK 4 recolours a symbolic SVG by forcing `fill` on every
# rect, circle and path, so strokes and other colours come out wrong):
#   - the full-colour icon is an SVG on a 128x128 canvas with no <text>, no
#     embedded or linked images and no external references;
#   - the symbolic icon is 16x16, uses only rect/circle/ellipse/path
#     shapes, and paints them only with fill #2e3436 (no strokes, no
#     gradients, no opacity below 1);
#   - both render with rsvg-convert, when it is installed, to a picture
#     that is neither empty nor filled edge to edge.

import os
import shutil
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

SVG = '{http://www.w3.org/2000/svg}'
ICONS = 'data/icons/hicolor'
APP = ICONS + '/scalable/apps/org.quaverlab.Quaver.svg'
SYMBOLIC = ICONS + '/symbolic/apps/org.quaverlab.Quaver-symbolic.svg'
SHAPES = {'rect', 'circle', 'ellipse', 'path', 'polygon', 'g'}

problems = []


def fail(path, msg):
  problems.append('%s: %s' % (path, msg))


def style_props(el):
  props = dict(el.attrib)
  for decl in el.get('style', '').split(';'):
    if ':' in decl:
      k, v = decl.split(':', 1)
      props[k.strip()] = v.strip()
  return props


def check_canvas(path, root, size):
  if root.tag != SVG + 'svg':
    fail(path, 'the root element is not <svg>')
    return
  for attr in ('width', 'height'):
    if root.get(attr) != str(size):
      fail(path, '%s is %r, expected %d' % (attr, root.get(attr), size))
  if root.get('viewBox', '').split() != ['0', '0', str(size), str(size)]:
    fail(path, 'viewBox is %r, expected "0 0 %d %d"' % (root.get('viewBox'), size, size))


def check_app(path):
  root = ET.parse(path).getroot()
  check_canvas(path, root, 128)
  for el in root.iter():
    tag = el.tag.replace(SVG, '')
    if tag in ('text', 'image', 'use', 'foreignObject', 'script'):
      fail(path, 'has a <%s> element' % tag)
    for k, v in el.attrib.items():
      if k.endswith('href') and not v.startswith('#'):
        fail(path, 'refers to %s' % v)


def check_symbolic(path):
  root = ET.parse(path).getroot()
  check_canvas(path, root, 16)
  shapes = 0
  for el in root.iter():
    tag = el.tag.replace(SVG, '')
    if tag == 'svg':
      continue
    if tag not in SHAPES:
      fail(path, '<%s> is not a plain shape' % tag)
      continue
    p = style_props(el)
    if p.get('stroke', 'none') != 'none' or 'stroke-width' in p:
      fail(path, '<%s> has a stroke; GTK fills every shape instead' % tag)
    if 'fill' in p and p['fill'].lower() != '#2e3436':
      fail(path, '<%s> is filled with %s, not #2e3436' % (tag, p['fill']))
    for k in ('opacity', 'fill-opacity'):
      if k in p and float(p[k]) < 1:
        fail(path, '<%s> has %s %s' % (tag, k, p[k]))
    if tag != 'g':
      shapes += 1
  fills = [style_props(el).get('fill') for el in root.iter()]
  if '#2e3436' not in [f.lower() for f in fills if f]:
    fail(path, 'no fill #2e3436 anywhere')
  if shapes == 0:
    fail(path, 'no shapes')


def check_render(path, size):
  if shutil.which('rsvg-convert') is None:
    print('note: rsvg-convert not found, %s not rendered' % path)
    return
  with tempfile.TemporaryDirectory(prefix='quaver-icon-') as tmp:
    png = os.path.join(tmp, 'icon.png')
    p = subprocess.run(['rsvg-convert', '-w', str(size), '-h', str(size), '-o', png, path],
                       stdout=subprocess.PIPE, stderr=subprocess.STDOUT,
                       universal_newlines=True)
    if p.returncode != 0:
      fail(path, 'rsvg-convert failed: ' + p.stdout.strip())
      return
    # Count opaque pixels through ImageMagick when it is there; a PNG
    # decoder in plain Python is not worth it for this.
    if shutil.which('/usr/bin/convert') is None:
      return
    p = subprocess.run(['/usr/bin/convert', png, '-alpha', 'extract', '-format', '%[fx:mean]', 'info:'],
                       stdout=subprocess.PIPE, stderr=subprocess.PIPE, universal_newlines=True)
    try:
      covered = float(p.stdout.strip())
    except ValueError:
      print('note: could not measure %s: %s' % (path, p.stderr.strip()))
      return
    print('%s at %d px: %.0f%% covered' % (path, size, 100 * covered))
    if not 0.05 < covered < 0.95:
      fail(path, 'renders %.0f%% covered at %d px' % (100 * covered, size))


def main():
  here = os.path.dirname(os.path.abspath(__file__))
  root = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else
                         os.environ.get('QV_SOURCE_ROOT', os.path.join(here, '..', '..')))
  app, sym = os.path.join(root, APP), os.path.join(root, SYMBOLIC)
  for path in (app, sym):
    if not os.path.isfile(path):
      fail(path, 'missing')
  if not problems:
    try:
      check_app(app)
      check_symbolic(sym)
    except ET.ParseError as e:
      fail('icon', 'not well-formed XML: %s' % e)
  if not problems:
    check_render(app, 128)
    check_render(app, 32)
    check_render(sym, 16)
  for p in problems:
    print('FAIL: ' + p)
  if not problems:
    print('ok: icons')
  return 1 if problems else 0


if __name__ == '__main__':
  sys.exit(main())
