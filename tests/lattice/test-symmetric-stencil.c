/* test-symmetric-stencil.c — the symmetry-reduced stencil of a supercell
 * (src/core/qv-symmetric-stencil.c): the number of displacements is the
 * symmetry-distinct one, and the force constants rebuilt from them equal
 * those of the full 6N-displacement stencil for crystals with an analytic,
 * anharmonic pair potential (invented: V(r) = A e^{−r/ρ} − C/r⁶, cut off
 * between neighbour shells so no pair crosses the cut-off).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "lattice-model.h"
#include "qv-error.h"
#include "qv-supercell.h"
#include "qv-symmetric-stencil.h"

typedef struct {
  double rc;              /* cut-off, Å */
} Potential;

/* invented parameters per pair of elements */
static void
params (guint z1, guint z2, double *a, double *rho, double *c)
{
  guint s = z1 + z2;
  *a = 1500.0 + 40.0 * (s % 7);
  *rho = 0.30 + 0.01 * (s % 5);
  *c = 20.0 + 3.0 * (s % 3);
}

/* Forces (eV/Å) of @s at positions @x under the pair potential. */
static void
forces (const QvStructure *s, const double *x, double rc, double *f)
{
  gsize n = s->n_atoms;
  memset (f, 0, 3 * n * sizeof *f);
  for (gsize i = 0; i < n; i++)
    for (gsize j = i + 1; j < n; j++)
      {
        double a, rho, c;
        params (s->atoms[i].z, s->atoms[j].z, &a, &rho, &c);
        for (int n1 = -1; n1 <= 1; n1++)
          for (int n2 = -1; n2 <= 1; n2++)
            for (int n3 = -1; n3 <= 1; n3++)
              {
                double d[3], r, dv;
                for (int k = 0; k < 3; k++)
                  d[k] = x[3 * j + k] - x[3 * i + k] + n1 * s->cell[0][k] + n2 * s->cell[1][k]
                         + n3 * s->cell[2][k];
                r = sqrt (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]);
                if (r > rc)
                  continue;
                dv = -a / rho * exp (-r / rho) + 6 * c / pow (r, 7);   /* dV/dr */
                for (int k = 0; k < 3; k++)
                  {
                    f[3 * i + k] += dv * d[k] / r;
                    f[3 * j + k] -= dv * d[k] / r;
                  }
              }
      }
}

/* The full central-difference stencil, symmetrised (the reference). */
static double *
full_hessian (const QvStructure *s, double rc, double h)
{
  gsize n3 = 3 * s->n_atoms;
  double *hess = g_new (double, n3 * n3);
  g_autofree double *x = g_new (double, n3), *fp = g_new (double, n3), *fm = g_new (double, n3);
  for (gsize i = 0; i < n3; i++)
    {
      for (gsize k = 0; k < s->n_atoms; k++)
        memcpy (x + 3 * k, s->atoms[k].position, 3 * sizeof (double));
      x[i] += h;
      forces (s, x, rc, fp);
      x[i] -= 2 * h;
      forces (s, x, rc, fm);
      for (gsize j = 0; j < n3; j++)
        hess[i + j * n3] = -(fp[j] - fm[j]) / (2 * h);
    }
  for (gsize i = 0; i < n3; i++)
    for (gsize j = i + 1; j < n3; j++)
      hess[i + j * n3] = hess[j + i * n3] = 0.5 * (hess[i + j * n3] + hess[j + i * n3]);
  return hess;
}

