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

/* ------------------------------------------------------------------ */
/* Writing                                                              */

/* A free key=value pair for the comment line ("mode", "7"). The value is
 * written bare when it is a plain word, otherwise in double quotes with
 * '"' and '\\' escaped; keys must be plain words (letters, digits, '_',
 * '-', '.'). */
typedef struct {
  const char *key;
  const char *value;
} QvXyzPair;

typedef enum {
  QV_XYZ_PLAIN,              /* count, comment, "Symbol x y z" lines; the
                                comment line holds the pairs (or @comment) */
  QV_XYZ_EXTENDED,           /* Properties=species:S:1:pos:R:3[:velocities:R:3]
                                [:forces:R:3][:masses:R:1], Lattice and pbc
                                when the structure has a cell, energy= when
                                given, then the pairs */
} QvXyzStyle;

typedef enum {
  QV_XYZ_FIXED,              /* "%.10f": 1e-10 Å, columns line up (default) */
  QV_XYZ_EXACT,              /* "%.17g": reads back to the same double */
} QvXyzPrecision;

/* One frame. Everything but @style may be left zero/NULL: the structure's
 * own positions, no extra columns, no pairs. Numbers are written in the C
 * locale whatever the process locale. Species are element symbols (labels
 * are not written: "C1" would read back as carbon anyway). */
typedef struct {
  QvXyzStyle style;
  QvXyzPrecision precision;
  const double *positions;   /* 3N Å, or NULL for the structure's own */
  const double *velocities;  /* 3N or NULL: a velocities:R:3 column (extended
                                only; state the unit in a pair, e.g.
                                velocity_unit=A/fs) */
  const double *forces;      /* 3N eV/Å or NULL: a forces:R:3 column (extended) */
  gboolean masses;           /* a masses:R:1 column (extended) */
  gboolean has_energy;       /* energy= (extended) */
  double energy;             /* eV */
  const QvXyzPair *pairs;    /* @n_pairs free key=value pairs, in order */
  gsize n_pairs;
  const char *comment;       /* plain style without pairs: the comment line
                                as is (line breaks become spaces) */
} QvXyzFrame;

/* Appends one frame (count line, comment line, atom lines) to @out. */
void qv_xyz_append_frame (GString *out, const QvStructure *structure,
                          const QvXyzFrame *frame);

/* @n_frames frames of the same structure (its species, cell and masses;
 * positions from each frame) as one newly allocated document. */
char *qv_xyz_format (const QvStructure *structure, const QvXyzFrame *frames,
                     gsize n_frames, gsize *length);

/* The same, written atomically to @path through qv_output_write (an existing
 * file is refused unless @force; QV_ERROR_WRITE). */
gboolean qv_xyz_write_file (const char *path, const QvStructure *structure,
                            const QvXyzFrame *frames, gsize n_frames,
                            gboolean force, GError **error);

G_END_DECLS
