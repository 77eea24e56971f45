/* test-cif.c — the CIF 1.1 reader: syntax, cell, operators, expansion, errors.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Sources of the expected values, beside each check:
 * - rock salt: Kittel, Introduction to Solid State Physics, ch. 1 (Na at
 *   the F-centred positions, Cl shifted by 1/2,1/2,1/2; a = 5.64 Å; 4 NaCl
 *   per conventional cube);
 * - the P2_1/c operators: International Tables for Crystallography Vol. A,
 *   space group 14, unique axis b, cell choice 1 (from memory), applied here
 *   by the test's own code;
 * - the cell from lengths and angles: the definitions |a|, |b|, |c| and the
 *   angles between the vectors (alpha between b and c, beta between a and c,
 *   gamma between a and b), checked by dot products (common practice);
 * - masses: NIST atomic masses of 23Na and 35Cl (from memory);
 * - the messages: the CIF 1.1 syntax rules (Hall, Allen & Brown 1991) for
 *   what is an error; the wording is ours, asserted exactly.
 * The monoclinic and bad files are invented. */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>

#include <glib.h>
#include <glib/gstdio.h>
#include "qv-cif.h"
#include "qv-error.h"
#include "qv-input.h"

static char *
data_path (const char *file)
{
  return g_build_filename (QV_CIF_TEST_DATA, file, NULL);
}

static QvStructure *
read_ok (const char *file, const char *block, double tolerance)
{
  g_autofree char *path = data_path (file);
  g_autoptr(GError) error = NULL;
  QvCifOptions options = { block, tolerance };
  QvStructure *s = qv_cif_read_file (path, &options, &error);

  if (s == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (s);
  return s;
}

static QvStructure *
read_text (const char *text, GError **error)
{
  return qv_cif_read_data (text, strlen (text), "t.cif", NULL, error);
}

/* Fractional coordinates of a Cartesian position in @s's cell, in [0, 1). */
static void
fractional (const QvStructure *s, const double r[3], double f[3])
{
  /* Solve f C = r by Cramer's rule (C rows = lattice vectors). */
  const double (*c)[3] = s->cell;
  double det = c[0][0] * (c[1][1] * c[2][2] - c[1][2] * c[2][1])
               - c[0][1] * (c[1][0] * c[2][2] - c[1][2] * c[2][0])
               + c[0][2] * (c[1][0] * c[2][1] - c[1][1] * c[2][0]);
  for (int k = 0; k < 3; k++)
    {
      double m[3][3];
      memcpy (m, c, sizeof m);
      for (int x = 0; x < 3; x++)
        m[k][x] = r[x];
      f[k] = (m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
              - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
              + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0])) / det;
      f[k] -= floor (f[k]);
    }
}

static double
periodic_gap (const double f[3], const double g[3])
{
  double worst = 0.0;
  for (int i = 0; i < 3; i++)
    {
      double d = f[i] - g[i];
      d -= round (d);
      worst = MAX (worst, fabs (d));
    }
  return worst;
}

/* How many atoms of element @z sit at fractional @f (mod 1). */
static int
count_at (const QvStructure *s, guint z, const double f[3])
{
  int n = 0;
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      double g[3];
      fractional (s, s->atoms[a].position, g);
      if (s->atoms[a].z == z && periodic_gap (f, g) < 1e-9)
        n++;
    }
  return n;
}

static int
count_z (const QvStructure *s, guint z)
{
  int n = 0;
  for (gsize a = 0; a < s->n_atoms; a++)
    n += s->atoms[a].z == z;
  return n;
}

static void
assert_error_exact (const GError *error, const char *expected)
{
  assert_non_null (error);
  if (strcmp (error->message, expected) != 0)
    print_error ("message: %s\nwanted:  %s\n", error->message, expected);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_string_equal (error->message, expected);
}

/* ------------------------------------------------------------------ */

