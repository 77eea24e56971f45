/* test-bundle-writer.c — the bundle writer (src/io/qv-bundle-writer.c)
 * against the reader (src/io/qv-bundle.c): what is written reads back to the
 * same structure, masses, Hessian, view, tensors and crystal, bit for bit
 * where the format stores the number itself; nothing is overwritten
 * without force; a Hessian too large to be inline goes to a .npy beside
 * the bundle.
 *
 * The reference for every check is the reader itself on the original data
 * (the committed bundles in tests/bundle/data and data/examples, whose
 * numbers are invented) and, for the hand-built bundle, the values put in
 * here. The round trip is the contract (docs/formats.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>
#include <cmocka.h>
#include <glib.h>
#include <glib/gstdio.h>
#include "qv-bundle.h"
#include "qv-bundle-writer.h"
#include "qv-error.h"

#ifndef BUNDLE_DATA
#error "BUNDLE_DATA must name tests/bundle/data"
#endif
#ifndef EXAMPLES_DATA
#error "EXAMPLES_DATA must name data/examples"
#endif

static char *tmp_dir;

static int
setup (void **state)
{
  tmp_dir = g_dir_make_tmp ("qv-bundle-writer-XXXXXX", NULL);
  return tmp_dir ? 0 : -1;
}

static void
remove_tree (const char *dir)
{
  GDir *d = g_dir_open (dir, 0, NULL);
  const char *name;
  while (d && (name = g_dir_read_name (d)) != NULL)
    {
      g_autofree char *p = g_build_filename (dir, name, NULL);
      g_unlink (p);
    }
  if (d)
    g_dir_close (d);
  g_rmdir (dir);
}

static int
teardown (void **state)
{
  remove_tree (tmp_dir);
  g_clear_pointer (&tmp_dir, g_free);
  return 0;
}

static char *
tmp_path (const char *name)
{
  return g_build_filename (tmp_dir, name, NULL);
}

static QvBundle *
read_ok (const char *path)
{
  g_autoptr(GError) error = NULL;
  QvBundle *b = qv_bundle_read_file (path, &error);
  if (b == NULL)
    fail_msg ("%s: %s", path, error->message);
  return b;
}

static void
write_ok (const char *path, const QvBundle *b, gboolean force)
{
  g_autoptr(GError) error = NULL;
  if (!qv_bundle_write_file (path, b, force, NULL, &error))
    fail_msg ("%s: %s", path, error->message);
}

/* --- comparing two bundles ------------------------------------------------ */

static void
same_structure (const QvStructure *a, const QvStructure *b)
{
  assert_int_equal (a->n_atoms, b->n_atoms);
  for (gsize i = 0; i < a->n_atoms; i++)
    {
      assert_int_equal (a->atoms[i].z, b->atoms[i].z);
      /* exactly: the writer spells each double so that it reads back */
      assert_true (a->atoms[i].mass == b->atoms[i].mass);
      assert_int_equal (a->atoms[i].mass_number, b->atoms[i].mass_number);
      for (int c = 0; c < 3; c++)
        assert_true (a->atoms[i].position[c] == b->atoms[i].position[c]);
      assert_string_equal (a->atoms[i].label ? a->atoms[i].label : "(none)",
                           b->atoms[i].label ? b->atoms[i].label : "(none)");
    }
  assert_int_equal (a->has_cell, b->has_cell);
  if (a->has_cell)
    assert_memory_equal (a->cell, b->cell, sizeof a->cell);
  for (int k = 0; k < 3; k++)
    assert_int_equal (a->pbc[k], b->pbc[k]);
  assert_int_equal (a->has_energy, b->has_energy);
  if (a->has_energy)
    assert_true (a->energy == b->energy);
  assert_int_equal (a->forces != NULL, b->forces != NULL);
  for (gsize i = 0; a->forces && i < 3 * a->n_atoms; i++)
    assert_true (a->forces[i] == b->forces[i]);
}

