#!/usr/bin/env python3
# qv-symmetry-embed.py — writes a text file as a C string (the character
# tables for qv-character-table.c), so the library carries its data.
# SPDX-License-Identifier: GPL-3.0-or-later
import sys

src, out, symbol = sys.argv[1], sys.argv[2], sys.argv[3]
with open(src, 'rb') as f:
    data = f.read()
with open(out, 'w', encoding='ascii') as f:
    f.write('/* generated from %s by qv-symmetry-embed.py; do not edit */\n' % src.split('/')[-1])
    f.write('const char %s[] =\n' % symbol)
    for line in data.split(b'\n'):
        esc = ''.join('\\%03o' % b if (b < 32 or b > 126 or b in (34, 92, 63)) else chr(b) for b in line)
        f.write('  "%s\\n"\n' % esc)
    f.write('  ;\n')