static void
test_rocksalt (void **state)
{
  g_autoptr(QvStructure) s = read_ok ("rocksalt.cif", NULL, 0.0);
  /* Kittel ch. 1: F lattice, Na at the centring positions, Cl + (½,½,½). */
  static const double fcc[4][3] = { { 0, 0, 0 }, { 0, 0.5, 0.5 }, { 0.5, 0, 0.5 }, { 0.5, 0.5, 0 } };

  assert_int_equal (s->n_atoms, 8);        /* 4 formula units per cube (Kittel ch. 1) */
  assert_int_equal (count_z (s, 11), 4);
  assert_int_equal (count_z (s, 17), 4);
  for (int k = 0; k < 4; k++)
    {
      double cl[3] = { fcc[k][0] + 0.5, fcc[k][1] + 0.5, fcc[k][2] + 0.5 };
      assert_int_equal (count_at (s, 11, fcc[k]), 1);
      assert_int_equal (count_at (s, 17, cl), 1);
    }
  assert_true (s->has_cell);
  assert_true (s->pbc[0] && s->pbc[1] && s->pbc[2]);
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      assert_float_equal (s->cell[i][j], i == j ? 5.64 : 0.0, 1e-12);
  /* Labels kept; masses: 23Na 22.98976928 u, 35Cl 34.96885268 u (NIST,
   * from memory). */
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      assert_string_equal (s->atoms[a].label, s->atoms[a].z == 11 ? "Na1" : "Cl1");
      assert_float_equal (s->atoms[a].mass, s->atoms[a].z == 11 ? 22.98976928 : 34.96885268, 1e-6);
    }
}

/* ITA Vol. A, No. 14 (P 1 21/c 1), general position (from memory). */
static void
p21c_image (int k, const double f[3], double out[3])
{
  switch (k)
    {
    case 0: out[0] = f[0];  out[1] = f[1];       out[2] = f[2];       break;
    case 1: out[0] = -f[0]; out[1] = f[1] + 0.5; out[2] = -f[2] + 0.5; break;
    case 2: out[0] = -f[0]; out[1] = -f[1];      out[2] = -f[2];      break;
    default: out[0] = f[0]; out[1] = -f[1] + 0.5; out[2] = f[2] + 0.5; break;
    }
}

