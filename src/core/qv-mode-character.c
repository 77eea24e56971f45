/* qv-mode-character.c — normalised potential energy distribution of every
 * mode over the perceived valence coordinates (the formulas are in the
 * header and in docs/methods.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <lapacke.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-error.h"
#include "qv-mode-character.h"

/* Eigenvalues of G below this fraction of the largest are redundancies
 * (common practice for generalised inverses: far above rounding, ~1e-16,
 * far below any real kinetic coupling of a valence coordinate). */
#define G_RANK_TOLERANCE 1e-9

/* Largest nc × n_modes kept in memory (about 1 GB with the per-mode
 * items); (3N)² may be 0.8 of it (four such matrices with a Hessian). */
#define QV_MODE_CHARACTER_MAX_ENTRIES 2e7

/* Modes whose wavenumbers differ by less than this (cm⁻¹, plus 1e-6
 * relative) form one degenerate set (common practice). */
#define DEGENERATE_CM1 1e-3

struct _QvModeCharacter {
  QvInternalCoordinates *ic;
  gsize n_modes, n_coords, rank;
  double *force_constants;     /* n_coords */
  double *displacements;       /* n_modes × n_coords */
  double *shares;              /* n_modes × n_coords */
  double *diagonal;            /* n_modes */
  double *described;           /* n_modes */
  gsize n_families;
  char **family_names;         /* n_families, borrowed from ic */
  gsize *family_of;            /* n_coords */
  QvCharacterItem *families;   /* n_modes × n_families, sorted per mode */
  QvCharacterItem *items;      /* n_modes × n_coords, sorted per mode */
  char **notes;
};

static int
compare_item (const void *pa, const void *pb)
{
  const QvCharacterItem *a = pa, *b = pb;

  if (a->share != b->share)
    return a->share > b->share ? -1 : 1;
  return a->coordinate < b->coordinate ? -1 : a->coordinate > b->coordinate;
}

/* The Moore–Penrose inverse of the symmetric n × n @g from its
 * eigen-decomposition into @gplus; returns the rank
 * or -1 when LAPACK fails. */
static gssize
pseudo_inverse (double *g, gsize n, double *gplus)
{
  g_autofree double *w = g_new (double, n);
  g_autofree double *v = g_new (double, n * n);
  double wmax = 0.0;
  gsize rank = 0;

  memcpy (v, g, n * n * sizeof *v);
  if (LAPACKE_dsyevd (LAPACK_ROW_MAJOR, 'V', 'U', (lapack_int) n, v, (lapack_int) n, w) != 0)
    return -1;
  for (gsize i = 0; i < n; i++)
    wmax = MAX (wmax, fabs (w[i]));
  memset (gplus, 0, n * n * sizeof *gplus);
  for (gsize e = 0; e < n; e++)
    {
      if (!(w[e] > G_RANK_TOLERANCE * wmax))
        continue;
      rank++;
      for (gsize i = 0; i < n; i++)
        {
          double f = v[i * n + e] / w[e];
          for (gsize j = 0; j < n; j++)
            gplus[i * n + j] += f * v[j * n + e];
        }
    }
  return (gssize) rank;
}

static gboolean
same_level (const QvModeSet *modes, gsize a, gsize b)
{
  double na = qv_mode_set_wavenumber (modes, a), nb = qv_mode_set_wavenumber (modes, b);

  return fabs (na - nb) <= DEGENERATE_CM1 + 1e-6 * MAX (fabs (na), fabs (nb));
}

