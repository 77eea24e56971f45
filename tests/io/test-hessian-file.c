/* test-hessian-file.c — Hessian matrices from text and NumPy .npy.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * References: the C library's strtod (glibc, correctly rounded) for every
 * number of the text format, and NumPy's own .npy writer
 * (numpy.lib.format, through tests/io/data/make-hessian-data.py) for the
 * binary files. The matrices are invented. */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "qv-io-test.h"

#include <glib.h>
#include <glib/gstdio.h>
#include "qv-error.h"
#include "qv-hessian-file.h"

#define N_SYM 6

static char *
data_path (const char *file)
{
  return g_build_filename (QV_IO_TEST_DATA, file, NULL);
}

static char *
slurp (const char *file, gsize *length)
{
  g_autofree char *path = data_path (file);
  char *contents = NULL;

  assert_true (g_file_get_contents (path, &contents, length, NULL));
  return contents;
}

/* The reference: sym-full.txt read with strtod, line by line. */
static void
reference_matrix (double ref[N_SYM][N_SYM])
{
  gsize length;
  g_autofree char *text = slurp ("sym-full.txt", &length);
  g_auto (GStrv) lines = g_strsplit (text, "\n", -1);
  int row = 0;

  for (char **l = lines; *l != NULL; l++)
    {
      char *p = *l, *end;

      if (**l == '#' || **l == '\0')
        continue;
      for (int j = 0; j < N_SYM; j++)
        {
          ref[row][j] = strtod (p, &end);
          assert_true (end != p);
          p = end;
        }
      row++;
    }
  assert_int_equal (row, N_SYM);
  /* NumPy wrote (A + Aᵀ)/2: exactly symmetric */
  for (int i = 0; i < N_SYM; i++)
    for (int j = 0; j < N_SYM; j++)
      assert_memory_equal (&ref[i][j], &ref[j][i], sizeof (double));
}

static void
assert_same_as_reference (const QvHessian *h)
{
  double ref[N_SYM][N_SYM];

  reference_matrix (ref);
  assert_non_null (h);
  assert_int_equal (h->n, N_SYM);
  /* bit for bit: the same decimal strings or NumPy's binary of them */
  for (int i = 0; i < N_SYM; i++)
    for (int j = 0; j < N_SYM; j++)
      assert_memory_equal (&h->data[i * N_SYM + j], &ref[i][j], sizeof (double));
}

