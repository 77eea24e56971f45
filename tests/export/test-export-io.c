/* test-export-io.c — the XYZ writer read back by the XYZ reader, the
 * manifest written and read back, the manifest reader's errors, and the
 * output directory's refusals (cmocka).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include <glib.h>
#include <glib/gstdio.h>
#include "qv-error.h"
#include "qv-manifest.h"
#include "qv-output-dir.h"
#include "qv-structure.h"
#include "qv-xyz.h"

static QvStructure *
make_structure (gboolean cell)
{
  QvStructure *s = qv_structure_new (3, NULL);
  const double x[3][3] = { { 0.1, -1.25, 3.0 }, { 1e-7, 2.5, -0.0 }, { 123.456789012345, 0, 1 } };
  assert_true (qv_structure_set_element (s, 0, 8, NULL));
  assert_true (qv_structure_set_element (s, 1, 1, NULL));
  assert_true (qv_structure_set_element (s, 2, 1, NULL));
  assert_true (qv_structure_set_isotope (s, 2, 2, NULL));
  memcpy (s->atoms[0].position, x[0], sizeof x[0]);
  memcpy (s->atoms[1].position, x[1], sizeof x[1]);
  memcpy (s->atoms[2].position, x[2], sizeof x[2]);
  if (cell)
    {
      s->has_cell = TRUE;
      s->cell[0][0] = 10.0; s->cell[1][1] = 11.5; s->cell[2][2] = 12.25; s->cell[1][0] = 0.3;
      s->pbc[0] = s->pbc[1] = TRUE;
    }
  return s;
}

/* Writer → reader: positions exact with %.17g, within 5e-11 with %.10f
 * (half a unit of the 10th decimal); cell, pbc, masses, forces kept; the
 * comment pairs quoted so the reader skips them as someone else's keys. */
static void
test_xyz_round_trip (void **state)
{
  g_autoptr(QvStructure) s = make_structure (TRUE);
  double pos[2][9], forces[9], vel[9];
  QvXyzPair pairs[] = { { "mode", "7" }, { "note", "two words \"quoted\"" }, { "Q", "-0.25" } };
  QvXyzFrame frames[2] = { 0 };
  g_autofree char *text = NULL;
  g_autoptr(GPtrArray) back = NULL;
  g_autoptr(GError) error = NULL;
  gsize length;

  for (int f = 0; f < 2; f++)
    for (int i = 0; i < 9; i++)
      pos[f][i] = s->atoms[i / 3].position[i % 3] + (f + 1) * 0.1234567890123 * (i - 4) / 3.0;
  for (int i = 0; i < 9; i++)
    forces[i] = 0.01 * i - 0.05, vel[i] = 1e-3 * (i + 1);
  for (int f = 0; f < 2; f++)
    {
      frames[f].style = QV_XYZ_EXTENDED;
      frames[f].precision = f == 0 ? QV_XYZ_EXACT : QV_XYZ_FIXED;
      frames[f].positions = pos[f];
      frames[f].forces = forces;
      frames[f].velocities = vel;
      frames[f].masses = TRUE;
      frames[f].pairs = pairs;
      frames[f].n_pairs = G_N_ELEMENTS (pairs);
      frames[f].has_energy = TRUE;
      frames[f].energy = -12.5;
    }
  text = qv_xyz_format (s, frames, 2, &length);
  assert_int_equal (length, strlen (text));
  back = qv_xyz_read_data (text, length, "written.xyz", &error);
  if (back == NULL)
    fail_msg ("%s\n%s", error->message, text);
  assert_int_equal (back->len, 2);
  for (int f = 0; f < 2; f++)
    {
      QvStructure *r = back->pdata[f];
      assert_int_equal (r->n_atoms, 3);
      assert_true (r->has_cell && r->pbc[0] && r->pbc[1] && !r->pbc[2]);
      assert_true (r->cell[1][0] == 0.3 && r->cell[2][2] == 12.25);
      assert_true (r->has_energy && r->energy == -12.5);
      assert_int_equal (r->atoms[0].z, 8);
      assert_true (r->atoms[2].mass == s->atoms[2].mass);   /* deuterium via the masses column */
      for (int i = 0; i < 9; i++)
        {
          const double got = r->atoms[i / 3].position[i % 3];
          if (f == 0)
            assert_true (got == pos[f][i]);
          else
            assert_true (fabs (got - pos[f][i]) <= 5e-11 * (1 + 1e-6));
          assert_true (fabs (r->forces[i] - forces[i]) <= 5e-11);
        }
    }
  assert_non_null (strstr (text, "note=\"two words \\\"quoted\\\"\""));
  assert_non_null (strstr (text, "Properties=species:S:1:pos:R:3:velocities:R:3:forces:R:3:masses:R:1"));
}

