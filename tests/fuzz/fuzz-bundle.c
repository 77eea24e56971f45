/* fuzz-bundle.c — the Quaver bundle (qv_bundle_read_data): the strict JSON
 * and depth pass, the structure, inline Hessians, referenced matrix files,
 * precomputed modes, masses, derivative tensors, Born charges, the view.
 * The bundle is given a path in a folder of this process that holds the
 * matrices the seed bundles name (hessian-9.txt, hessian-9.npy,
 * hessian-6.txt, co.hessian.npy, matrices/hessian-9.lower.txt), a file
 * outside that folder and a symbolic link to it: a bundle that is read
 * must never have used a file outside its folder.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "qv-fuzz.h"
#include "qv-bundle.h"

static char *bundle_folder;
static char *bundle_path;
static char *bundle_prefix;

static GString *
text_matrix (gsize n, gboolean lower)
{
  GString *s = g_string_new ("# invented matrix for the fuzz target\n");

  for (gsize i = 0; i < n; i++)
    {
      for (gsize j = 0; j < (lower ? i + 1 : n); j++)
        g_string_append_printf (s, "%s%g", j ? " " : "",
                                i == j ? 10.0 + (double) i : (i + j) % 3 == 0 ? -0.5 : 0.0);
      g_string_append_c (s, '\n');
    }
  return s;
}

static void
write_text (const char *folder, const char *name, gsize n, gboolean lower)
{
  g_autofree char *path = g_build_filename (folder, name, NULL);
  g_autoptr(GString) s = text_matrix (n, lower);

  qv_fuzz_write (path, s->str, s->len);
}

static void
write_npy (const char *folder, const char *name, gsize n)
{
  g_autofree char *path = g_build_filename (folder, name, NULL);
  g_autoptr(GString) s = g_string_new_len ("\x93NUMPY\x01\x00", 8);
  g_autofree char *dict = g_strdup_printf ("{'descr': '<f8', 'fortran_order': False, "
                                           "'shape': (%zu, %zu), }", (size_t) n, (size_t) n);
  gsize header = strlen (dict) + 1;
  gsize padded = (10 + header + 63) / 64 * 64 - 10;

  g_string_append_c (s, (char) (padded & 0xff));
  g_string_append_c (s, (char) (padded >> 8));
  g_string_append (s, dict);
  while (s->len < 10 + padded - 1)
    g_string_append_c (s, ' ');
  g_string_append_c (s, '\n');
  for (gsize i = 0; i < n * n; i++)
    {
      double v = i % (n + 1) == 0 ? 10.0 : 0.0;   /* little-endian hosts */

      g_string_append_len (s, (const char *) &v, sizeof v);
    }
  qv_fuzz_write (path, s->str, s->len);
}

static void
setup (void)
{
  g_autofree char *matrices = NULL;
  g_autofree char *outside = NULL;
  g_autofree char *link = NULL;

  if (bundle_folder != NULL)
    return;
  bundle_folder = g_build_filename (qv_fuzz_folder (), "bundle", NULL);
  matrices = g_build_filename (bundle_folder, "matrices", NULL);
  if (g_mkdir_with_parents (matrices, 0700) != 0)
    qv_fuzz_fail ("bundle", "cannot make %s", matrices);
  write_text (bundle_folder, "hessian-9.txt", 9, FALSE);
  write_text (bundle_folder, "hessian-6.txt", 6, FALSE);
  write_npy (bundle_folder, "hessian-9.npy", 9);
  write_npy (bundle_folder, "co.hessian.npy", 6);
  write_text (matrices, "hessian-9.lower.txt", 9, TRUE);
  write_text (qv_fuzz_folder (), "outside.txt", 9, FALSE);
  outside = g_build_filename (qv_fuzz_folder (), "outside.txt", NULL);
  link = g_build_filename (bundle_folder, "link.txt", NULL);
  if (symlink (outside, link) != 0)
    qv_fuzz_fail ("bundle", "cannot make the link %s", link);
  bundle_path = g_build_filename (bundle_folder, "fuzz.quaver.json", NULL);
  bundle_prefix = g_strconcat (bundle_folder, "/", NULL);
}

static void
check_bundle (const QvBundle *b)
{
  const QvStructure *s = b->structure;

  qv_fuzz_assert ("bundle", s != NULL && s->n_atoms > 0, "no atoms");
  qv_fuzz_assert ("bundle", (b->hessian == NULL) != (b->modes == NULL),
                  "not exactly one of a Hessian and modes");
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      qv_fuzz_assert ("bundle", s->atoms[a].z >= 1 && s->atoms[a].z <= 118, "atomic number");
      qv_fuzz_assert ("bundle", isfinite (s->atoms[a].mass) && s->atoms[a].mass > 0, "mass");
      for (int k = 0; k < 3; k++)
        qv_fuzz_assert ("bundle", isfinite (s->atoms[a].position[k]), "position");
    }
  if (b->hessian != NULL)
    {
      qv_fuzz_assert ("bundle", b->hessian->n == 3 * s->n_atoms, "Hessian size");
      for (gsize i = 0; i < b->hessian->n * b->hessian->n; i++)
        qv_fuzz_assert ("bundle", isfinite (b->hessian->data[i]), "Hessian element");
    }
  if (b->modes != NULL)
    {
      qv_fuzz_assert ("bundle", b->modes->n_atoms == s->n_atoms, "modes for other atoms");
      for (gsize k = 0; k < b->modes->n_modes; k++)
        qv_fuzz_assert ("bundle", isfinite (b->modes->eigenvalues[k]), "eigenvalue");
      for (gsize i = 0; i < 3 * s->n_atoms * b->modes->n_modes; i++)
        qv_fuzz_assert ("bundle", isfinite (b->modes->vectors[i]), "mode vector");
    }
  if (b->hessian_path != NULL)
    {
      g_autofree char *real = realpath (b->hessian_path, NULL);
      g_autofree char *real_folder = realpath (bundle_folder, NULL);

      qv_fuzz_assert ("bundle", real != NULL && real_folder != NULL, "a path that is not there");
      qv_fuzz_assert ("bundle",
                      g_str_has_prefix (real, real_folder) && real[strlen (real_folder)] == '/',
                      "read a matrix outside the bundle's folder");
    }
  if (b->born_charges != NULL)
    for (gsize i = 0; i < 9 * s->n_atoms; i++)
      qv_fuzz_assert ("bundle", isfinite (b->born_charges[i]), "Born charge");
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  GError *error = NULL;
  QvBundle *bundle;

  setup ();
  bundle = qv_bundle_read_data ((const char *) data, size, bundle_path, &error);
  /* the message names the bundle, or a matrix file it refers to */
  qv_fuzz_check_failure ("bundle", bundle == NULL, error, bundle_prefix);
  if (bundle == NULL)
    return FALSE;
  check_bundle (bundle);
  qv_bundle_free (bundle);
  return TRUE;
}