static QvHessian *
read_data_file (const char *file, gsize n, QvHessianLayout layout)
{
  g_autofree char *path = data_path (file);
  g_autoptr(GError) error = NULL;
  QvHessian *h = qv_hessian_read_file (path, n, layout, &error);

  if (h == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (h);
  return h;
}

static void
check_file (const char *file, QvHessianLayout layout, QvHessianLayout expected_layout)
{
  for (int pass = 0; pass < 3; pass++)
    {
      QvHessian *h;

      if (pass < 2)
        h = read_data_file (file, pass == 0 ? N_SYM : 0, layout);
      else
        {
          /* the in-memory entry points */
          gsize length;
          g_autofree char *contents = slurp (file, &length);
          g_autoptr(GError) error = NULL;

          if (expected_layout == QV_HESSIAN_LAYOUT_NPY)
            h = qv_hessian_read_npy (contents, length, file, N_SYM, &error);
          else
            h = qv_hessian_read_text (contents, length, file, N_SYM, layout, &error);
          if (h == NULL)
            print_error ("%s\n", error->message);
        }
      assert_same_as_reference (h);
      assert_int_equal (h->layout, expected_layout);
      qv_hessian_free (h);
    }
}

static void
test_layouts_agree (void **state)
{
  check_file ("sym-full.txt", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_FULL);
  check_file ("sym-lower.txt", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_LOWER);
  check_file ("sym-upper.txt", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_UPPER);
  check_file ("sym-commas.csv", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_FULL);
  check_file ("sym-full.txt", QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_FULL);
  check_file ("sym-lower.txt", QV_HESSIAN_LAYOUT_LOWER, QV_HESSIAN_LAYOUT_LOWER);
  check_file ("sym-upper.txt", QV_HESSIAN_LAYOUT_UPPER, QV_HESSIAN_LAYOUT_UPPER);
  /* wrapped lines need the layout given */
  check_file ("sym-wrapped.txt", QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_FULL);
  check_file ("sym-lower-wrapped.txt", QV_HESSIAN_LAYOUT_LOWER, QV_HESSIAN_LAYOUT_LOWER);
  /* .npy: 1.0, 2.0 and 3.0 headers, Fortran order big-endian */
  check_file ("sym.npy", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_NPY);
  check_file ("sym-v2.npy", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_NPY);
  check_file ("sym-v3.npy", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_NPY);
  check_file ("sym-fortran-be.npy", QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_NPY);
}

/* Not symmetric, A[i][j] = 10 i + j + 1 (make-hessian-data.py): C order is
 * stored as it comes, i.e. data[3 i + j] = A[i][j] (the transpose in the
 * column-major QvHessian, harmless as the solver symmetrizes); Fortran order
 * is the column-major matrix itself, data[i + 3 j] = A[i][j]. */
static void
test_npy_orders (void **state)
{
  const char *files[] = { "asym-c.npy", "asym-c-be.npy", "asym-fortran.npy" };

  for (gsize f = 0; f < G_N_ELEMENTS (files); f++)
    {
      g_autoptr(QvHessian) h = read_data_file (files[f], 3, QV_HESSIAN_LAYOUT_AUTO);
      gboolean fortran = f == 2;

      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          {
            double a = 10.0 * i + j + 1;

            assert_true (h->data[fortran ? i + 3 * j : 3 * i + j] == a);
          }
    }
}

/* A .npy file made here: @header is the dict text, padded as NumPy does
 * (to a multiple of 64 with spaces and a newline), then @count doubles in
 * little- or big-endian order. */
static GByteArray *
make_npy (int major, const char *header, const double *values, gsize count,
          gboolean big_endian)
{
  GByteArray *b = g_byte_array_new ();
  gsize prefix = major == 1 ? 10 : 12;
  gsize len = strlen (header) + 1;
  gsize total = (prefix + len + 63) / 64 * 64;
  gsize header_len = total - prefix;
  guint8 bytes[12] = { 0x93, 'N', 'U', 'M', 'P', 'Y', (guint8) major, 0 };

  bytes[8] = (guint8) (header_len & 0xff);
  bytes[9] = (guint8) ((header_len >> 8) & 0xff);
  bytes[10] = (guint8) ((header_len >> 16) & 0xff);
  bytes[11] = (guint8) ((header_len >> 24) & 0xff);
  g_byte_array_append (b, bytes, (guint) prefix);
  g_byte_array_append (b, (const guint8 *) header, (guint) strlen (header));
  for (gsize i = strlen (header); i + 1 < header_len; i++)
    g_byte_array_append (b, (const guint8 *) " ", 1);
  g_byte_array_append (b, (const guint8 *) "\n", 1);
  for (gsize i = 0; i < count; i++)
    {
      guint64 u;

      memcpy (&u, &values[i], sizeof u);
      u = big_endian ? GUINT64_TO_BE (u) : GUINT64_TO_LE (u);
      g_byte_array_append (b, (const guint8 *) &u, sizeof u);
    }
  return b;
}

static void
test_npy_made_here (void **state)
{
  const double v[4] = { 1.5, -2.25, -2.25, 1e-300 };
  struct {
    int major;
    const char *header;
    gboolean big_endian;
  } good[] = {
    { 1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), }", FALSE },
    { 1, "{\"descr\":\"=f8\",\"fortran_order\":True,\"shape\":(2,2)}", FALSE },
    { 2, "{'shape': (2, 2), 'fortran_order': False, 'descr': '>f8'}", TRUE },
    { 3, "{'descr': '<f8', 'fortran_order': False, 'shape': (2L, 2L), }", FALSE },
  };

  for (gsize k = 0; k < G_N_ELEMENTS (good); k++)
    {
      g_autoptr(GByteArray) b = make_npy (good[k].major, good[k].header, v, 4,
                                          good[k].big_endian);
      g_autoptr(GError) error = NULL;
      g_autoptr(QvHessian) h = qv_hessian_read_npy ((const char *) b->data, b->len, "m.npy",
                                                    0, &error);

      if (h == NULL)
        print_error ("%s\n", error->message);
      assert_non_null (h);
      assert_int_equal (h->n, 2);
      assert_memory_equal (h->data, v, sizeof v);
      assert_int_equal (h->layout, QV_HESSIAN_LAYOUT_NPY);
    }
}

static void
expect_npy_error (GByteArray *b, gsize n, const char *fragment)
{
  g_autoptr(GError) error = NULL;
  QvHessian *h = qv_hessian_read_npy ((const char *) b->data, b->len, "m.npy", n, &error);

  assert_null (h);
  assert_non_null (error);
  if (!g_str_has_prefix (error->message, "m.npy: ") || strstr (error->message, fragment) == NULL)
    print_error ("message: %s\nwanted: m.npy: … %s\n", error->message, fragment);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, "m.npy: "));
  assert_non_null (strstr (error->message, fragment));
}