QvModeCharacter *
qv_mode_character_new (const QvStructure *structure, const QvModeSet *modes,
                       const double *hessian, GError **error)
{
  g_autoptr(QvInternalCoordinates) ic = NULL;
  QvModeCharacter *c;
  gsize n_at = structure->n_atoms, n = 3 * n_at, nc, nm = modes->n_modes;
  g_autofree double *bm = NULL, *cmat = NULL, *cplus = NULL, *z = NULL, *y = NULL;
  g_autofree double *energy = NULL;
  GPtrArray *notes;
  GHashTable *family_index;
  gssize rank;

  if (modes->n_atoms != n_at)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the modes are of %zu atoms but the structure has %zu", modes->n_atoms, n_at);
      return NULL;
    }
  if (hessian == NULL && (modes->lowest_only || modes->n_modes < modes->n_vibrations))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the make-up needs the internal force constants, which come from the Hessian "
                   "or from every vibration; this mode set has %zu of %zu vibrations: solve for "
                   "all modes (drop --lowest)", modes->n_modes, modes->n_vibrations);
      return NULL;
    }
  ic = qv_internal_coordinates_new (structure, QV_BONDS_DEFAULT_TOLERANCE, error);
  if (ic == NULL)
    return NULL;
  nc = ic->n_coordinates;
  if (nc == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "no bonds were found between the atoms (covalent radii, tolerance %.2f), so "
                   "there are no internal coordinates to describe the modes with; check the "
                   "geometry's units (Å)", QV_BONDS_DEFAULT_TOLERANCE);
      return NULL;
    }

  if ((double) nc * (double) MAX (nm, 1) > QV_MODE_CHARACTER_MAX_ENTRIES
      || (double) n * (double) n > 0.8 * QV_MODE_CHARACTER_MAX_ENTRIES)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "the make-up of %zu modes over %zu internal coordinates (%zu atoms) is "
                   "beyond what it keeps in memory (%.0f million shares); use it on a molecule "
                   "or a smaller fragment", nm, nc, n_at, QV_MODE_CHARACTER_MAX_ENTRIES / 1e6);
      return NULL;
    }

  /* bm = B M^-1/2 (nc × n). */
  bm = g_new (double, nc * n);
  for (gsize i = 0; i < nc; i++)
    for (gsize q = 0; q < n; q++)
      bm[i * n + q] = ic->b_matrix[i * n + q] / sqrt (modes->masses[q / 3]);
  /* The Moore–Penrose inverse through the 3N-sized C = bmᵀ bm rather than
     the nc-sized G = bm bmᵀ (same non-zero eigenvalues; bm⁺ = C⁺ bmᵀ =
     bmᵀ G⁺), so a large redundant set costs nc·(3N)², not nc³. */
  cmat = g_new0 (double, n * n);
  cblas_dsyrk (CblasRowMajor, CblasUpper, CblasTrans, (int) n, (int) nc, 1.0, bm, (int) n,
               0.0, cmat, (int) n);
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < i; j++)
      cmat[i * n + j] = cmat[j * n + i];
  cplus = g_new (double, n * n);
  rank = pseudo_inverse (cmat, n, cplus);
  if (rank < 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                   "LAPACK could not diagonalise the kinetic matrix of %zu coordinates", nc);
      return NULL;
    }

  c = g_new0 (QvModeCharacter, 1);
  c->n_modes = nm;
  c->n_coords = nc;
  c->rank = (gsize) rank;
  c->force_constants = g_new0 (double, nc);
  c->displacements = g_new0 (double, MAX (nm, 1) * nc);
  c->shares = g_new0 (double, MAX (nm, 1) * nc);
  c->diagonal = g_new0 (double, MAX (nm, 1));
  c->described = g_new0 (double, MAX (nm, 1));

  /* L = B M^-1/2 l = bm · l for every mode; the vectors are 3N × nm
     column-major, i.e. nm × 3N row-major, and L is stored mode-major. */
  if (nm > 0)
    cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasTrans, (int) nm, (int) nc, (int) n, 1.0,
                 modes->vectors, (int) n, bm, (int) n, 0.0, c->displacements, (int) nc);
  /* y_k = G⁺ L_k = (bm⁺)ᵀ l_k = bm (C⁺ l_k), mode-major nm × nc. */
  z = g_new0 (double, MAX (nm, 1) * n);
  y = g_new0 (double, MAX (nm, 1) * nc);
  if (nm > 0)
    {
      cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasNoTrans, (int) nm, (int) n, (int) n, 1.0,
                   modes->vectors, (int) n, cplus, (int) n, 0.0, z, (int) n);
      cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasTrans, (int) nm, (int) nc, (int) n, 1.0,
                   z, (int) n, bm, (int) n, 0.0, y, (int) nc);
    }
  for (gsize k = 0; k < nm; k++)
    c->described[k] = cblas_ddot ((int) nc, c->displacements + k * nc, 1, y + k * nc, 1);

  if (hessian != NULL)
    {
      /* A = M⁻¹ Bᵀ G⁺ = M^-1/2 C⁺ bmᵀ, so F_ii = bm_i W bm_iᵀ with
         W = C⁺ K C⁺ and K = M^-1/2 H M^-1/2. */
      g_autofree double *k = g_new (double, n * n);
      g_autofree double *t = g_new (double, n * n);
      g_autofree double *w = g_new (double, n * n);
      g_autofree double *bw = g_new (double, nc * n);
      for (gsize p = 0; p < n; p++)
        for (gsize q = 0; q < n; q++)
          k[p * n + q] = hessian[p * n + q] / sqrt (modes->masses[p / 3] * modes->masses[q / 3]);
      cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) n, (int) n, 1.0,
                   cplus, (int) n, k, (int) n, 0.0, t, (int) n);
      cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) n, (int) n, 1.0,
                   t, (int) n, cplus, (int) n, 0.0, w, (int) n);
      cblas_dgemm (CblasRowMajor, CblasNoTrans, CblasNoTrans, (int) nc, (int) n, (int) n, 1.0,
                   bm, (int) n, w, (int) n, 0.0, bw, (int) n);
      for (gsize i = 0; i < nc; i++)
        c->force_constants[i] = cblas_ddot ((int) n, bw + i * n, 1, bm + i * n, 1);
    }
  else
    {
      /* Aᵀ M^1/2 l_k = G⁺ B M^-1/2 l_k = y_k, so F = Σ_k λ_k y_k y_kᵀ. */
      for (gsize k = 0; k < nm; k++)
        for (gsize i = 0; i < nc; i++)
          c->force_constants[i] += modes->eigenvalues[k] * y[k * nc + i] * y[k * nc + i];
    }

  /* Energies |F_ii| L_ik², diagonal sums, then shares per degenerate set. */
  energy = g_new0 (double, MAX (nm, 1) * nc);
  for (gsize k = 0; k < nm; k++)
    {
      double diag = 0.0;
      for (gsize i = 0; i < nc; i++)
        {
          double l = c->displacements[k * nc + i];
          diag += c->force_constants[i] * l * l;
          energy[k * nc + i] = fabs (c->force_constants[i]) * l * l;
        }
      c->diagonal[k] = modes->eigenvalues[k] != 0.0 ? diag / modes->eigenvalues[k] : NAN;
    }
  for (gsize k0 = 0; k0 < nm;)
    {
      gsize k1 = k0 + 1;
      double total = 0.0;
      while (k1 < nm && same_level (modes, k1 - 1, k1))
        k1++;
      for (gsize k = k0; k < k1; k++)
        for (gsize i = 0; i < nc; i++)
          total += energy[k * nc + i];
      for (gsize i = 0; i < nc; i++)
        {
          double e = 0.0;
          for (gsize k = k0; k < k1; k++)
            e += energy[k * nc + i];
          for (gsize k = k0; k < k1; k++)
            c->shares[k * nc + i] = total > 0.0 ? e / total : 0.0;
        }
      k0 = k1;
    }

  /* Families in the order they first appear. */
  family_index = g_hash_table_new (g_str_hash, g_str_equal);
  c->family_of = g_new (gsize, nc);
  c->family_names = g_new (char *, nc);
  for (gsize i = 0; i < nc; i++)
    {
      gpointer v;
      if (g_hash_table_lookup_extended (family_index, ic->coordinates[i].family, NULL, &v))
        c->family_of[i] = GPOINTER_TO_SIZE (v) - 1;
      else
        {
          c->family_of[i] = c->n_families;
          c->family_names[c->n_families++] = ic->coordinates[i].family;
          g_hash_table_insert (family_index, ic->coordinates[i].family,
                               GSIZE_TO_POINTER (c->family_of[i] + 1));
        }
    }
  g_hash_table_destroy (family_index);
  c->families = g_new0 (QvCharacterItem, MAX (nm, 1) * c->n_families);
  c->items = g_new0 (QvCharacterItem, MAX (nm, 1) * nc);
  for (gsize k = 0; k < nm; k++)
    {
      QvCharacterItem *fam = c->families + k * c->n_families, *it = c->items + k * nc;
      for (gsize f = 0; f < c->n_families; f++)
        {
          fam[f].name = c->family_names[f];
          fam[f].coordinate = f;
        }
      for (gsize i = 0; i < nc; i++)
        {
          it[i].name = ic->coordinates[i].name;
          it[i].coordinate = i;
          it[i].share = c->shares[k * nc + i];
          fam[c->family_of[i]].share += it[i].share;
        }
      qsort (fam, c->n_families, sizeof *fam, compare_item);
      qsort (it, nc, sizeof *it, compare_item);
    }

  notes = g_ptr_array_new ();
  for (char **s = ic->notes; *s; s++)
    g_ptr_array_add (notes, g_strdup (*s));
  if (c->rank < modes->n_vibrations)
    g_ptr_array_add (notes, g_strdup_printf ("the internal coordinates span %zu of the %zu "
                                             "vibrations: part of some modes is not described "
                                             "(see 'described')", c->rank, modes->n_vibrations));
  if (nc > c->rank)
    g_ptr_array_add (notes, g_strdup_printf ("%zu coordinates for %zu independent motions: the set "
                                             "is redundant, so force constants are shared among "
                                             "coordinates that move together", nc, c->rank));
  g_ptr_array_add (notes, NULL);
  c->notes = (char **) g_ptr_array_free (notes, FALSE);
  c->ic = g_steal_pointer (&ic);
  return c;
}