static void
same_bundle (const QvBundle *a, const QvBundle *b)
{
  same_structure (a->structure, b->structure);
  assert_int_equal (a->mass_model, b->mass_model);
  assert_string_equal (a->title ? a->title : "(none)", b->title ? b->title : "(none)");
  assert_int_equal (a->hessian != NULL, b->hessian != NULL);
  if (a->hessian)
    {
      assert_int_equal (a->hessian->n, b->hessian->n);
      for (gsize i = 0; i < a->hessian->n * a->hessian->n; i++)
        assert_true (a->hessian->data[i] == b->hessian->data[i]);
    }
  assert_int_equal (a->modes != NULL, b->modes != NULL);
  if (a->modes)
    {
      /* Precomputed modes are stored as wavenumbers and Cartesian vectors
       * that the reader mass-weights and normalises again: equal to
       * rounding, not bit for bit. */
      const gsize n = 3 * a->modes->n_atoms;
      assert_int_equal (a->modes->n_modes, b->modes->n_modes);
      for (gsize k = 0; k < a->modes->n_modes; k++)
        {
          const double wa = qv_mode_set_wavenumber (a->modes, k);
          const double wb = qv_mode_set_wavenumber (b->modes, k);
          const double *la = qv_mode_set_vector (a->modes, k), *lb = qv_mode_set_vector (b->modes, k);
          double dot = 0.0;
          assert_float_equal (wa, wb, 1e-10 * MAX (fabs (wa), 1.0));
          for (gsize i = 0; i < n; i++)
            dot += la[i] * lb[i];
          assert_float_equal (fabs (dot), 1.0, 1e-12);
        }
    }
  assert_int_equal (a->view.present, b->view.present);
  assert_int_equal (a->view.has_orientation, b->view.has_orientation);
  for (int i = 0; a->view.has_orientation && i < 4; i++)
    /* the reader normalises again: within a rounding of 1 */
    assert_float_equal (a->view.orientation[i], b->view.orientation[i], 1e-15);
  assert_int_equal (a->view.has_projection, b->view.has_projection);
  assert_int_equal (a->view.orthographic, b->view.orthographic);
  if (a->view.present)
    assert_true (a->view.zoom == b->view.zoom);
  assert_int_equal (a->view.mode, b->view.mode);
  assert_int_equal (a->derivatives != NULL, b->derivatives != NULL);
  if (a->derivatives)
    {
      const gsize n = 3 * a->structure->n_atoms;
      assert_int_equal (a->derivatives->dipole != NULL, b->derivatives->dipole != NULL);
      assert_int_equal (a->derivatives->polarizability != NULL, b->derivatives->polarizability != NULL);
      for (gsize i = 0; a->derivatives->dipole && i < 3 * n; i++)
        assert_true (a->derivatives->dipole[i] == b->derivatives->dipole[i]);
      for (gsize i = 0; a->derivatives->polarizability && i < 6 * n; i++)
        assert_true (a->derivatives->polarizability[i] == b->derivatives->polarizability[i]);
    }
  assert_int_equal (a->primitive != NULL, b->primitive != NULL);
  if (a->primitive)
    {
      same_structure (a->primitive, b->primitive);
      assert_int_equal (a->has_supercell_matrix, b->has_supercell_matrix);
      if (a->has_supercell_matrix)
        assert_memory_equal (a->supercell_matrix, b->supercell_matrix, sizeof a->supercell_matrix);
      assert_string_equal (a->band_path ? a->band_path : "(none)", b->band_path ? b->band_path : "(none)");
      assert_memory_equal (a->mesh, b->mesh, sizeof a->mesh);
    }
  assert_int_equal (a->born_charges != NULL, b->born_charges != NULL);
  assert_int_equal (a->has_dielectric, b->has_dielectric);
  if (a->born_charges)
    {
      const gsize sites = (a->primitive ? a->primitive : a->structure)->n_atoms;
      for (gsize i = 0; i < 9 * sites; i++)
        assert_true (a->born_charges[i] == b->born_charges[i]);
      assert_memory_equal (a->dielectric_tensor, b->dielectric_tensor, sizeof a->dielectric_tensor);
    }
}

/* --- tests ---------------------------------------------------------------- */

/* Every committed good bundle: read, write, read again, compare. */
static void
test_committed_bundles (void **state)
{
  const char *const dirs[] = { BUNDLE_DATA, EXAMPLES_DATA "/ethanol-unconverged",
                               EXAMPLES_DATA "/formaldehyde", EXAMPLES_DATA "/rocksalt-springs" };
  guint count = 0;

  for (gsize d = 0; d < G_N_ELEMENTS (dirs); d++)
    {
      g_autoptr(GDir) dir = g_dir_open (dirs[d], 0, NULL);
      const char *name;
      assert_non_null (dir);
      while ((name = g_dir_read_name (dir)) != NULL)
        {
          g_autofree char *in = NULL, *out = NULL;
          g_autoptr(QvBundle) a = NULL, b = NULL;
          if (!g_str_has_suffix (name, ".quaver.json") || g_str_has_prefix (name, "bad-"))
            continue;
          in = g_build_filename (dirs[d], name, NULL);
          out = tmp_path (name);
          a = read_ok (in);
          write_ok (out, a, FALSE);
          b = read_ok (out);
          same_bundle (a, b);
          count++;
        }
    }
  /* the good bundles of tests/bundle/data and the three examples */
  assert_true (count >= 15);
}

static double
awkward (gsize i, gsize j)
{
  /* numbers whose shortest spelling takes all 17 digits, tiny and huge
   * ones, and an asymmetry the full layout must keep */
  return (double) (i + 1) / 3.0 - (double) j / 7.0 + (i == j ? 1e-300 : 0.0) + (i == 0 && j == 1 ? 1e10 : 0.0);
}