static void
test_npy_bad (void **state)
{
  double v[6] = { 1, 2, 3, 4, 5, 6 };
  GByteArray *b;

  b = make_npy (1, "{'descr': '<f4', 'fortran_order': False, 'shape': (2, 2), }", v, 2, FALSE);
  expect_npy_error (b, 0, "dtype '<f4'");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<i8', 'fortran_order': False, 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 0, "dtype '<i8'");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': [('a', '<f8')], 'fortran_order': False, 'shape': (2,), }", v, 2,
                FALSE);
  expect_npy_error (b, 0, "structured");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 3), }", v, 6, FALSE);
  expect_npy_error (b, 0, "shape (2, 3)");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (6,), }", v, 6, FALSE);
  expect_npy_error (b, 0, "shape (6,)");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (1, 1, 1), }", v, 1, FALSE);
  expect_npy_error (b, 0, "shape (1, 1, 1)");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (0, 0), }", v, 0, FALSE);
  expect_npy_error (b, 0, "empty");
  g_byte_array_unref (b);
  /* 2^32 × 2^32 × 8 bytes overflows 64 bits */
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (4294967296, 4294967296), }",
                v, 0, FALSE);
  expect_npy_error (b, 0, "too large");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': "
                "(99999999999999999999999, 1), }", v, 0, FALSE);
  expect_npy_error (b, 0, "absurd");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), }", v, 3, FALSE);
  expect_npy_error (b, 0, "needs 32 bytes after the header, the file has 24");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), }", v, 5, FALSE);
  expect_npy_error (b, 0, "8 unexpected bytes");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 9, "has 2 rows");
  expect_npy_error (b, 9, "3 atoms (expects 3 × 3 = 9)");
  b->data[6] = 4;       /* version 4.0 */
  expect_npy_error (b, 0, "version 4.0");
  b->data[6] = 1;
  b->data[9] = 0x40;    /* header length 16 384 + …, past the end */
  expect_npy_error (b, 0, "header claims");
  g_byte_array_set_size (b, 9);
  expect_npy_error (b, 0, "ends inside its header");
  b->data[0] = 'X';
  expect_npy_error (b, 0, "not a NumPy .npy file");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 0, "lacks 'fortran_order'");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), 'x': 1}", v, 4,
                FALSE);
  expect_npy_error (b, 0, "unexpected key 'x'");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': maybe, 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 0, "malformed .npy header near 'maybe'");
  g_byte_array_unref (b);

  /* NaN and infinity, with the array's row and column */
  v[1] = NAN;   /* C order: row 1, column 2 */
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 0, "element (row 1, column 2) of the .npy array is NaN");
  g_byte_array_unref (b);
  b = make_npy (1, "{'descr': '<f8', 'fortran_order': True, 'shape': (2, 2), }", v, 4, FALSE);
  expect_npy_error (b, 0, "element (row 2, column 1) of the .npy array is NaN");
  g_byte_array_unref (b);
  v[1] = 2;
  v[3] = -INFINITY;
  b = make_npy (1, "{'descr': '>f8', 'fortran_order': False, 'shape': (2, 2), }", v, 4, TRUE);
  expect_npy_error (b, 0, "(row 2, column 2) of the .npy array is infinite");
  g_byte_array_unref (b);

  /* committed NumPy files that are not float64 matrices */
  {
    gsize length;
    g_autofree char *vec = slurp ("vector.npy", &length);
    g_autoptr(GError) error = NULL;

    assert_null (qv_hessian_read_npy (vec, length, "m.npy", 0, &error));
    assert_non_null (strstr (error->message, "shape (6,)"));
    g_clear_error (&error);
    g_free (vec);
    vec = slurp ("float32.npy", &length);
    assert_null (qv_hessian_read_npy (vec, length, "m.npy", 0, &error));
    assert_non_null (strstr (error->message, "dtype '<f4'"));
  }
}

/* Through qv_hessian_read_file, which reads .npy data straight from the
 * file descriptor. */
