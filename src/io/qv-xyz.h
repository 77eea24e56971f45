/* qv-xyz.h — XYZ and extended XYZ, multi-frame.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

/* Returns a GPtrArray of QvStructure* (one per frame, free function set), or
 * NULL with QV_ERROR_INPUT "FILE:LINE:COL: …". Plain XYZ: count line, comment
 * line, "Symbol x y z" lines (a number in place of the symbol is read as Z;
 * "D" and "T" are hydrogen with mass number 2 and 3; a symbol followed by
 * digits, "C1", is that element with the text kept as its label; symbols are
 * case-insensitive; further columns are ignored). Extended XYZ: the
 * comment line's key=value pairs — Lattice="ax ay az bx …" (Å), pbc="T T F",
 * energy= (eV), Properties=species:S:1:pos:R:3[:forces:R:3][:masses:R:1]
 * (other properties are skipped by their declared width; every atom line
 * must then have exactly the declared columns). A Lattice without pbc is
 * periodic in all three directions; a periodic pbc without a Lattice is an
 * error. Keys are case-insensitive; a comment with no key=value pair is kept
 * as the structure's comment. LF or CRLF line ends; blank lines may follow the
 * last frame; a frame of 0 atoms or more than 10 million is an error. Columns
 * in messages count bytes from 1. @name is what the messages call the
 * file. */
GPtrArray *qv_xyz_read_data (const char *data, gsize length, const char *name,
                             GError **error);
GPtrArray *qv_xyz_read_file (const char *path, GError **error);

G_END_DECLS