static void
test_monoclinic_general_and_special (void **state)
{
  g_autoptr(QvStructure) s = read_ok ("monoclinic.cif", NULL, 0.0);
  /* The values in the file, their uncertainties dropped. */
  const double c1[3] = { 0.1234, 0.2345, 0.3456 };
  const double len[3] = { 5.1234, 6.2, 7.3 };
  const double ang[3] = { 90.0, 104.52, 90.0 };

  /* Default block: "about" has no atoms, so "general" is read. */
  assert_string_equal (s->comment, "data_general");
  /* General position: 4 images (ITA multiplicity 4); the inversion centres
   * O1 at 0,0,0 and N1 at 1/2,0,1/2: 2 each (Wyckoff 2a, 2d). */
  assert_int_equal (count_z (s, 6), 4);
  assert_int_equal (count_z (s, 8), 2);
  assert_int_equal (count_z (s, 7), 2);
  assert_int_equal (s->n_atoms, 8);
  for (int k = 0; k < 4; k++)
    {
      double img[3];
      p21c_image (k, c1, img);
      assert_int_equal (count_at (s, 6, img), 1);
    }
  {
    const double o[2][3] = { { 0, 0, 0 }, { 0, 0.5, 0.5 } };
    const double n[2][3] = { { 0.5, 0, 0.5 }, { 0.5, 0.5, 0 } };
    for (int k = 0; k < 2; k++)
      {
        assert_int_equal (count_at (s, 8, o[k]), 1);
        assert_int_equal (count_at (s, 7, n[k]), 1);
      }
  }
  /* The cell: lengths and angles by dot products; a along x, b in xy,
   * right-handed. */
  for (int i = 0; i < 3; i++)
    {
      const double *u = s->cell[(i + 1) % 3], *v = s->cell[(i + 2) % 3];
      double lu = sqrt (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
      double lv = sqrt (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
      double li = sqrt (s->cell[i][0] * s->cell[i][0] + s->cell[i][1] * s->cell[i][1]
                        + s->cell[i][2] * s->cell[i][2]);
      double cosine = (u[0] * v[0] + u[1] * v[1] + u[2] * v[2]) / (lu * lv);
      assert_float_equal (li, len[i], 1e-12);
      assert_float_equal (acos (cosine) * 180.0 / G_PI, ang[i], 1e-9);
    }
  assert_float_equal (s->cell[0][1], 0.0, 0.0);
  assert_float_equal (s->cell[0][2], 0.0, 0.0);
  assert_float_equal (s->cell[1][2], 0.0, 0.0);
  assert_true (s->cell[0][0] * s->cell[1][1] * s->cell[2][2] > 0.0);
  /* Labels per site; D/T aside, elements from type symbols ("O2-") and
   * from the label when the symbol is '.' (N1). */
  for (gsize a = 0; a < s->n_atoms; a++)
    assert_string_equal (s->atoms[a].label,
                         s->atoms[a].z == 6 ? "C1" : s->atoms[a].z == 8 ? "O1" : "N1");
}

static void
test_block_by_name (void **state)
{
  g_autoptr(QvStructure) s = read_ok ("monoclinic.cif", "OTHER", 0.0);  /* case-insensitive */
  g_autofree char *path = data_path ("monoclinic.cif");
  g_autofree char *expected = NULL;
  g_autoptr(GError) error = NULL;
  QvCifOptions options = { "missing", 0.0 };
  double f[3];

  /* No operators: P1, the two sites as given. */
  assert_string_equal (s->comment, "data_other");
  assert_int_equal (s->n_atoms, 2);
  fractional (s, s->atoms[1].position, f);
  assert_float_equal (f[0], 0.6, 1e-12);
  assert_float_equal (f[1], 0.7, 1e-12);
  assert_float_equal (f[2], 0.8, 1e-12);
  assert_int_equal (s->atoms[0].z, 26);

  assert_null (qv_cif_read_file (path, &options, &error));
  expected = g_strdup_printf ("%s: no data block 'missing'; the file has: about, general, other", path);
  assert_error_exact (error, expected);
}

static void
test_merge_tolerance (void **state)
{
  /* A site 1e-5 (fractional, 5e-5 Å) off an inversion centre: one atom pair
   * within the default 0.01 Å is merged; at 1e-6 Å it is not. */
  const char *text =
    "data_t\n_cell_length_a 5\n_cell_length_b 5\n_cell_length_c 5\n"
    "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n"
    "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n-x,-y,-z\n"
    "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
    "Si1 0.00001 0 0\n";
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) merged = read_text (text, &error);
  QvCifOptions tight = { NULL, 1e-6 };
  g_autoptr(QvStructure) kept = qv_cif_read_data (text, strlen (text), "t.cif", &tight, &error);

  assert_non_null (merged);
  assert_int_equal (merged->n_atoms, 1);
  assert_non_null (kept);
  assert_int_equal (kept->n_atoms, 2);
  /* Wrapped into [0, 1): -0.00001 → 0.99999. */
  {
    double f[3];
    fractional (kept, kept->atoms[1].position, f);
    assert_float_equal (f[0], 0.99999, 1e-12);
  }
}

static void
test_syntax (void **state)
{
  /* CRLF ends, comments, quotes with embedded quote characters, a text
   * field for an operator, '?' and '.', an upper-case operator with the
   * translation first, and no identity in the list (it is added). */
  const char *text =
    "# comment\r\ndata_syntax # trailing comment\r\n"
    "_cell_length_a 4.0(1) _cell_length_b 4.00 _cell_length_c 4\r\n"
    "_cell_angle_alpha 90 _cell_angle_beta 90 _cell_angle_gamma 90\r\n"
    "_chemical_name_common 'it's quoted'\r\n"
    "_chemical_name_systematic \"it\"s double\"\r\n"
    "_note ?\r\n"
    "loop_\r\n_symmetry_equiv_pos_as_xyz\r\n"
    ";\r\n1/2+X, 1/2+Y, Z\r\n;\r\n"
    "loop_ _atom_site_label _atom_site_type_symbol _atom_site_fract_x _atom_site_fract_y "
    "_atom_site_fract_z _atom_site_occupancy\r\n"
    "'Cu 1' Cu 0.1 0.2 0.3 ?\r\n";
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) s = read_text (text, &error);
  double f[3];

  if (s == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (s);
  assert_int_equal (s->n_atoms, 2);
  assert_float_equal (s->cell[0][0], 4.0, 0.0);
  assert_string_equal (s->atoms[0].label, "Cu 1");
  fractional (s, s->atoms[1].position, f);
  assert_float_equal (f[0], 0.6, 1e-12);
  assert_float_equal (f[1], 0.7, 1e-12);
  assert_float_equal (f[2], 0.3, 1e-12);
}

static void
test_parse_operator (void **state)
{
  QvCifOperator op;
  gsize offset = 0;
  static const struct {
    const char *text;
    int r[3][3];
    double t[3];
  } good[] = {
    { "x,y,z", { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } }, { 0, 0, 0 } },
    { "-x+1/2,y,-z", { { -1, 0, 0 }, { 0, 1, 0 }, { 0, 0, -1 } }, { 0.5, 0, 0 } },
    { "x-y,x,z+2/3", { { 1, -1, 0 }, { 1, 0, 0 }, { 0, 0, 1 } }, { 0, 0, 2.0 / 3.0 } },
    { " 1/2+X , -Y+X ,0.25-z", { { 1, 0, 0 }, { 1, -1, 0 }, { 0, 0, -1 } }, { 0.5, 0, 0.25 } },
  };
  static const struct {
    const char *text;
    gsize offset;
    const char *fragment;
  } bad[] = {
    { "x,y,w", 4, "unknown token 'w'" },
    { "x,y", 3, "the operator has 2 components" },
    { "x,y,z,x", 5, "more than three components" },
    { "x,,z", 2, "component 2 of the operator is empty" },
    { "x,y,2z", 0, "determinant 2" },
    { "x,x,z", 0, "determinant 0" },
    { "x y,y,z", 2, "'y' where '+', '-' or ',' was expected" },
    { "x/2,y,z", 1, "'/' where '+', '-' or ',' was expected" },
    { "1/2x,y,z", 0, "the coefficient of x is 0.5" },
    { "x,y,z+1/0", 8, "non-zero denominator" },
    { "x,y,-", 5, "ends after a sign" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (good); i++)
    {
      g_autoptr(GError) error = NULL;
      assert_true (qv_cif_parse_operator (good[i].text, &op, &offset, &error));
      assert_memory_equal (op.rotation, good[i].r, sizeof op.rotation);
      for (int k = 0; k < 3; k++)
        assert_float_equal (op.translation[k], good[i].t[k], 1e-15);
    }
  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_autoptr(GError) error = NULL;
      offset = 999;
      assert_false (qv_cif_parse_operator (bad[i].text, &op, &offset, &error));
      assert_non_null (error);
      if (strstr (error->message, bad[i].fragment) == NULL || offset != bad[i].offset)
        print_error ("%s: %s (offset %zu)\n", bad[i].text, error->message, offset);
      assert_non_null (strstr (error->message, bad[i].fragment));
      assert_int_equal (offset, bad[i].offset);
    }
}