/* A bundle with every member, built here. */
static QvBundle *
full_bundle (gsize n_atoms)
{
  QvBundle *b = g_new0 (QvBundle, 1);
  QvStructure *s;
  const gsize n = 3 * n_atoms;
  g_autofree double *rows = NULL;

  b->title = g_strdup ("invented \"bundle\" for the writer test\twith a tab");
  s = b->structure = qv_structure_new (n_atoms, NULL);
  for (gsize i = 0; i < n_atoms; i++)
    {
      static const guint z[] = { 6, 1, 8, 7 };
      qv_structure_set_element (s, i, z[i % 4], NULL);
      for (int c = 0; c < 3; c++)
        s->atoms[i].position[c] = 1.1 * (double) i + 0.1 * c + 1.0 / 3.0;
    }
  qv_structure_set_label (s, 0, "C1 ¹³C");
  b->mass_model = QV_MASS_AVERAGE;
  qv_structure_apply_mass_model (s, QV_MASS_AVERAGE);
  assert_true (qv_structure_set_isotope (s, 0, 13, NULL));
  assert_true (qv_structure_set_mass (s, 1, 2.0141017781234567, NULL));
  assert_true (qv_structure_set_isotope (s, 2, 16, NULL));   /* 16O differs from O's weight */
  s->has_cell = TRUE;
  s->cell[0][0] = 10.0 / 3.0;
  s->cell[1][1] = 11.0;
  s->cell[2][2] = 12.5;
  s->cell[2][0] = 0.1;
  s->pbc[0] = s->pbc[1] = TRUE;
  s->pbc[2] = FALSE;
  s->has_energy = TRUE;
  s->energy = -1234.5678901234567;
  s->forces = g_new (double, n);
  for (gsize i = 0; i < n; i++)
    s->forces[i] = 0.01 * (double) i - 1.0 / 9.0;

  b->hessian = qv_hessian_new (n, FALSE, NULL);
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      b->hessian->data[i + j * n] = awkward (i, j);

  b->view.present = TRUE;
  b->view.has_orientation = TRUE;
  {
    const double q[4] = { 0.1, -0.2, 0.3, 0.9 };
    const double norm = sqrt (0.01 + 0.04 + 0.09 + 0.81);
    for (int i = 0; i < 4; i++)
      b->view.orientation[i] = q[i] / norm;
  }
  b->view.has_projection = TRUE;
  b->view.orthographic = TRUE;
  b->view.zoom = 1.0 / 0.7;
  b->view.mode = 5;

  b->derivatives = qv_derivatives_new (n_atoms);
  rows = g_new (double, 6 * n);
  for (gsize i = 0; i < 6 * n; i++)
    rows[i] = sin ((double) i) / 3.0;
  qv_derivatives_set_dipole (b->derivatives, rows, 1.0);
  qv_derivatives_set_polarizability (b->derivatives, 6, rows, 1.0);

  b->primitive = qv_structure_copy (s);
  b->has_supercell_matrix = TRUE;
  b->supercell_matrix[0][0] = 2;
  b->supercell_matrix[1][1] = 1;
  b->supercell_matrix[2][2] = 1;
  b->supercell_matrix[0][1] = -1;
  b->band_path = g_strdup ("G 0 0 0; X 0.5 0 0");
  b->mesh[0] = 4, b->mesh[1] = 5, b->mesh[2] = 6;
  b->born_charges = g_new (double, 9 * n_atoms);
  for (gsize i = 0; i < 9 * n_atoms; i++)
    b->born_charges[i] = (double) i / 7.0 - 1.0;
  b->has_dielectric = TRUE;
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      b->dielectric_tensor[i][j] = (i == j) ? 2.0 + i / 3.0 : 0.01;
  return b;
}

static void
test_full_round_trip (void **state)
{
  g_autoptr(QvBundle) a = full_bundle (4);
  g_autoptr(QvBundle) b = NULL;
  g_autofree char *path = tmp_path ("full.quaver.json");
  g_autofree char *npy = NULL;
  g_autoptr(GError) error = NULL;

  assert_true (qv_bundle_write_file (path, a, FALSE, &npy, &error));
  assert_null (npy);
  b = read_ok (path);
  same_bundle (a, b);
  /* the masses as given, the model's for the rest */
  assert_int_equal (b->structure->atoms[0].mass_number, 13);
  assert_true (b->structure->atoms[1].mass == 2.0141017781234567);
  assert_int_equal (b->structure->atoms[2].mass_number, 16);
  assert_int_equal (b->structure->atoms[3].mass_number, 0);   /* N: standard atomic weight */
  /* an asymmetric Hessian stays as it was */
  assert_true (b->hessian->data[0 + 1 * 12] == awkward (0, 1));
  assert_true (b->hessian->data[1 + 0 * 12] == awkward (1, 0));
  assert_true (b->hessian->data[0 + 1 * 12] != b->hessian->data[1 + 0 * 12]);
}

