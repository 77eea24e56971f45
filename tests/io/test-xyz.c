/* test-xyz.c — the XYZ / extended XYZ reader.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * The expected values are the ones written in the (invented) input files
 * and strings; the reader must hand them back exactly. Element and isotope
 * identities are facts of the periodic table (common practice); isotope
 * masses are NIST values (from memory). */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include "qv-io-test.h"

#include <glib.h>
#include "qv-element.h"
#include "qv-error.h"
#include "qv-xyz.h"

static char *
data_path (const char *file)
{
  return g_build_filename (QV_IO_TEST_DATA, file, NULL);
}

static GPtrArray *
read_ok (const char *file)
{
  g_autofree char *path = data_path (file);
  g_autoptr(GError) error = NULL;
  GPtrArray *frames = qv_xyz_read_file (path, &error);

  if (frames == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (frames);
  assert_null (error);
  return frames;
}

static GPtrArray *
read_text (const char *text)
{
  g_autoptr(GError) error = NULL;
  GPtrArray *frames = qv_xyz_read_data (text, strlen (text), "t.xyz", &error);

  if (frames == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (frames);
  return frames;
}

/* The text fails with QV_ERROR_INPUT, the message starts with @where
 * ("t.xyz:3:5: ") and contains @fragment. */
static void
expect_error (const char *text, const char *where, const char *fragment)
{
  g_autoptr(GError) error = NULL;
  GPtrArray *frames = qv_xyz_read_data (text, strlen (text), "t.xyz", &error);

  assert_null (frames);
  qvt_assert_input_error (error, where, fragment);
}

static void
expect_file_error (const char *file, const char *where, const char *fragment)
{
  g_autofree char *path = data_path (file);
  g_autofree char *prefix = g_strconcat (path, where, NULL);
  g_autoptr(GError) error = NULL;
  GPtrArray *frames = qv_xyz_read_file (path, &error);

  assert_null (frames);
  assert_non_null (error);
  if (!g_str_has_prefix (error->message, prefix) || strstr (error->message, fragment) == NULL)
    print_error ("message: %s\nwanted: %s … %s\n", error->message, prefix, fragment);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, prefix));
  assert_non_null (strstr (error->message, fragment));
}

static void
assert_position (const QvAtom *a, double x, double y, double z)
{
  /* the decimal numbers of the file, parsed as strtod would */
  assert_true (a->position[0] == x);
  assert_true (a->position[1] == y);
  assert_true (a->position[2] == z);
}

static void
test_plain (void **state)
{
  g_autoptr(GPtrArray) frames = read_ok ("water.xyz");
  const QvStructure *s;

  assert_int_equal (frames->len, 1);
  s = frames->pdata[0];
  assert_int_equal (s->n_atoms, 3);
  /* O is element 8, H element 1 (common practice) */
  assert_int_equal (s->atoms[0].z, 8);
  assert_int_equal (s->atoms[1].z, 1);
  assert_int_equal (s->atoms[2].z, 1);
  /* default masses: the most abundant isotopes 16O and 1H (common practice) */
  assert_int_equal (s->atoms[0].mass_number, 16);
  assert_int_equal (s->atoms[1].mass_number, 1);
  assert_position (&s->atoms[0], 0.0, 0.0, 0.1173);
  assert_position (&s->atoms[1], 0.0, 0.7572, -0.4692);
  assert_position (&s->atoms[2], 0.0, -0.7572, -0.4692);
  assert_null (s->atoms[0].label);
  assert_string_equal (s->comment, "water, an invented geometry for tests");
  assert_false (s->has_cell);
  assert_false (s->has_energy);
  assert_null (s->forces);
  assert_false (s->pbc[0] || s->pbc[1] || s->pbc[2]);
}

static void
test_multi_frame_crlf (void **state)
{
  g_autoptr(GPtrArray) frames = read_ok ("scan-crlf.xyz");
  const QvStructure *s;

  assert_int_equal (frames->len, 3);
  s = frames->pdata[0];
  assert_int_equal (s->n_atoms, 2);
  assert_string_equal (s->comment, "frame 1 of an invented scan");   /* no '\r' */
  assert_position (&s->atoms[1], 0.0, 0.0, 0.74);
  s = frames->pdata[1];
  assert_int_equal (s->n_atoms, 2);
  assert_string_equal (s->comment, "frame 2");
  assert_position (&s->atoms[1], 0.0, 0.0, 0.80);
  s = frames->pdata[2];
  assert_int_equal (s->n_atoms, 1);
  assert_int_equal (s->atoms[0].z, 2);   /* He (common practice) */
  assert_position (&s->atoms[0], 1.5, -2.5, 3.25);
}