void
qv_mode_character_free (QvModeCharacter *c)
{
  if (c == NULL)
    return;
  qv_internal_coordinates_free (c->ic);
  g_free (c->force_constants);
  g_free (c->displacements);
  g_free (c->shares);
  g_free (c->diagonal);
  g_free (c->described);
  g_free (c->family_names);
  g_free (c->family_of);
  g_free (c->families);
  g_free (c->items);
  g_strfreev (c->notes);
  g_free (c);
}

const QvInternalCoordinates *
qv_mode_character_coordinates (const QvModeCharacter *c)
{
  return c->ic;
}

gsize
qv_mode_character_n_modes (const QvModeCharacter *c)
{
  return c->n_modes;
}

gsize
qv_mode_character_rank (const QvModeCharacter *c)
{
  return c->rank;
}

const double *
qv_mode_character_force_constants (const QvModeCharacter *c)
{
  return c->force_constants;
}

const double *
qv_mode_character_shares (const QvModeCharacter *c, gsize k)
{
  g_return_val_if_fail (k < c->n_modes, NULL);
  return c->shares + k * c->n_coords;
}

const double *
qv_mode_character_displacements (const QvModeCharacter *c, gsize k)
{
  g_return_val_if_fail (k < c->n_modes, NULL);
  return c->displacements + k * c->n_coords;
}