/* Bad files and their exact messages. */
static void
test_bad_files (void **state)
{
  static const struct {
    const char *file;
    const char *message;    /* after "PATH" */
  } cases[] = {
    { "partial-occupancy.cif",
      ":16:20: site 'Co2' has occupancy 0.50(2): Quaver needs an ordered structure with every "
      "site fully occupied; resolve the disorder into one ordered model (occupancy 1) first" },
    { "unknown-token.cif",
      ":11:12: symmetry operator '-x,y+1/2,-w': unknown token 'w' in a symmetry operator: use "
      "x, y, z, numbers, fractions, '+' and '-' (e.g. -x+1/2,y,-z)" },
    { "missing-cell.cif",
      ":1:1: data block 'nocell' has no _cell_length_c: the cell needs a, b, c (Å) and alpha, "
      "beta, gamma (degrees)" },
    { "unclosed-text.cif",
      ":4:1: text field opened here is never closed: end it with a line that starts with ';'" },
    { "unclosed-quote.cif",
      ":2:23: quoted string not closed on this line: end it with ' followed by a space, or use "
      "a text field (lines between ';' lines) for text that spans lines" },
    { "loop-count.cif",
      ":8:1: this loop has 4 tags but 7 values, not a whole number of rows: a value is missing "
      "or extra (values with spaces need quotes)" },
    { "overlap.cif",
      ":18:1: sites 'Fe1' and 'Fe2' fall on one place (within 0.01 Å, at 0.7500 0.7500 0.7500) "
      "once the symmetry operators are applied: a site listed twice or a disordered model; "
      "Quaver needs an ordered structure" },
    { "bad-number.cif",
      ":2:16: _cell_length_a is '4.0(', not a number: write e.g. 5.64 or 5.640(2)" },
    { "no-element.cif",
      ":13:1: site 'Q1': 'Q1' does not start with an element symbol: set "
      "_atom_site_type_symbol to the element (e.g. Fe or Fe3+)" },
    { "no-atoms.cif",
      ": no data block has atom sites (_atom_site_fract_x, _y, _z); the file has: first, "
      "second" },
    { "duplicate-tag.cif",
      ":4:1: tag _Cell_Length_A appears twice in data block 'twice' (first on line 2): keep "
      "one" },
    { "bad-cell.cif",
      ":5:19: the angles alpha 120, beta 120, gamma 120 make no cell (no volume): check "
      "_cell_angle_alpha, _beta and _gamma" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *name = g_build_filename ("bad", cases[i].file, NULL);
      g_autofree char *path = data_path (name);
      g_autofree char *expected = g_strconcat (path, cases[i].message, NULL);
      g_autoptr(GError) error = NULL;
      QvStructure *s = qv_cif_read_file (path, NULL, &error);

      assert_null (s);
      assert_error_exact (error, expected);
    }
}

static void
test_text_errors (void **state)
{
  static const struct {
    const char *text;
    const char *message;
  } cases[] = {
    { "", "t.cif: no data block: a CIF starts with data_NAME" },
    { "_cell_length_a 4\n", "t.cif:1:1: '_cell_length_a' before the first data block: a CIF "
      "starts with data_NAME" },
    { "data_\n", "t.cif:1:1: data_ without a name: write data_NAME" },
    { "data_a\n_cell_length_a\n", "t.cif:2:1: tag _cell_length_a has no value: give one ('?' "
      "when unknown)" },
    { "data_a\nloop_\n1 2\n", "t.cif:2:1: loop_ without tags: list the tags, then the values "
      "row by row" },
    { "data_a\n_x 1 2\n", "t.cif:2:6: value '2' without a tag: a loop has more values than its "
      "tags take, or a value with spaces needs quotes" },
    { "data_a\nsave_frame\n", "t.cif:2:1: 'save_frame' (save frames, global blocks) belongs to "
      "dictionaries, not to structure files: remove it" },
    { "data_a\ndata_A\n", "t.cif:2:1: a second data block named 'A' (the first is on line 1): "
      "block names must differ" },
    { "data_a\n_x [1]\n", "t.cif:2:4: a value cannot begin with '[' in CIF 1.1: put it in "
      "quotes" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr(GError) error = NULL;
      assert_null (read_text (cases[i].text, &error));
      assert_error_exact (error, cases[i].message);
    }
  /* A NUL byte in the middle. */
  {
    static const char nul[] = "data_a\n_x 1\n\0\n";
    g_autoptr(GError) error = NULL;
    assert_null (qv_cif_read_data (nul, sizeof nul - 1, "t.cif", NULL, &error));
    assert_error_exact (error, "t.cif:3:1: a NUL byte: this is not a text file (CIF is plain "
                        "text)");
  }
}

static void
test_site_errors (void **state)
{
  const char *head =
    "data_t\n_cell_length_a 5\n_cell_length_b 5\n_cell_length_c 5\n"
    "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n";
  static const struct {
    const char *sites;
    const char *message;
  } cases[] = {
    { "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Fe1 0.1 ? 0.3\n", "t.cif:13:9: site 'Fe1': _atom_site_fract_y is '?', not a number: "
      "give the fractional coordinate, e.g. 0.25 or 0.2500(3)" },
    { "loop_\n_atom_site_label\n_atom_site_Cartn_x\n", "t.cif:1:1: data block 't' has no "
      "_atom_site_fract_x: Quaver reads atom sites in fractional coordinates "
      "(_atom_site_fract_x, _y, _z), not Cartesian ones" },
    { "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "_atom_site_occupancy\nFe1 0.1 0.2 0.3 1.5\n", "t.cif:14:17: site 'Fe1' has occupancy "
      "1.5, more than 1: check the value" },
    { "_atom_site_label Fe1\n_atom_site_fract_x 0.1\n_atom_site_fract_y 0.2\n"
      "loop_\n_atom_site_fract_z\n_atom_site_occupancy\n0.3 1\n", "t.cif:12:1: this atom-site "
      "tag is not in the loop of _atom_site_fract_x (line 9): put all _atom_site_ tags in one "
      "loop" },
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *text = g_strconcat (head, cases[i].sites, NULL);
      g_autoptr(GError) error = NULL;
      assert_null (read_text (text, &error));
      assert_error_exact (error, cases[i].message);
    }
  /* One site as plain tag-value pairs, no loop. */
  {
    g_autofree char *text = g_strconcat (head, "_atom_site_label Ti1\n_atom_site_fract_x 0.5\n"
                                         "_atom_site_fract_y 0.25\n_atom_site_fract_z 0\n", NULL);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvStructure) s = read_text (text, &error);
    assert_non_null (s);
    assert_int_equal (s->n_atoms, 1);
    assert_int_equal (s->atoms[0].z, 22);
    assert_float_equal (s->atoms[0].position[0], 2.5, 1e-12);
    assert_float_equal (s->atoms[0].position[1], 1.25, 1e-12);
  }
  /* Deuterium by its symbol: hydrogen with mass number 2. */
  {
    g_autofree char *text = g_strconcat (head, "loop_\n_atom_site_label\n_atom_site_fract_x\n"
                                         "_atom_site_fract_y\n_atom_site_fract_z\nD1 0 0 0\n", NULL);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvStructure) s = read_text (text, &error);
    assert_non_null (s);
    assert_int_equal (s->atoms[0].z, 1);
    assert_int_equal (s->atoms[0].mass_number, 2);
  }
}

