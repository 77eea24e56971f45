/* qv-mode-character.h — what each normal mode is made of: the share of
 * every valence internal coordinate (qv-internal-coordinates.h) by the
 * normalised potential energy distribution, grouped into families
 * ("C–H stretch 82 %, H–C–H bend 11 %").
 *
 * Method (docs/methods.md, "Internal-coordinate make-up"):
 *   B    the Wilson B matrix of the perceived, generally redundant, set;
 *   G    = B M⁻¹ Bᵀ, G⁺ its Moore–Penrose inverse, A = M⁻¹ Bᵀ G⁺ (Wilson's
 *        A matrix; Pulay & Fogarasi, J. Chem. Phys. 96, 2856, 1992);
 *   F    = Aᵀ H A, the internal force constants the Cartesian Hessian H
 *        implies (without a Hessian: Σ_k λ_k (G⁺ L_k)(G⁺ L_k)ᵀ over every
 *        vibration, the same matrix);
 *   L_k  = B l_k/√m, the change of every coordinate per unit normal
 *        coordinate Q_k;
 *   PED_ik = F_ii L_ik² / λ_k (Morino & Kuchitsu, J. Chem. Phys. 20, 1809,
 *        1952), here normalised so a mode's shares add to 1:
 *        share_ik = |F_ii| L_ik² / Σ_j |F_jj| L_jk²; a degenerate set of
 *        modes shares one distribution (summed over the set, so it does not
 *        depend on the basis chosen inside it).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-internal-coordinates.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* One line for captions and JSON "method". */
#define QV_MODE_CHARACTER_METHOD "normalised potential energy distribution"
/* The sources, for captions and JSON "reference". */
#define QV_MODE_CHARACTER_REFERENCE \
  "PED_ik = F_ii L_ik^2 / lambda_k (Morino & Kuchitsu, J. Chem. Phys. 20, 1809, 1952), " \
  "normalised to sum 1 per mode; F = A^T H A with A = M^-1 B^T G^+ in redundant valence " \
  "coordinates (Pulay & Fogarasi, J. Chem. Phys. 96, 2856, 1992)"

typedef struct {
  const char *name;          /* a family ("C–H stretch") or a coordinate
                                ("C1–H5"), owned by the QvModeCharacter */
  double share;              /* 0..1 */
  gsize coordinate;          /* coordinates: index into the set; families:
                                index of the family (qv_mode_character_family_name) */
} QvCharacterItem;

typedef struct _QvModeCharacter QvModeCharacter;

/* The make-up of every mode of @modes (solved for @structure). @hessian is
 * the Cartesian Hessian (3N × 3N, eV/Å², any symmetric storage order) or
 * NULL: then F is rebuilt from the modes, which needs every vibration
 * (QV_ERROR_USAGE for a --lowest mode set without a Hessian).
 * QV_ERROR_INPUT when no bonds are found (nothing to describe the modes
 * with) or the sizes disagree. */
QvModeCharacter *qv_mode_character_new (const QvStructure *structure, const QvModeSet *modes,
                                        const double *hessian, GError **error);
void qv_mode_character_free (QvModeCharacter *character);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvModeCharacter, qv_mode_character_free)

const QvInternalCoordinates *qv_mode_character_coordinates (const QvModeCharacter *c);
gsize qv_mode_character_n_modes (const QvModeCharacter *c);
/* Rank of G: how many independent vibrations the coordinates can describe. */
gsize qv_mode_character_rank (const QvModeCharacter *c);
/* Diagonal internal force constants F_ii, n_coordinates values (eV/Å² for
 * stretches, eV/rad² for angles). */
const double *qv_mode_character_force_constants (const QvModeCharacter *c);
/* Shares of every coordinate in mode k, in the set's order (sum 1, or all
 * 0 for a mode the coordinates do not describe). */
const double *qv_mode_character_shares (const QvModeCharacter *c, gsize k);
/* L_k = B l_k/√m, n_coordinates values (Å or rad per u^½ Å). */
const double *qv_mode_character_displacements (const QvModeCharacter *c, gsize k);
/* Families of mode k, largest share first; returns the count. */
gsize qv_mode_character_families (const QvModeCharacter *c, gsize k,
                                  const QvCharacterItem **items);
/* Every coordinate of mode k, largest share first; returns the count. */
gsize qv_mode_character_items (const QvModeCharacter *c, gsize k,
                               const QvCharacterItem **items);
/* Σ_i F_ii L_ik² / λ_k: 1 when the diagonal terms carry the mode's whole
 * potential energy, far from 1 when off-diagonal couplings matter or the set
 * is redundant; NAN for a zero eigenvalue. */
double qv_mode_character_diagonal_sum (const QvModeCharacter *c, gsize k);
/* L_kᵀ G⁺ L_k in [0, 1]: the part of mode k (mass-weighted norm²) the
 * coordinates describe; below 1 when they do not span every vibration. */
double qv_mode_character_described (const QvModeCharacter *c, gsize k);
/* Notes of the coordinate set and of the method, NULL-terminated. */
char *const *qv_mode_character_notes (const QvModeCharacter *c);

/* "C–H stretch 82 %, H–C–H bend 11 %": families of at least 0.5 %, the
 * first @max_items of them (0: all); "not described by the internal
 * coordinates" when none. */
char *qv_mode_character_summary (const QvModeCharacter *c, gsize k, gsize max_items);

G_END_DECLS