static void
check_crystal (const char *what, const QvStructure *prim, int na, int nb, int nc, double rc,
               gsize want_displacements)
{
  int matrix[3][3] = { { na, 0, 0 }, { 0, nb, 0 }, { 0, 0, nc } };
  const double h = 0.01;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) s = qv_supercell_build (prim, matrix, &error);
  g_autoptr(QvSymmetricStencil) st = NULL;
  g_autoptr(QvHessian) rebuilt = NULL;
  g_autofree double *full = NULL, *f = NULL;
  gsize n3 = 3 * s->n_atoms, nd;
  double spread = -1, diff = 0, big = 0;

  assert_non_null (s);
  st = qv_symmetric_stencil_new (s, h, 0, &error);
  if (st == NULL)
    fail_msg ("%s: %s", what, error->message);
  nd = qv_symmetric_stencil_n_displacements (st);
  print_message ("%s: %" G_GSIZE_FORMAT " atoms, %" G_GSIZE_FORMAT " operations, %" G_GSIZE_FORMAT
                 " displacements (full stencil %" G_GSIZE_FORMAT ")\n", what, s->n_atoms,
                 qv_symmetric_stencil_n_operations (st), nd, 2 * n3);
  assert_int_equal (nd, want_displacements);
  f = g_new (double, nd * n3);
  for (gsize d = 0; d < nd; d++)
    {
      g_autofree double *x = g_new (double, n3);
      qv_symmetric_stencil_positions (st, s, d, x);
      forces (s, x, rc, f + d * n3);
    }
  rebuilt = qv_symmetric_stencil_assemble (st, f, &spread, &error);
  if (rebuilt == NULL)
    fail_msg ("%s: %s", what, error->message);
  full = full_hessian (s, rc, h);
  for (gsize i = 0; i < n3 * n3; i++)
    {
      diff = MAX (diff, fabs (rebuilt->data[i] - full[i]));
      big = MAX (big, fabs (full[i]));
    }
  print_message ("%s: max|H_reduced - H_full| / max|H| = %.3g, spread %.3g\n", what, diff / big,
                 spread);
  assert_true (big > 0.1);
  assert_true (diff < 1e-9 * big);
  assert_true (spread >= 0 && spread < 1e-9);
}

static void
test_fcc (void **state)
{
  /* fcc, one atom in the primitive cell, 3×3×3: the site group Oh carries
   * x onto ±y, ±z, so one direction, ± (common practice) */
  const double a = 5.3;
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[3] = { 0, 0, 0 }, m[1] = { 39.95 };
  guint z[1] = { 18 };
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, m, r);
  (void) state;
  /* fcc neighbours at 3.75, 5.3, 6.49 Å: cut at 6.0 */
  check_crystal ("fcc 3x3x3", p, 3, 3, 3, 6.0, 2);
}

static void
test_rock_salt (void **state)
{
  /* rock salt, conventional cube of 8 atoms, 2×2×2 (64 atoms): two orbits
   * (Na, Cl), each Oh: 2 directions' pairs = 4 displacements, not 384 */
  const double a = 5.6;
  double cell[3][3] = { { a, 0, 0 }, { 0, a, 0 }, { 0, 0, a } };
  double r[24];
  guint z[8];
  double m[8];
  const double f[4][3] = { { 0, 0, 0 }, { 0, 0.5, 0.5 }, { 0.5, 0, 0.5 }, { 0.5, 0.5, 0 } };
  g_autoptr(QvStructure) p = NULL;
  (void) state;
  for (int k = 0; k < 4; k++)
    for (int s = 0; s < 2; s++)
      {
        int i = 2 * k + s;
        for (int c = 0; c < 3; c++)
          r[3 * i + c] = a * (f[k][c] + (s == 1 && c == 0 ? 0.5 : 0));
        z[i] = s ? 17 : 11;
        m[i] = s ? 35.45 : 22.99;
      }
  p = lattice_model_structure (cell, 8, z, m, r);
  /* shells at 2.8, 3.96, 4.85, 5.6 Å: cut at 5.2 */
  check_crystal ("rock salt 2x2x2 conventional", p, 2, 2, 2, 5.2, 4);
}

static void
test_tetragonal (void **state)
{
  /* simple tetragonal, one atom (site D4h): x gives ±x, ±y, z is new — two
   * directions, 4 displacements */
  double cell[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3.6 } };
  double r[3] = { 0, 0, 0 }, m[1] = { 50 };
  guint z[1] = { 22 };
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, m, r);
  (void) state;
  /* neighbours at 3, 3.6, 4.24, 4.69, 5.57 Å: cut at 5.0 */
  check_crystal ("simple tetragonal 3x3x2", p, 3, 3, 2, 5.0, 4);
}

