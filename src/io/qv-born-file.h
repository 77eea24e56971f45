/* qv-born-file.h — Born effective charges and the high-frequency dielectric
 * tensor of a crystal as a small text file (docs/methods.md, "Non-analytic
 * correction").
 *
 *   # comments after '#'; blank lines are ignored
 *   dielectric            9 numbers follow: ε∞ row by row (relative, no unit)
 *   2.3 0 0
 *   0 2.3 0
 *   0 0 2.3
 *   born                  9 numbers per primitive atom, in its order: Z*_κ
 *   1.1 0 0               row by row, Z*[field γ][displacement α], in units
 *   0 1.1 0               of the elementary charge e
 *   0 0 1.1
 *   -1.1 0 0
 *   …
 *
 * The two sections may come in either order, each once.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  double epsilon[3][3];
  gsize n_atoms;
  double *born;              /* 9 n_atoms */
} QvBornCharges;

void qv_born_charges_free (QvBornCharges *born);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvBornCharges, qv_born_charges_free)

/* NULL with QV_ERROR_INPUT "NAME:LINE:COL: …" for an unknown word, a
 * number that is not finite, a section given twice or missing, or a Born
 * section whose count is not a multiple of 9. */
QvBornCharges *qv_born_charges_read_data (const char *data, gsize length, const char *name,
                                          GError **error);
QvBornCharges *qv_born_charges_read_file (const char *path, GError **error);

G_END_DECLS