static void
test_npy_files_bad (void **state)
{
  g_autofree char *dir = g_dir_make_tmp ("qv-npy-XXXXXX", NULL);
  g_autofree char *path = g_build_filename (dir, "cut.npy", NULL);
  g_autofree char *text_path = g_build_filename (dir, "text.npy", NULL);
  gsize length;
  g_autofree char *good = slurp ("sym.npy", &length);
  g_autoptr(GError) error = NULL;

  assert_non_null (dir);
  assert_true (g_file_set_contents (path, good, (gssize) length - 8, NULL));
  assert_null (qv_hessian_read_file (path, 0, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, path));
  assert_non_null (strstr (error->message, "truncated .npy data"));
  g_clear_error (&error);

  assert_true (g_file_set_contents (path, good, 60, NULL));
  assert_null (qv_hessian_read_file (path, 0, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_non_null (strstr (error->message, "header claims"));
  g_clear_error (&error);

  assert_true (g_file_set_contents (path, good, (gssize) length, NULL));
  assert_null (qv_hessian_read_file (path, 9, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_non_null (strstr (error->message, "has 6 rows"));
  g_clear_error (&error);

  /* without the magic bytes it is text, whatever the name */
  {
    QvHessian *h;

    assert_true (g_file_set_contents (text_path, "1 2\n2 1\n", -1, NULL));
    h = qv_hessian_read_file (text_path, 0, QV_HESSIAN_LAYOUT_AUTO, &error);
    assert_non_null (h);
    assert_int_equal (h->layout, QV_HESSIAN_LAYOUT_FULL);
    assert_true (h->data[1] == 2.0);
    qv_hessian_free (h);
    assert_true (g_file_set_contents (text_path, "\x01\x02garbage", -1, NULL));
    assert_null (qv_hessian_read_file (text_path, 0, QV_HESSIAN_LAYOUT_AUTO, &error));
    assert_true (g_str_has_prefix (error->message, text_path));
    assert_non_null (strstr (error->message, ":1:1: expected a decimal number, found '\\x01\\x02garbage'"));
    g_clear_error (&error);
  }

  g_autofree char *missing = g_build_filename (dir, "missing.txt", NULL);
  assert_null (qv_hessian_read_file (missing, 0, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, missing));
  g_clear_error (&error);

  assert_null (qv_hessian_read_file (dir, 0, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_non_null (strstr (error->message, "is a directory"));
  g_clear_error (&error);

  g_remove (path);
  g_remove (text_path);
  g_rmdir (dir);
}

/* The text fails with QV_ERROR_INPUT, the message starts with @where and
 * contains @fragment. */
static void
expect_text_error (const char *text, gsize n, QvHessianLayout layout, const char *where,
                   const char *fragment)
{
  g_autoptr(GError) error = NULL;
  QvHessian *h = qv_hessian_read_text (text, strlen (text), "t.txt", n, layout, &error);

  assert_null (h);
  qvt_assert_input_error (error, where, fragment);
}

static void
test_text_ambiguous (void **state)
{
  gsize length;
  g_autofree char *wrapped = slurp ("sym-wrapped.txt", &length);
  g_autofree char *lower = slurp ("sym-lower-wrapped.txt", &length);
  g_autofree char *path = data_path ("sym-wrapped.txt");
  g_autoptr(GError) error = NULL;

  /* 36 numbers in 9 rows of 4: not a 4×4 matrix */
  expect_text_error (wrapped, 0, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5:1: ",
                     "row 5 is one too many for a full matrix of 4 columns (9 rows in all)");
  expect_text_error (wrapped, 6, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5:1: ",
                     "cannot be told from the row lengths");
  expect_text_error (wrapped, 6, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5:1: ",
                     "pass --hessian-layout full|lower|upper");
  /* 21 numbers in rows of 5, 5, 5, 5, 1: full until the last */
  expect_text_error (lower, 0, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5:",
                     "row 5 has 1 number, the rows before it make a full matrix, which needs 5");
  expect_text_error (lower, 0, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5:", "--hessian-layout");
  /* the same through the file reader */
  assert_null (qv_hessian_read_file (path, 6, QV_HESSIAN_LAYOUT_AUTO, &error));
  assert_true (g_str_has_prefix (error->message, path));
  assert_non_null (strstr (error->message, ":5:1: "));
  assert_non_null (strstr (error->message, "--hessian-layout full|lower|upper"));
}

static void
test_text_bad (void **state)
{
  const QvHessianLayout AUTO = QV_HESSIAN_LAYOUT_AUTO, FULL = QV_HESSIAN_LAYOUT_FULL;

  expect_text_error ("1 2\n3 x\n", 0, AUTO, "t.txt:2:3: ", "found 'x'");
  expect_text_error ("1 2\n3 1.2.3\n", 0, AUTO, "t.txt:2:3: ", "'1.2.3'");
  expect_text_error ("1 2\n3 1e\n", 0, AUTO, "t.txt:2:3: ", "'1e'");
  expect_text_error ("1 2\n3 --1\n", 0, AUTO, "t.txt:2:3: ", "'--1'");
  expect_text_error ("1 nan\n3 4\n", 0, AUTO, "t.txt:1:3: ", "'nan': NaN and infinity");
  expect_text_error ("1 2\n-inf 4\n", 0, AUTO, "t.txt:2:1: ", "NaN and infinity");
  expect_text_error ("1 2\n3   0x10\n", 0, AUTO, "t.txt:2:5: ", "'0x10'");
  expect_text_error ("1 2\n3 1e400\n", 0, AUTO, "t.txt:2:3: ", "'1e400' is out of the range");
  expect_text_error ("1 2\n3 4;\n", 0, AUTO, "t.txt:2:3: ", "'4;'");
  expect_text_error ("1,,2\n3 4\n", 0, AUTO, "t.txt:1:3: ", "before ','");
  expect_text_error (" ,1 2\n3 4\n", 0, AUTO, "t.txt:1:2: ", "before ','");
  expect_text_error ("1 2\r\n3 \xc3\xa9\r\n", 0, AUTO, "t.txt:2:3: ", "'\\xc3\\xa9'");

  /* row lengths */
  expect_text_error ("1 2 3\n4 5 6\n7 8\n", 0, AUTO, "t.txt:3:4: ",
                     "row 3 has 2 numbers, the rows before it make a full matrix, which needs 3");
  expect_text_error ("1 2 3\n4 5 6\n7 8 9 10\n", 0, AUTO, "t.txt:3:7: ", "row 3 has 4 numbers");
  expect_text_error ("1\n2 3\n4 5 6\n7 8\n", 0, AUTO, "t.txt:4:4: ",
                     "row 4 has 2 numbers, the rows before it make a lower triangle, which needs 4");
  expect_text_error ("1 2 3\n4 5\n6 7\n", 0, AUTO, "t.txt:3:3: ",
                     "make an upper triangle, which needs 1");
  expect_text_error ("1 2 3\n4 5 6\n", 0, AUTO, "t.txt:2: ",
                     "ends after 2 rows of 3 numbers");
  expect_text_error ("1 2\n3 4\n5 6\n", 0, AUTO, "t.txt:3:1: ", "row 3 is one too many");
  expect_text_error ("1 2 3\n4 5\n", 0, AUTO, "t.txt:2: ", "instead of 1");
  expect_text_error ("1 2\n3 4 5\n", 0, AUTO, "t.txt:2: ", "lower triangle starts with 1");
  expect_text_error ("1 2\n\n# two rows\n1 2 3 4\n", 0, AUTO, "t.txt:4:1: ",
                     "the first row has 2 numbers and the second 4");

  /* counts with an explicit layout */
  expect_text_error ("1 2 3 4 5\n", 2, FULL, "t.txt:1:9: ",
                     "too many numbers: a 2×2 full matrix has 4, this is number 5");
  expect_text_error ("1 2\n3\n", 2, FULL, "t.txt:2: ",
                     "too few numbers: the file ends after 3, a 2×2 full matrix has 4");
  expect_text_error ("1\n2 3\n4 5 6\n", 2, QV_HESSIAN_LAYOUT_LOWER, "t.txt:3:1: ",
                     "the file has 3 rows (lower triangle of 6 numbers), 2 were expected");
  expect_text_error ("1 2 3 4 5\n", 0, FULL, "t.txt:1: ", "5 numbers do not make a full matrix");
  expect_text_error ("1 2 3 4\n", 0, QV_HESSIAN_LAYOUT_UPPER, "t.txt:1: ",
                     "do not make an upper triangle");

  /* empty */
  expect_text_error ("", 0, AUTO, "t.txt:1: ", "the file is empty");
  expect_text_error ("# nothing\n\n   \n", 6, AUTO, "t.txt:3: ", "no numbers");
  expect_text_error ("# nothing\n\n   \n", 6, FULL, "t.txt:3: ", "no numbers");
}

static void
test_text_dimension (void **state)
{
  gsize length;
  g_autofree char *full = slurp ("sym-full.txt", &length);
  g_autofree char *lower = slurp ("sym-lower.txt", &length);

  /* 6 rows for 3 atoms: told at the last row (line 7) */
  expect_text_error (full, 9, QV_HESSIAN_LAYOUT_AUTO, "t.txt:7: ",
                     "has 6 rows (full matrix), the geometry has 3 atoms (expects 3 × 3 = 9)");
  /* 6 rows for 1 atom: told at row 4 (line 5) */
  expect_text_error (full, 3, QV_HESSIAN_LAYOUT_AUTO, "t.txt:5: ",
                     "has 6 rows (full matrix), the geometry has 1 atom (expects 3 × 1 = 3)");
  expect_text_error (lower, 3, QV_HESSIAN_LAYOUT_AUTO, "t.txt:6: ",
                     "has 6 rows (lower triangle)");
  expect_text_error (full, 3, QV_HESSIAN_LAYOUT_FULL, "t.txt:3:",
                     "too many numbers: a 3×3 full matrix has 9, this is number 10; the file has "
                     "6 rows (full matrix of 36 numbers), the geometry has 1 atom (expects 3 × 1 = 3)");
}

static void
test_text_small (void **state)
{
  g_autoptr(GError) error = NULL;
  QvHessian *h;
  /* n = 1 is full */
  h = qv_hessian_read_text ("  5.5 # one number\n", strlen ("  5.5 # one number\n"), "t.txt", 0,
                            QV_HESSIAN_LAYOUT_AUTO, &error);
  assert_non_null (h);
  assert_int_equal (h->n, 1);
  assert_int_equal (h->layout, QV_HESSIAN_LAYOUT_FULL);
  assert_true (h->data[0] == 5.5);
  qv_hessian_free (h);

  /* a lower triangle of 3 with n inferred, both triangles filled; Fortran
   * 'D' exponents */
  {
    const char *text = "1\n2 3\n4 5 6.0D0";

    h = qv_hessian_read_text (text, strlen (text), "t.txt", 0, QV_HESSIAN_LAYOUT_AUTO, &error);
    assert_non_null (h);
    assert_int_equal (h->n, 3);
    assert_int_equal (h->layout, QV_HESSIAN_LAYOUT_LOWER);
    {
      const double expect[9] = { 1, 2, 4, 2, 3, 5, 4, 5, 6 };

      assert_memory_equal (h->data, expect, sizeof expect);
    }
    qv_hessian_free (h);
  }
  /* an upper triangle read as a stream: any line breaks */
  {
    const char *text = "1 2\n4 3 5\n6";

    h = qv_hessian_read_text (text, strlen (text), "t.txt", 3, QV_HESSIAN_LAYOUT_UPPER, &error);
    assert_non_null (h);
    {
      const double expect[9] = { 1, 2, 4, 2, 3, 5, 4, 5, 6 };

      assert_memory_equal (h->data, expect, sizeof expect);
    }
    qv_hessian_free (h);
  }
}

/* ------------------------------------------------------------------ */
/* The number parser against strtod                                     */

static void
add_token (GPtrArray *tokens, char *token)
{
  g_ptr_array_add (tokens, token);
}

static GPtrArray *
make_tokens (gsize target)
{
  static const char *const hard[] = {
    "0", "-0", "+0", "0.0", "-0.0e5", "000", "1e-310", "-1e-310", "4.9406564584124654e-324",
    "2.4703282292062327e-324", "2.4703282292062328e-324", "1e-400", "2.2250738585072014e-308",
    "2.2250738585072011e-308", "1.7976931348623157e308", "1.7976931348623158e308",
    "+.5", "5.", "-5.", "1E+05", "1e5", "1E-05", ".000001", "0.1", "0.2", "0.3", "1e23",
    "8.98846567431158e307", "9007199254740992", "9007199254740993", "9007199254740994",
    "9007199254740995", "18014398509481986", "18014398509481990", "9223372036854775807",
    "9223372036854775808", "18446744073709551615", "18446744073709551616", "9999999999999999999",
    "1.00000000000000011102230246251565404236316680908203125",
    "1.00000000000000011102230246251565404236316680908203124",
    "1.00000000000000011102230246251565404236316680908203126",
    "1234567890123456789012345", "0.1234567890123456789012345", "-9.876543210987654321098765e-5",
    "123456789012345678901234567890e-30", "0.000000000000000000000000000001234",
    "00000000000000000000000000123.4500e-3", "1.0000000000000000000000000001", "3.141592653589793",
    "2.718281828459045", "1e22", "1e-22", "9007199254740993e-22", "9007199254740993e22",
    "1e27", "1e-27", "1e28", "1e-28", "123456789e-27", "1.5e+300", "-2.5e-300", "7e-10",
    "-1.234567890123456e-02", "1.0D+00", "-3.5d-2",
  };
  GPtrArray *tokens = g_ptr_array_new_with_free_func (g_free);
  GRand *rand = g_rand_new_with_seed (20240601);

  for (gsize i = 0; i < G_N_ELEMENTS (hard); i++)
    add_token (tokens, g_strdup (hard[i]));
  while (tokens->len < target)
    {
      guint kind = g_rand_int_range (rand, 0, 8);
      guint64 bits = ((guint64) g_rand_int (rand) << 32) | g_rand_int (rand);
      double d;

      memcpy (&d, &bits, sizeof d);
      switch (kind)
        {
        case 0:   /* any finite double, shortest-exact and 17 digits */
          if (isfinite (d))
            add_token (tokens, g_strdup_printf ("%.17g", d));
          break;
        case 1:
          if (isfinite (d))
            add_token (tokens, g_strdup_printf ("%.16e", d));
          break;
        case 2:   /* Hessian-like: uniform in ±0.1, as numpy.savetxt '%.16e' */
          add_token (tokens, g_strdup_printf ("%.16e", g_rand_double_range (rand, -0.1, 0.1)));
          break;
        case 3:   /* fewer digits, any scale */
          add_token (tokens, g_strdup_printf ("%.*e", g_rand_int_range (rand, 0, 16),
                                              g_rand_double_range (rand, -1, 1)
                                              * pow (10.0, g_rand_int_range (rand, -40, 40))));
          break;
        case 4:   /* 19-digit mantissas with small exponents (the long double path) */
          add_token (tokens, g_strdup_printf ("%" G_GUINT64_FORMAT "e%d",
                                              bits % G_GUINT64_CONSTANT (10000000000000000000),
                                              g_rand_int_range (rand, -34, 30)));
          break;
        case 5:   /* midpoints between doubles above 2^53: (2j+1)·2^(s−1) */
          {
            guint64 j = (G_GUINT64_CONSTANT (1) << 52) | (bits >> 12);
            int s = g_rand_int_range (rand, 1, 12);
            guint64 m = (2 * j + 1) << (s - 1);

            add_token (tokens, g_strdup_printf ("%" G_GUINT64_FORMAT, m));
            add_token (tokens, g_strdup_printf ("%" G_GUINT64_FORMAT, m + 1));
            add_token (tokens, g_strdup_printf ("%" G_GUINT64_FORMAT, m - 1));
          }
          break;
        case 6:   /* 20 to 30 significant digits */
          {
            GString *s = g_string_new (g_rand_boolean (rand) ? "-" : "");
            int digits = g_rand_int_range (rand, 20, 31), point = g_rand_int_range (rand, 0, digits);

            for (int k = 0; k < digits; k++)
              {
                if (k == point)
                  g_string_append_c (s, '.');
                g_string_append_c (s, (char) ('0' + g_rand_int_range (rand, 0, 10)));
              }
            g_string_append_printf (s, "e%d", g_rand_int_range (rand, -320, 300));
            add_token (tokens, g_string_free (s, FALSE));
          }
          break;
        default:  /* short decimals */
          add_token (tokens, g_strdup_printf ("%.*f", g_rand_int_range (rand, 0, 10),
                                              g_rand_double_range (rand, -1000, 1000)));
          break;
        }
    }
  g_rand_free (rand);
  return tokens;
}

static double
reference_value (const char *token)
{
  char buffer[128];
  gsize i;

  /* strtod knows no Fortran 'D' */
  for (i = 0; token[i] != '\0' && i + 1 < sizeof buffer; i++)
    buffer[i] = (token[i] == 'd' || token[i] == 'D') ? 'e' : token[i];
  buffer[i] = '\0';
  return strtod (buffer, NULL);
}

static gboolean
token_in_range (const char *token)
{
  return isfinite (reference_value (token));
}

/* Compares every element with strtod of its token. @packed: the text is a
 * lower (or upper) triangle row by row. */
static void
compare_with_strtod (const QvHessian *h, char **tokens, gsize dim, QvHessianLayout layout)
{
  gsize k = 0;
  gsize mismatches = 0;

  assert_int_equal (h->n, dim);
  for (gsize i = 0; i < dim; i++)
    {
      gsize j0 = layout == QV_HESSIAN_LAYOUT_UPPER ? i : 0;
      gsize j1 = layout == QV_HESSIAN_LAYOUT_LOWER ? i + 1 : dim;

      for (gsize j = j0; j < j1; j++, k++)
        {
          double want = reference_value (tokens[k]);

          if (memcmp (&h->data[i * dim + j], &want, sizeof want) != 0
              || (layout != QV_HESSIAN_LAYOUT_FULL
                  && memcmp (&h->data[j * dim + i], &want, sizeof want) != 0))
            {
              if (mismatches++ < 10)
                print_error ("'%s': read %.17g, strtod %.17g\n", tokens[k],
                             h->data[i * dim + j], want);
            }
        }
    }
  assert_int_equal (mismatches, 0);
}

typedef enum { ROWS, ONE_PER_LINE, ONE_LINE } Shape;

static void
check_big_text (char **tokens, gsize dim, QvHessianLayout layout, Shape shape,
                const char *dir)
{
  GString *text = g_string_new (NULL);
  gsize k = 0;
  g_autofree char *path = g_build_filename (dir, "big.txt", NULL);
  QvHessianLayout read_layout = shape == ROWS ? QV_HESSIAN_LAYOUT_AUTO : layout;

  for (gsize i = 0; i < dim; i++)
    {
      gsize len = layout == QV_HESSIAN_LAYOUT_FULL ? dim
                  : layout == QV_HESSIAN_LAYOUT_LOWER ? i + 1 : dim - i;

      for (gsize j = 0; j < len; j++, k++)
        {
          g_string_append (text, tokens[k]);
          g_string_append_c (text, shape == ONE_PER_LINE || (shape == ROWS && j + 1 == len)
                                   ? '\n' : ' ');
        }
    }
  /* large enough for the two-thread path (4 MiB) and for many blocks of
   * the file streaming (1 MiB); ONE_LINE is longer than a block */
  assert_true (text->len >= ((gsize) 4 << 20));

  for (int pass = 0; pass < 2; pass++)
    {
      g_autoptr(GError) error = NULL;
      QvHessian *h;

      if (pass == 0)
        h = qv_hessian_read_text (text->str, text->len, "big.txt", dim, read_layout, &error);
      else
        {
          assert_true (g_file_set_contents (path, text->str, (gssize) text->len, NULL));
          h = qv_hessian_read_file (path, 0, read_layout, &error);
        }
      if (h == NULL)
        print_error ("%s\n", error->message);
      assert_non_null (h);
      assert_int_equal (h->layout, layout);
      compare_with_strtod (h, tokens, dim, layout);
      qv_hessian_free (h);
    }

  /* a bad token late in the text: the message has its absolute line and
   * column */
  {
    g_autoptr(GError) error = NULL;
    gsize line = 1, col;
    gsize at = text->len * 9 / 10, line_start = 0;
    g_autofree char *where = NULL;

    while (text->str[at] != '\n' && text->str[at] != ' ')
      at++;
    at++;                           /* the start of a token */
    for (gsize p = 0; p < at; p++)
      if (text->str[p] == '\n')
        line++, line_start = p + 1;
    col = at - line_start + 1;
    text->str[at] = 'x';            /* "x…": not a number */
    assert_null (qv_hessian_read_text (text->str, text->len, "big.txt", dim, read_layout,
                                       &error));
    where = g_strdup_printf ("big.txt:%" G_GSIZE_FORMAT ":%" G_GSIZE_FORMAT ": ", line, col);
    if (!g_str_has_prefix (error->message, where))
      print_error ("%s\nwanted %s\n", error->message, where);
    assert_true (g_str_has_prefix (error->message, where));
    g_clear_error (&error);

    assert_true (g_file_set_contents (path, text->str, (gssize) text->len, NULL));
    assert_null (qv_hessian_read_file (path, dim, read_layout, &error));
    g_free (where);
    where = g_strdup_printf ("%s:%" G_GSIZE_FORMAT ":%" G_GSIZE_FORMAT ": ", path, line, col);
    assert_true (g_str_has_prefix (error->message, where));
  }
  g_remove (path);
  g_string_free (text, TRUE);
}

static void
test_parser_vs_strtod (void **state)
{
  /* dims chosen so the texts pass 4 MiB (the two-thread path) */
  const gsize full = 560, triangle = 790;
  g_autoptr(GPtrArray) all = make_tokens (triangle * triangle);
  g_autoptr(GPtrArray) tokens = g_ptr_array_new ();
  g_autofree char *dir = g_dir_make_tmp ("qv-hessian-XXXXXX", NULL);
  gsize overflow = 0;

  for (guint i = 0; i < all->len; i++)
    if (token_in_range (all->pdata[i]))
      g_ptr_array_add (tokens, all->pdata[i]);
    else
      overflow++;
  /* the overflowing ones (such as "1.7976931348623159e308" rounding to inf
   * under strtod) are errors for the reader, tested in test_text_bad */
  assert_true (tokens->len >= full * full && tokens->len >= triangle * (triangle + 1) / 2);

  check_big_text ((char **) tokens->pdata, full, QV_HESSIAN_LAYOUT_FULL, ROWS, dir);
  check_big_text ((char **) tokens->pdata, full, QV_HESSIAN_LAYOUT_FULL, ONE_PER_LINE, dir);
  check_big_text ((char **) tokens->pdata, full, QV_HESSIAN_LAYOUT_FULL, ONE_LINE, dir);
  check_big_text ((char **) tokens->pdata, triangle, QV_HESSIAN_LAYOUT_LOWER, ROWS, dir);
  check_big_text ((char **) tokens->pdata, triangle, QV_HESSIAN_LAYOUT_UPPER, ROWS, dir);
  check_big_text ((char **) tokens->pdata, triangle, QV_HESSIAN_LAYOUT_UPPER, ONE_PER_LINE, dir);
  g_rmdir (dir);
  (void) overflow;
}

/* Small texts, one thread: every hard token alone as a 1×1 matrix. */
static void
test_parser_single_tokens (void **state)
{
  g_autoptr(GPtrArray) tokens = make_tokens (0);

  for (guint i = 0; i < tokens->len; i++)
    {
      const char *t = tokens->pdata[i];
      g_autoptr(GError) error = NULL;
      g_autoptr(QvHessian) h = qv_hessian_read_text (t, strlen (t), "t.txt", 1,
                                                     QV_HESSIAN_LAYOUT_AUTO, &error);
      double want = reference_value (t);

      if (!isfinite (want))
        {
          /* 1.7976931348623158e308 is the largest double; …159e308 is not
           * in the list, 1e-400 underflows to 0 — only overflow fails */
          assert_null (h);
          assert_non_null (strstr (error->message, "out of the range"));
          continue;
        }
      if (h == NULL)
        print_error ("'%s': %s\n", t, error->message);
      assert_non_null (h);
      if (memcmp (&h->data[0], &want, sizeof want) != 0)
        print_error ("'%s': read %.17g, strtod %.17g\n", t, h->data[0], want);
      assert_memory_equal (&h->data[0], &want, sizeof want);
    }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_layouts_agree),
    cmocka_unit_test (test_npy_orders),
    cmocka_unit_test (test_npy_made_here),
    cmocka_unit_test (test_npy_bad),
    cmocka_unit_test (test_npy_files_bad),
    cmocka_unit_test (test_text_ambiguous),
    cmocka_unit_test (test_text_bad),
    cmocka_unit_test (test_text_dimension),
    cmocka_unit_test (test_text_small),
    cmocka_unit_test (test_parser_single_tokens),
    cmocka_unit_test (test_parser_vs_strtod),
  };

  return cmocka_run_group_tests (tests, NULL, NULL);
}
