/* qv-input.h — what a front end works on: a geometry with its Hessian, a
 * bundle, or the built-in demo, read and converted to eV/Å².
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-bundle.h"
#include "qv-hessian.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* The demo bundle's path inside the GResource that front ends link. */
#define QV_INPUT_DEMO_RESOURCE "/org/quaverlab/Quaver/examples/demo.quaver.json"

/* A bundle's "crystal" (docs/formats.md): the structure is a supercell of
 * @primitive and the Hessian the supercell's. */
typedef struct {
  QvStructure *primitive;
  gboolean has_supercell_matrix;
  int supercell_matrix[3][3];   /* rows: A_i = Σ_j m_ij a_j, to be checked */
  char *band_path;              /* qv_band_path_parse syntax, or NULL: the default */
  int mesh[3];                  /* 0 0 0: not given */
  double *born_charges;         /* 9 per primitive site (e), or NULL */
  double dielectric_tensor[3][3];
} QvInputCrystal;

void qv_input_crystal_free (QvInputCrystal *crystal);

typedef struct {
  char *name;                   /* as the user gave it ("demo" for the demo) */
  QvStructure *structure;
  QvHessian *hessian;           /* eV/Å², or NULL when @modes */
  QvModeSet *modes;             /* precomputed modes from a bundle */
  char *hessian_source;
  char *hessian_units;
  QvHessianLayout layout;
  QvMassModel mass_model;
  guint n_frames;               /* frames in the geometry file; the first is used */
  QvBundleView view;            /* a bundle's saved view (view.present) */
  QvDerivatives *derivatives;   /* a bundle's derivative tensors, or NULL */
  char *dipole_units;           /* as the bundle wrote them, or NULL */
  char *polarizability_units;
  QvInputCrystal *crystal;      /* a bundle's "crystal", or NULL */
  double hessian_scale;         /* hessian_deferred: the factor from the
                                   file's unit to eV/Å² */
} QvInput;

typedef struct {
  const char *geometry;         /* path, or NULL with demo */
  gboolean demo;
  const char *hessian;          /* path; required unless @geometry is a bundle */
  const char *hessian_units;    /* required with @hessian: never guessed */
  const char *hessian_layout;   /* NULL: detected */
  gboolean all_modes;           /* refuse, before reading the Hessian, a size
                                   the all-modes solver cannot take */
  gboolean hessian_deferred;    /* a geometry's Hessian: check the options,
                                   record its name and unit, leave it unread
                                   (the distributed solver reads its blocks) */
} QvInputOptions;

/* TRUE when @path names a bundle (*.json) rather than a geometry. */
gboolean qv_input_is_bundle (const char *path);
/* Reads everything; errors carry file:line:column and say what to pass. */
QvInput *qv_input_load (const QvInputOptions *options, GError **error);
void qv_input_free (QvInput *input);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvInput, qv_input_free)

G_END_DECLS