/* The default isotopic model writes no per-atom masses at all. */
static void
test_no_needless_overrides (void **state)
{
  g_autoptr(QvBundle) a = full_bundle (4);
  g_autofree char *text = NULL;

  qv_structure_apply_mass_model (a->structure, QV_MASS_ISOTOPIC);
  a->mass_model = QV_MASS_ISOTOPIC;
  qv_structure_apply_mass_model (a->primitive, QV_MASS_ISOTOPIC);
  text = qv_bundle_format (a, NULL, NULL, NULL);
  assert_non_null (text);
  assert_null (strstr (text, "\"isotope\""));
  assert_null (strstr (text, "\"mass\":"));
  assert_non_null (strstr (text, "\"masses\": \"isotopic\""));
}

static void
test_refuses_overwrite (void **state)
{
  g_autoptr(QvBundle) a = full_bundle (4);
  g_autofree char *path = tmp_path ("twice.quaver.json");
  g_autofree char *before = NULL, *after = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBundle) b = NULL;

  write_ok (path, a, FALSE);
  assert_true (g_file_get_contents (path, &before, NULL, NULL));
  a->view.mode = 2;
  assert_false (qv_bundle_write_file (path, a, FALSE, NULL, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  assert_non_null (strstr (error->message, "exists"));
  assert_true (g_file_get_contents (path, &after, NULL, NULL));
  assert_string_equal (before, after);
  /* with force it is replaced */
  write_ok (path, a, TRUE);
  b = read_ok (path);
  assert_int_equal (b->view.mode, 2);
}

static void
test_large_hessian_beside (void **state)
{
  /* 3N = 603 > QV_BUNDLE_MAX_INLINE_N = 600 */
  g_autoptr(QvBundle) a = full_bundle (201);
  g_autoptr(QvBundle) b = NULL;
  g_autofree char *path = tmp_path ("large.quaver.json");
  g_autofree char *npy = NULL, *text = NULL, *expected = tmp_path ("large.hessian.npy");
  g_autoptr(GError) error = NULL;

  /* A symmetric matrix, as a Hessian is: the .npy reader keeps a
   * row-major file transposed in its column-major storage (qv-hessian.h),
   * which only an asymmetric matrix would show. */
  for (gsize i = 0; i < a->hessian->n; i++)
    for (gsize j = 0; j < a->hessian->n; j++)
      a->hessian->data[i + j * a->hessian->n] = awkward (MIN (i, j), MAX (i, j));
  g_clear_pointer (&a->primitive, qv_structure_free);
  g_clear_pointer (&a->born_charges, g_free);
  a->has_dielectric = FALSE;
  a->has_supercell_matrix = FALSE;
  assert_null (qv_bundle_format (a, NULL, NULL, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_LIMIT));
  g_clear_error (&error);

  assert_true (qv_bundle_write_file (path, a, FALSE, &npy, &error));
  assert_string_equal (npy, expected);
  assert_true (g_file_test (npy, G_FILE_TEST_IS_REGULAR));
  assert_true (g_file_get_contents (path, &text, NULL, NULL));
  assert_non_null (strstr (text, "\"path\": \"large.hessian.npy\""));
  b = read_ok (path);
  same_bundle (a, b);
  assert_non_null (b->hessian_path);

  /* a matrix file already there is refused before anything is written */
  {
    g_autofree char *other = tmp_path ("other.quaver.json");
    g_autofree char *other_npy = tmp_path ("other.hessian.npy");
    assert_true (g_file_set_contents (other_npy, "keep", -1, NULL));
    assert_false (qv_bundle_write_file (other, a, FALSE, NULL, &error));
    assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
    assert_false (g_file_test (other, G_FILE_TEST_EXISTS));
    g_clear_pointer (&text, g_free);
    assert_true (g_file_get_contents (other_npy, &text, NULL, NULL));
    assert_string_equal (text, "keep");
  }
}

static void
test_hessian_path_name (void **state)
{
  g_autofree char *a = qv_bundle_writer_hessian_path ("/x/y/ethanol.quaver.json");
  g_autofree char *b = qv_bundle_writer_hessian_path ("w.json");
  assert_string_equal (a, "/x/y/ethanol.hessian.npy");
  assert_string_equal (b, "w.hessian.npy");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_committed_bundles),
    cmocka_unit_test (test_full_round_trip),
    cmocka_unit_test (test_no_needless_overrides),
    cmocka_unit_test (test_refuses_overwrite),
    cmocka_unit_test (test_large_hessian_beside),
    cmocka_unit_test (test_hessian_path_name),
  };
  return cmocka_run_group_tests (tests, setup, teardown);
}
