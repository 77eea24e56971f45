/* qv-phonon-table.h — the tables of a crystal's phonons as `quaver bands`,
 * `quaver dos` and `quaver thermo` print them and the app saves them: text
 * (with # notes), CSV and JSON, each a newly allocated string.
 *
 *   bands:   per q point the fractional q, the path distance (1/Å with 2π)
 *            and the wavenumbers (cm⁻¹, negative = imaginary) of every
 *            branch, plus the labels with their distances;
 *   dos:     the frequency grid, the total and the partial DOS per element
 *            in a chosen frequency unit;
 *   thermal: T, F, U, S, Cv, ZPE per mole of formula units and per cell,
 *            optionally the U tensors of every site and sound velocities.
 *
 * The *Info structs carry what the table says about where the numbers came
 * from; NULL strings are left out (JSON) or shown as "-" (text).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-band-path.h"
#include "qv-phonon-dos.h"
#include "qv-phonon-thermal.h"
#include "qv-units.h"

G_BEGIN_DECLS

typedef enum {
  QV_PHONON_TABLE_TEXT,
  QV_PHONON_TABLE_CSV,
  QV_PHONON_TABLE_JSON,
} QvPhononTableFormat;

/* "text", "csv" or "json" (any case); QV_ERROR_USAGE naming them otherwise. */
gboolean qv_phonon_table_format_parse (const char *text, QvPhononTableFormat *format,
                                       GError **error);

/* Where a crystal's force constants came from. */
typedef struct {
  const char *program;         /* "quaver bands 0.1.0" (JSON "program") */
  const char *primitive;       /* the primitive cell's file */
  const char *hessian;         /* the supercell Hessian's file */
  const char *hessian_units;   /* bands only */
  const char *born;            /* Born charges file, or NULL */
  gsize n_sites;               /* sites of the primitive cell */
  gboolean sum_rule;           /* the acoustic sum rule was imposed */
} QvPhononSource;

typedef struct {
  QvPhononSource source;
  int supercell[3][3];         /* the supercell matrix */
  gsize n_cells;               /* primitive cells in it */
  const char *lattice;         /* "cF" etc. for a default path, NULL for a user path */
  const char *path;            /* qv_band_path_to_string */
  gboolean overlap;            /* branches connected by eigenvector overlap (else sorted) */
  double gamma_acoustic[3];    /* acoustic wavenumbers at Γ before the sum rule, cm⁻¹ */
  double row_sum_removed;      /* largest row sum the sum rule removed, eV/Å² */
  double periodicity_residual; /* qv_force_constants_periodicity */
} QvBandTableInfo;

/* @wavenumbers: n_q × @n_branches, cm⁻¹, in connected order (branch b at q
 * point k is wavenumbers[k·nb + b]). */
char *qv_phonon_table_bands (const QvBandTableInfo *info, const QvBandSampling *sampling,
                             gsize n_branches, const double *wavenumbers,
                             QvPhononTableFormat format);

typedef struct {
  QvPhononSource source;
  gsize n_q;                   /* points of the mesh (dos->mesh) */
  QvFrequencyUnit unit;        /* of the grid; the DOS is per this unit */
} QvDosTableInfo;

char *qv_phonon_table_dos (const QvDosTableInfo *info, const QvPhononDos *dos,
                           QvPhononTableFormat format);

/* A sound velocity along one direction (`quaver thermo --sound`). */
typedef struct {
  double given[3];             /* the direction as given */
  gboolean ok;
  const char *message;         /* why there is none, when !ok */
  QvSoundVelocity v;           /* when ok */
} QvSoundTableEntry;

typedef struct {
  QvPhononSource source;
  int mesh[3];
  gsize n_q;
  const char *formula;         /* formula unit, e.g. "KBr" */
  gsize formula_units;         /* formula units per primitive cell */
  const guint *site_z;         /* n_sites atomic numbers (for the U tensors' columns) */
  const double *adp;           /* NULL, or n_t × n_sites × 9 U tensors (Å²) */
  gsize n_sound;               /* sound velocities (not in CSV) */
  const QvSoundTableEntry *sound;
  gboolean sound_cartesian;    /* the directions are Cartesian (else fractional reciprocal) */
} QvThermalTableInfo;

/* The table of @thermal; CSV has no sound velocities (they are not a
 * column: the caller refuses --sound with CSV). */
char *qv_phonon_table_thermal (const QvThermalTableInfo *info, const QvThermal *thermal,
                               QvPhononTableFormat format);

G_END_DECLS