gsize
qv_mode_character_families (const QvModeCharacter *c, gsize k, const QvCharacterItem **items)
{
  g_return_val_if_fail (k < c->n_modes, 0);
  *items = c->families + k * c->n_families;
  return c->n_families;
}

gsize
qv_mode_character_items (const QvModeCharacter *c, gsize k, const QvCharacterItem **items)
{
  g_return_val_if_fail (k < c->n_modes, 0);
  *items = c->items + k * c->n_coords;
  return c->n_coords;
}

double
qv_mode_character_diagonal_sum (const QvModeCharacter *c, gsize k)
{
  g_return_val_if_fail (k < c->n_modes, NAN);
  return c->diagonal[k];
}

double
qv_mode_character_described (const QvModeCharacter *c, gsize k)
{
  g_return_val_if_fail (k < c->n_modes, NAN);
  return c->described[k];
}

char *const *
qv_mode_character_notes (const QvModeCharacter *c)
{
  return c->notes;
}

char *
qv_mode_character_summary (const QvModeCharacter *c, gsize k, gsize max_items)
{
  const QvCharacterItem *fam;
  gsize n = qv_mode_character_families (c, k, &fam), shown = 0;
  GString *s = g_string_new (NULL);

  for (gsize f = 0; f < n && (max_items == 0 || shown < max_items); f++)
    {
      if (fam[f].share < 0.005)
        break;
      g_string_append_printf (s, "%s%s %.0f %%", shown ? ", " : "", fam[f].name,
                              100.0 * fam[f].share);
      shown++;
    }
  if (shown == 0)
    g_string_append (s, "not described by the internal coordinates");
  return g_string_free (s, FALSE);
}