static void
test_extended (void **state)
{
  g_autoptr(GPtrArray) frames = read_ok ("extended.xyz");
  const QvStructure *s;

  assert_int_equal (frames->len, 2);
  s = frames->pdata[0];
  assert_int_equal (s->n_atoms, 3);
  assert_true (s->has_cell);
  /* rows are the lattice vectors, as written */
  assert_true (s->cell[0][0] == 5.0 && s->cell[0][1] == 0.0 && s->cell[0][2] == 0.0);
  assert_true (s->cell[1][0] == 0.5 && s->cell[1][1] == 6.0 && s->cell[1][2] == 0.0);
  assert_true (s->cell[2][0] == 0.0 && s->cell[2][1] == 0.0 && s->cell[2][2] == 7.0);
  assert_true (s->pbc[0] && s->pbc[1] && !s->pbc[2]);
  assert_true (s->has_energy);
  assert_true (s->energy == -12.5);
  assert_null (s->comment);          /* key=value pairs are not a comment */
  assert_int_equal (s->atoms[0].z, 14);   /* Si */
  assert_int_equal (s->atoms[1].z, 8);
  assert_position (&s->atoms[1], 1.6, 0.0, 0.0);
  /* forces after the skipped tags column; velo is skipped by its width */
  assert_non_null (s->forces);
  assert_true (s->forces[0] == 0.1 && s->forces[1] == -0.2 && s->forces[2] == 0.3);
  assert_true (s->forces[3] == -0.1 && s->forces[4] == 0.2 && s->forces[5] == -0.3);
  assert_true (s->forces[6] == 0.0 && s->forces[8] == 0.0);
  /* masses column: typed masses, no isotope */
  assert_true (s->atoms[0].mass == 28.5);
  assert_int_equal (s->atoms[0].mass_number, 0);
  assert_true (s->atoms[1].mass == 17.0);
  assert_true (s->atoms[2].mass == 16.0);

  /* lower-case keys, species not in the first column, default pbc */
  s = frames->pdata[1];
  assert_int_equal (s->n_atoms, 2);
  assert_int_equal (s->atoms[0].z, 6);
  assert_int_equal (s->atoms[1].z, 7);
  assert_position (&s->atoms[1], 1.5, 1.5, 1.5);
  assert_true (s->has_energy && s->energy == 1.0e-3);
  assert_true (s->has_cell && s->cell[1][1] == 3.0);
  /* Lattice without pbc: periodic in all three directions (extended XYZ
   * convention, common practice) */
  assert_true (s->pbc[0] && s->pbc[1] && s->pbc[2]);
  assert_null (s->forces);
}

static void
test_isotopes_labels (void **state)
{
  g_autoptr(GPtrArray) frames = read_ok ("isotopes.xyz");
  const QvStructure *s = frames->pdata[0];
  const QvAtom *a = s->atoms;

  assert_int_equal (s->n_atoms, 7);
  /* D and T are hydrogen 2 and 3 (common practice); masses 2.01410177812 u
   * and 3.0160492779 u (NIST, from memory) */
  assert_int_equal (a[0].z, 1);
  assert_int_equal (a[0].mass_number, 2);
  assert_true (fabs (a[0].mass - 2.01410177812) < 1e-6);
  assert_null (a[0].label);
  assert_int_equal (a[1].z, 1);
  assert_int_equal (a[1].mass_number, 3);
  assert_true (fabs (a[1].mass - 3.0160492779) < 1e-6);
  /* labels: the element, and the text kept */
  assert_int_equal (a[2].z, 6);
  assert_string_equal (a[2].label, "C1");
  assert_int_equal (a[3].z, 1);
  assert_int_equal (a[3].mass_number, 1);
  assert_string_equal (a[3].label, "H12");
  /* a bare number is Z; symbols are case-insensitive */
  assert_int_equal (a[4].z, 8);
  assert_null (a[4].label);
  assert_int_equal (a[5].z, 17);
  /* a labelled deuterium */
  assert_int_equal (a[6].z, 1);
  assert_int_equal (a[6].mass_number, 2);
  assert_string_equal (a[6].label, "d2");
}