static void
test_hexagonal_springs (void **state)
{
  /* simple hexagonal, one atom (D6h): x gives in-plane images at 60°, so
   * the rebuilding solves for the axes from rotated directions; z is the
   * second direction. The forces come from an exact harmonic spring model
   * (F = −H u, invented springs), so the rebuilt Hessian must equal the
   * model's own to rounding whatever the directions */
  const double a = 3.0, c = 3.5;
  double cell[3][3] = { { a, 0, 0 }, { -a / 2, a * sqrt (3) / 2, 0 }, { 0, 0, c } };
  double r[3] = { 0, 0, 0 }, m[1] = { 24 };
  guint z[1] = { 12 };
  const LatticeShell shells[] = { { a, 2.0, 0.3, 0, 0 }, { c, 1.5, 0.2, 0, 0 },
                                  { sqrt (a * a + c * c), 0.4, -0.05, 0, 0 } };
  int matrix[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 2 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, m, r);
  g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, &error);
  g_autoptr(QvHessian) h = lattice_model_hessian (sc, shells, G_N_ELEMENTS (shells));
  g_autoptr(QvSymmetricStencil) st = qv_symmetric_stencil_new (sc, 0.01, 0, &error);
  g_autoptr(QvHessian) rebuilt = NULL;
  gsize n3 = 3 * sc->n_atoms, nd;
  g_autofree double *f = NULL;
  double diff = 0, big = 0, spread = -1;
  (void) state;
  assert_non_null (st);
  nd = qv_symmetric_stencil_n_displacements (st);
  assert_int_equal (nd, 4);
  f = g_new0 (double, nd * n3);
  for (gsize d = 0; d < nd; d++)
    {
      gsize atom;
      double dir[3];
      int sign;
      qv_symmetric_stencil_displacement (st, d, &atom, dir, &sign);
      for (gsize j = 0; j < n3; j++)
        for (int x = 0; x < 3; x++)
          f[d * n3 + j] -= h->data[j + (3 * atom + x) * n3] * sign * 0.01 * dir[x];
    }
  rebuilt = qv_symmetric_stencil_assemble (st, f, &spread, &error);
  assert_non_null (rebuilt);
  for (gsize i = 0; i < n3 * n3; i++)
    {
      diff = MAX (diff, fabs (rebuilt->data[i] - h->data[i]));
      big = MAX (big, fabs (h->data[i]));
    }
  print_message ("hexagonal 3x3x2 springs: %" G_GSIZE_FORMAT " operations, 4 displacements "
                 "(full 108), max|H_rebuilt - H| / max|H| = %.3g, spread %.3g\n",
                 qv_symmetric_stencil_n_operations (st), diff / big, spread);
  assert_true (diff < 1e-12 * big);
  assert_true (spread < 1e-12);
}

static void
test_errors (void **state)
{
  const double a = 5.3;
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[3] = { 0, 0, 0 }, m[1] = { 39.95 };
  guint z[1] = { 18 };
  int matrix[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, m, r);
  g_autoptr(QvStructure) s = qv_supercell_build (p, matrix, &error);
  g_autoptr(QvSymmetricStencil) st = NULL;
  g_autofree double *f = NULL;
  (void) state;
  assert_null (qv_symmetric_stencil_new (s, 0.9, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  st = qv_symmetric_stencil_new (s, 0.01, 0, &error);
  assert_non_null (st);
  f = g_new0 (double, qv_symmetric_stencil_n_displacements (st) * 3 * s->n_atoms);
  f[5] = NAN;
  assert_null (qv_symmetric_stencil_assemble (st, f, NULL, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "atom 2 in displacement 1"));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_fcc),
    cmocka_unit_test (test_rock_salt),
    cmocka_unit_test (test_tetragonal),
    cmocka_unit_test (test_hexagonal_springs),
    cmocka_unit_test (test_errors),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
