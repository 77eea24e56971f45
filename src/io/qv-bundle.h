/* qv-bundle.h — the Quaver bundle, *.quaver.json (docs/formats.md,
 * data/quaver-bundle.schema.json).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-intensity.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* Deepest JSON nesting accepted (checked before parsing). */
#define QV_BUNDLE_MAX_DEPTH 64
/* Largest Hessian dimension stored inline; beyond it, a file beside the bundle. */
#define QV_BUNDLE_MAX_INLINE_N 600
/* The largest |wavenumber| (cm⁻¹) a bundle's precomputed modes may give. */
#define QV_BUNDLE_MAX_WAVENUMBER 1e6

/* The view a bundle keeps so that pictures can be made again ("view";
 * every member optional). */
typedef struct {
  gboolean present;            /* the bundle has a "view" */
  gboolean has_orientation;
  double orientation[4];       /* unit quaternion x, y, z, w: world → view */
  gboolean has_projection;
  gboolean orthographic;
  double zoom;                 /* × the fitted frame, default 1 */
  guint mode;                  /* 1-based mode shown, 0 when not given */
} QvBundleView;

typedef struct {
  char *title;                 /* optional */
  QvStructure *structure;      /* masses with the bundle's overrides applied */
  QvMassModel mass_model;      /* the bundle's "masses" (default isotopic) */
  QvHessian *hessian;          /* eV/Å², or NULL when @modes is given */
  char *hessian_units;         /* as written in the bundle */
  char *hessian_path;          /* resolved path when referenced, else NULL */
  QvModeSet *modes;            /* precomputed modes, or NULL */
  QvBundleView view;
  /* "dipole_derivatives" / "polarizability_derivatives" (optional): the
   * tensors in the core's units (e, Å²), or NULL when the bundle has neither;
   * the units as written, or NULL. */
  QvDerivatives *derivatives;
  char *dipole_units;
  char *polarizability_units;
  /* "born_charges" and "dielectric_tensor" (optional, both or neither): the
   * Born effective charges Z*[field][displacement] of every atom (9 per
   * atom, units of e) and ε∞ (relative), for the non-analytic correction
   * of polar crystals (qv-nonanalytic.h); NULL / FALSE when absent. */
  double *born_charges;
  gboolean has_dielectric;
  double dielectric_tensor[3][3];
  /* "crystal" (optional): @structure is then a supercell (with a cell) of
   * the primitive cell @primitive and the Hessian is the supercell's; the
   * Born charges are then per primitive site. @supercell_matrix (rows: A_i
   * = Σ_j m_ij a_j) is to be checked against the structure; @band_path is
   * in the syntax of qv_band_path_parse (not parsed here); @mesh 0 0 0 when
   * not given. */
  QvStructure *primitive;      /* NULL without "crystal" */
  gboolean has_supercell_matrix;
  int supercell_matrix[3][3];
  char *band_path;
  int mesh[3];
} QvBundle;

/* @path is used for messages and to resolve a relative Hessian path, which
 * must stay beside or below the bundle's folder. */
QvBundle *qv_bundle_read_data (const char *data, gsize length, const char *path,
                               GError **error);
QvBundle *qv_bundle_read_file (const char *path, GError **error);
void qv_bundle_free (QvBundle *bundle);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvBundle, qv_bundle_free)

G_END_DECLS