static void
test_small_cases (void **state)
{
  GPtrArray *frames;
  const QvStructure *s;

  /* trailing blank lines, a BOM, no final newline */
  frames = read_text ("\xEF\xBB\xBF" "1\n\nNe 0 0 0");
  s = frames->pdata[0];
  assert_int_equal (s->atoms[0].z, 10);
  assert_null (s->comment);            /* empty comment */
  g_ptr_array_unref (frames);

  frames = read_text ("1\nc\nAr 1e-3 -2.5E+1 +.5\n\n  \n\t\n");
  s = frames->pdata[0];
  assert_int_equal (frames->len, 1);
  assert_position (&s->atoms[0], 1e-3, -25.0, 0.5);
  g_ptr_array_unref (frames);

  /* a pbc with a Lattice, all F */
  frames = read_text ("1\nLattice=\"2 0 0 0 2 0 0 0 2\" pbc=\"F f False\"\nH 0 0 0\n");
  s = frames->pdata[0];
  assert_true (s->has_cell);
  assert_false (s->pbc[0] || s->pbc[1] || s->pbc[2]);
  g_ptr_array_unref (frames);

  /* spaces around '=', and a quoted value with an escaped quote elsewhere */
  frames = read_text ("1\ntitle=\"say \\\"hi\\\"\" energy = -3.25 flag\nH 0 0 0\n");
  s = frames->pdata[0];
  assert_true (s->has_energy && s->energy == -3.25);
  g_ptr_array_unref (frames);

  /* a plain comment with a stray quote stays a comment */
  frames = read_text ("1\nthe \"odd comment\nH 0 0 0\n");
  s = frames->pdata[0];
  assert_string_equal (s->comment, "the \"odd comment");
  g_ptr_array_unref (frames);
}

static void
test_bad_count (void **state)
{
  expect_error ("", "t.xyz:1: ", "empty");
  expect_error ("\n  \n", "t.xyz:2: ", "blank");
  expect_error ("three\nc\nH 0 0 0\n", "t.xyz:1:1: ", "number of atoms");
  expect_error ("3.5\nc\nH 0 0 0\n", "t.xyz:1:1: ", "'3.5'");
  expect_error ("  -1\nc\nH 0 0 0\n", "t.xyz:1:3: ", "'-1'");
  expect_error ("0\nc\n", "t.xyz:1:1: ", "0 atoms");
  expect_error ("20000000\nc\nH 0 0 0\n", "t.xyz:1:1: ", "more than this reader accepts");
  /* a blank line where the next frame's count should be */
  expect_error ("1\nc\nH 0 0 0\n\n1\nc\nH 0 0 0\n", "t.xyz:4: ", "number of atoms");
  /* the count alone */
  expect_error ("2\n", "t.xyz:1: ", "comment line");
}

static void
test_bad_truncated (void **state)
{
  expect_file_error ("bad-truncated.xyz", ":8: ", "after 2 of the 4 atom lines");
  expect_file_error ("bad-truncated.xyz", ":8: ", "line 5");
  /* a count far beyond the file: refused before allocating */
  expect_error ("9000000\nc\nH 0 0 0\n", "t.xyz:3: ", "after 1 of the 9000000 atom lines");
  /* trailing blank lines do not count as atoms */
  expect_error ("3\nc\nH 0 0 0\nH 0 0 1\n\n\n", "t.xyz:6: ", "after 2 of the 3");
  /* a blank line inside the atoms, more follows */
  expect_error ("3\nc\nH 0 0 0\n\nH 0 0 1\n", "t.xyz:4: ", "expected atom 2 of 3");
}

