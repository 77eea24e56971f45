/* qv-bundle-writer.h — writes a Quaver bundle (*.quaver.json, version 1)
 * that qv-bundle.h reads back to the same structure, masses, Hessian,
 * view, derivative tensors and crystal (docs/formats.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-bundle.h"

G_BEGIN_DECLS

/* The name of the matrix file a bundle at @path gets when its Hessian is
 * too large to be inline (3N > QV_BUNDLE_MAX_INLINE_N): "NAME.quaver.json"
 * → "NAME.hessian.npy" in the same folder (newly allocated, a full path). */
char *qv_bundle_writer_hessian_path (const char *path);

/* The bundle as JSON text. What is written, from @bundle:
 *   title; the structure (atoms with element, position, label; cell, pbc
 *   when they are not the default for the cell; energy; forces); "masses"
 *   from @mass_model, and per atom an "isotope" (when the atom's mass is
 *   that isotope's in the table) or a "mass" wherever the mass differs from
 *   the model's; the Hessian (eV/Å², "full" layout) inline when @hessian_file
 *   is NULL, else as {"path": @hessian_file} (relative to the bundle's
 *   folder), or the precomputed modes (wavenumbers and Cartesian
 *   displacements); the view (only the members it has); the derivative
 *   tensors in the core's units ("e", "A^2"); the crystal (primitive cell,
 *   supercell matrix, path, mesh); Born charges and ε∞.
 * Every number is written so that it reads back to the same double.
 * Inline needs 3N ≤ QV_BUNDLE_MAX_INLINE_N (else QV_ERROR_LIMIT). */
char *qv_bundle_format (const QvBundle *bundle, const char *hessian_file, gsize *length,
                        GError **error);

/* Writes @bundle to @path atomically (qv-output.h); a Hessian larger than
 * inline goes to qv_bundle_writer_hessian_path (@path) as NumPy .npy,
 * written first (qv-hessian-writer.h) and removed again when the bundle
 * itself cannot be written. An existing bundle or matrix file is refused
 * (QV_ERROR_WRITE, nothing written) unless @force. The path of the matrix
 * file written, or NULL, in @hessian_written (may be NULL). The .npy holds
 * row i as H_i1 … H_in; Quaver's readers keep a row-major file transposed in
 * storage (qv-hessian.h), so only an asymmetric matrix would read back as
 * its transpose — the same matrix to the solver, which symmetrises. */
gboolean qv_bundle_write_file (const char *path, const QvBundle *bundle, gboolean force,
                               char **hessian_written, GError **error);

G_END_DECLS