/* Plain style: no Properties, the comment as given, read back as plain XYZ. */
static void
test_xyz_plain (void **state)
{
  g_autoptr(QvStructure) s = make_structure (FALSE);
  QvXyzFrame frame = { .style = QV_XYZ_PLAIN, .comment = "a plain\ncomment" };
  gsize length;
  g_autofree char *text = qv_xyz_format (s, &frame, 1, &length);
  g_autoptr(GPtrArray) back = qv_xyz_read_data (text, length, "plain.xyz", NULL);
  QvStructure *r;

  assert_non_null (back);
  r = back->pdata[0];
  assert_string_equal (r->comment, "a plain comment");
  assert_true (fabs (r->atoms[2].position[0] - 123.456789012345) <= 5e-11);
  assert_null (strstr (text, "Properties"));
  assert_null (strstr (text, "-0.0000000000"));    /* no negative zero */
}

static void
test_manifest_round_trip (void **state)
{
  g_autoptr(QvManifest) m = qv_manifest_new ("displace");
  g_autoptr(QvManifest) back = NULL;
  g_autoptr(GError) error = NULL;
  g_autofree char *json = NULL;
  QvManifestFile *f;
  QvManifestFrame *fr;
  QvManifestAmplitude a = { .mode = 7, .wavenumber = -123.5, .q = NAN, .Q = 0.25,
                            .max_displacement = 0.1, .max_atom = 3, .level = -1,
                            .turning_multiple = NAN };
  const QvManifestAmplitude *b;
  double t;

  qv_manifest_add_argument (m, "--mode");
  qv_manifest_add_note (m, "a note with \"quotes\"");
  qv_manifest_add_input_data (m, "geometry", "x.xyz", "abc", 3);
  qv_manifest_set_number (m->parameters, "temperature", 300.0);
  qv_manifest_set_integer (m->parameters, "seed", 42);
  qv_manifest_set_boolean (m->options, "single_file", TRUE);
  m->n_atoms = 9;
  f = qv_manifest_add_file (m, "a.xyz", "extxyz", "data", 4);
  fr = qv_manifest_file_add_frame (f);
  qv_manifest_frame_add_amplitude (fr, &a);
  qv_manifest_set_string (fr->fields, "kind", "escape");
  json = qv_manifest_to_json (m);
  back = qv_manifest_read_data (json, strlen (json), "manifest.json", &error);
  if (back == NULL)
    fail_msg ("%s", error->message);
  /* SHA-256 of "abc": FIPS 180-2, appendix B.1 */
  assert_string_equal (((QvManifestInput *) back->inputs->pdata[0])->sha256,
                       "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  assert_int_equal (back->files->len, 1);
  f = back->files->pdata[0];
  assert_string_equal (f->name, "a.xyz");
  fr = f->frames->pdata[0];
  b = &g_array_index (fr->amplitudes, QvManifestAmplitude, 0);
  assert_int_equal (b->mode, 7);
  assert_true (b->Q == 0.25 && b->wavenumber == -123.5 && isnan (b->q) && b->level == -1);
  assert_true (qv_manifest_get_number (back->parameters, "temperature", &t) && t == 300.0);
  assert_int_equal (qv_manifest_get (back->parameters, "seed")->integer, 42);
  assert_true (qv_manifest_get (back->options, "single_file")->boolean);
  assert_string_equal (qv_manifest_get (fr->fields, "kind")->string, "escape");
  assert_string_equal (back->notes->pdata[0], "a note with \"quotes\"");
}

/* Each bad manifest fails with the expected "name:line:col: …" message. */
static void
test_manifest_errors (void **state)
{
  static const struct { const char *text; const char *message; } cases[] = {
    { "", "m.json:1:1: the file is empty" },
    { "{\"format\": \"quaver-bundle\"}", "m.json:1:12: format: not a Quaver manifest" },
    { "{\"format\": \"quaver-manifest\", \"version\": 2, \"command\": \"x\", \"files\": []}",
      "m.json:1:42: version: version 2 is not one" },
    { "{\"format\": \"quaver-manifest\", \"version\": 1, \"command\": \"x\",\n \"files\": [], \"extra\": 1}",
      "m.json:2:15: extra: unknown member" },
    { "{\"format\": \"quaver-manifest\", \"version\": 1, \"command\": \"x\"}",
      "the required member \"files\" is missing" },
    { "{\"format\": \"quaver-manifest\", \"version\": 1, \"command\": \"x\", \"files\": [\n"
      "{\"name\": \"a\", \"sha256\": \"xyz\", \"frames\": []}]}", "m.json:2:25: files[0].sha256: expected 64" },
    { "{\"format\": \"quaver-manifest\", \"version\": 1, \"command\": \"x\", \"files\": [,]}",
      "m.json:1:71: expected a value" },
    { "{\"a\": 1, \"a\": 2}", "m.json:1:10: member \"a\" appears twice" },
    { "{\"a\": [1, 2,]}", "trailing comma" },
    { "{\"a\": 01}", "must not start with 0" },
    { "{} x", "unexpected text after the end" },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr(GError) error = NULL;
      g_autoptr(QvManifest) m = qv_manifest_read_data (cases[i].text, strlen (cases[i].text),
                                                       "m.json", &error);
      assert_null (m);
      assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
      if (strstr (error->message, cases[i].message) == NULL)
        fail_msg ("case %zu: got '%s', expected '%s'", i, error->message, cases[i].message);
    }
  /* nesting deeper than the limit is refused before any deep recursion */
  {
    GString *deep = g_string_new (NULL);
    g_autoptr(GError) error = NULL;
    for (int i = 0; i < 100000; i++)
      g_string_append_c (deep, '[');
    assert_null (qv_manifest_read_data (deep->str, deep->len, "deep.json", &error));
    assert_non_null (strstr (error->message, "nested deeper than"));
    g_string_free (deep, TRUE);
  }
}

static void
test_output_dir (void **state)
{
  g_autofree char *tmp = g_dir_make_tmp ("qv-export-XXXXXX", NULL);
  g_autofree char *target = g_build_filename (tmp, "new", "deeper", NULL);
  g_autofree char *file = g_build_filename (tmp, "plain-file", NULL);
  g_autoptr(GError) error = NULL;
  QvOutputDir *dir;
  gsize n;

  dir = qv_output_dir_open (target, FALSE, &error);
  assert_non_null (dir);
  assert_true (qv_output_dir_created (dir));
  assert_true (qv_output_dir_write (dir, "a.txt", "hello", 5, &error));
  assert_false (qv_output_dir_write (dir, "a.txt", "again", 5, &error));      /* twice */
  g_clear_error (&error);
  assert_false (qv_output_dir_write (dir, "../escape.txt", "x", 1, &error));  /* not plain */
  g_clear_error (&error);
  assert_int_equal (qv_output_dir_written (dir, &n)[0] != NULL, 1);
  assert_int_equal (n, 1);
  qv_output_dir_free (dir);

  /* non-empty: refused without force, nothing changed */
  assert_null (qv_output_dir_open (target, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  assert_non_null (strstr (error->message, "--force"));
  g_clear_error (&error);
  dir = qv_output_dir_open (target, TRUE, &error);
  assert_non_null (dir);
  assert_true (qv_output_dir_write (dir, "a.txt", "replaced", 8, &error));
  qv_output_dir_free (dir);
  {
    g_autofree char *path = g_build_filename (target, "a.txt", NULL);
    g_autofree char *contents = NULL;
    assert_true (g_file_get_contents (path, &contents, NULL, NULL));
    assert_string_equal (contents, "replaced");
    g_unlink (path);
  }
  /* a file is not a directory */
  assert_true (g_file_set_contents (file, "x", 1, NULL));
  assert_null (qv_output_dir_open (file, TRUE, &error));
  g_clear_error (&error);
  g_unlink (file);
  g_rmdir (target);
  {
    g_autofree char *mid = g_build_filename (tmp, "new", NULL);
    g_rmdir (mid);
  }
  g_rmdir (tmp);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_xyz_round_trip),
    cmocka_unit_test (test_xyz_plain),
    cmocka_unit_test (test_manifest_round_trip),
    cmocka_unit_test (test_manifest_errors),
    cmocka_unit_test (test_output_dir),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