static void
test_bad_atoms (void **state)
{
  expect_file_error ("bad-element.xyz", ":4:1: ", "unknown element 'Xq'");
  expect_file_error ("bad-coordinate.xyz", ":3:10: ", "'0,5'");
  expect_error ("1\nc\nH 0 0\n", "t.xyz:3:6: ", "found 3 fields");
  expect_error ("1\nc\nH 0 nan 0\n", "t.xyz:3:5: ", "NaN and infinity");
  expect_error ("1\nc\nH 0 0 -Infinity\n", "t.xyz:3:7: ", "NaN and infinity");
  expect_error ("1\nc\nH 0 0 1e999\n", "t.xyz:3:7: ", "out of the range");
  expect_error ("1\nc\nH 0x10 0 0\n", "t.xyz:3:3: ", "'0x10'");
  expect_error ("1\nc\nH 1.2.3 0 0\n", "t.xyz:3:3: ", "'1.2.3'");
  expect_error ("1\nc\nH 1e 0 0\n", "t.xyz:3:3: ", "'1e'");
  expect_error ("1\nc\n  Q 0 0 0\n", "t.xyz:3:3: ", "unknown element 'Q'");
  expect_error ("1\nc\nC-1 0 0 0\n", "t.xyz:3:1: ", "unknown element 'C-1'");
  expect_error ("1\nc\n119 0 0 0\n", "t.xyz:3:1: ", "'119' is outside 1");
  expect_error ("1\nc\n0 0 0 0\n", "t.xyz:3:1: ", "outside 1");
  /* a mass that is not positive, at its column */
  expect_error ("1\nProperties=species:S:1:pos:R:3:masses:R:1\nH 0 0 0 -1\n",
                "t.xyz:3:9: ", "positive");
}

static void
test_bad_extended (void **state)
{
  expect_file_error ("bad-lattice.xyz", ":2:10: ", "9 numbers");
  expect_file_error ("bad-columns.xyz", ":4:18: ", "expected 7 columns");
  expect_error ("1\nLattice=\"1 0 0 0 1 0 0 0 x\"\nH 0 0 0\n", "t.xyz:2:26: ",
                "'x'");
  expect_error ("1\nLattice=\"1 0 0 0 1 0 2 0 0\"\nH 0 0 0\n", "t.xyz:2:10: ",
                "linearly dependent");
  expect_error ("1\nLattice=\"1 0 0 0 1 0 0 0 1\" pbc=\"T T\"\nH 0 0 0\n", "t.xyz:2:34: ",
                "3 values");
  expect_error ("1\nLattice=\"1 0 0 0 1 0 0 0 1\" pbc=\"T T yes\"\nH 0 0 0\n",
                "t.xyz:2:38: ", "'yes'");
  expect_error ("1\npbc=\"T T T\"\nH 0 0 0\n", "t.xyz:2:6: ", "no Lattice");
  expect_error ("1\nenergy=low\nH 0 0 0\n", "t.xyz:2:8: ", "'low'");
  expect_error ("1\nenergy=\"1 2\"\nH 0 0 0\n", "t.xyz:2:9: ", "one number");
  expect_error ("1\nLattice=\"1 0 0 0 1 0 0 0 1\" lattice=\"1 0 0 0 1 0 0 0 1\"\nH 0 0 0\n",
                "t.xyz:2:38: ", "twice");
  expect_error ("1\nProperties=species:S:1\nH 0 0 0\n", "t.xyz:2:12: ", "pos:R:3");
  expect_error ("1\nProperties=species:S:1:pos:S:3\nH 0 0 0\n", "t.xyz:2:24: ",
                "must be pos:R:3");
  expect_error ("1\nProperties=species:S:1:pos:R\nH 0 0 0\n", "t.xyz:2:24: ",
                "incomplete");
  expect_error ("1\nProperties=species:S:1:pos:R:3:tags:X:1\nH 0 0 0 1\n", "t.xyz:2:37: ",
                "type 'X'");
  expect_error ("1\nProperties=species:S:1:pos:R:3:tags:I:two\nH 0 0 0 1\n",
                "t.xyz:2:39: ", "'two'");
  expect_error ("1\nProperties=species:S:1:pos:R:3:tags:I:1\nH 0 0 0 1 2\n",
                "t.xyz:3:11: ", "expected 5 columns");
  expect_error ("1\nnote=\"never closed\nH 0 0 0\n", "t.xyz:2:6: ", "unterminated");
  /* forces that are not numbers */
  expect_error ("1\nProperties=species:S:1:pos:R:3:forces:R:3\nH 0 0 0 1 b 3\n",
                "t.xyz:3:11: ", "the y force component");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_plain),
    cmocka_unit_test (test_multi_frame_crlf),
    cmocka_unit_test (test_extended),
    cmocka_unit_test (test_isotopes_labels),
    cmocka_unit_test (test_small_cases),
    cmocka_unit_test (test_bad_count),
    cmocka_unit_test (test_bad_truncated),
    cmocka_unit_test (test_bad_atoms),
    cmocka_unit_test (test_bad_extended),
  };

  return cmocka_run_group_tests (tests, NULL, NULL);
}