/* The input layer opens a *.cif with its Hessian. */
static void
test_input_branch (void **state)
{
  g_autofree char *path = data_path ("rocksalt.cif");
  g_autofree char *dir = g_dir_make_tmp ("qv-cif-XXXXXX", NULL);
  g_autofree char *hessian = g_build_filename (dir, "h.txt", NULL);
  GString *h = g_string_new (NULL);
  QvInputOptions options = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(GError) error = NULL;

  for (int i = 0; i < 24; i++)
    {
      for (int j = 0; j < 24; j++)
        g_string_append (h, i == j ? "1.0 " : "0 ");
      g_string_append_c (h, '\n');
    }
  assert_true (g_file_set_contents (hessian, h->str, (gssize) h->len, NULL));
  g_string_free (h, TRUE);
  options.geometry = path;
  options.hessian = hessian;
  options.hessian_units = "eV/A^2";
  input = qv_input_load (&options, &error);
  if (input == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (input);
  assert_int_equal (input->structure->n_atoms, 8);
  assert_true (input->structure->has_cell);
  g_unlink (hessian);
  g_rmdir (dir);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_rocksalt),
    cmocka_unit_test (test_monoclinic_general_and_special),
    cmocka_unit_test (test_block_by_name),
    cmocka_unit_test (test_merge_tolerance),
    cmocka_unit_test (test_syntax),
    cmocka_unit_test (test_parse_operator),
    cmocka_unit_test (test_bad_files),
    cmocka_unit_test (test_text_errors),
    cmocka_unit_test (test_site_errors),
    cmocka_unit_test (test_input_branch),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
