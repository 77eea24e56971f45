/* test-bundle.c — the *.quaver.json reader (src/io/qv-bundle.c).
 *
 * The bundles and matrix files are in tests/bundle/data, written by
 * data/make-data.py; all their numbers are invented. The test matrix is the
 * closed form H_ij = 10 δ_ij + ((i+1)(j+1) mod 7)/4, computed again here.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>
#include <time.h>
#include <unistd.h>
#include <cmocka.h>
#include <glib.h>
#include <glib/gstdio.h>
#include "qv-bundle.h"
#include "qv-element.h"
#include "qv-error.h"

#ifndef BUNDLE_DATA
#error "BUNDLE_DATA must name tests/bundle/data"
#endif

/* CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)), typed
 * here rather than taken from qv-units.h so the test checks the library. */
#define HARTREE_EV 27.211386245988
#define BOHR_ANGSTROM 0.529177210903
#define ELEMENTARY_CHARGE 1.602176634e-19

static char *
data_path (const char *name)
{
  return g_build_filename (BUNDLE_DATA, name, NULL);
}

static QvBundle *
load (const char *name, GError **error)
{
  g_autofree char *path = data_path (name);
  return qv_bundle_read_file (path, error);
}

static QvBundle *
load_ok (const char *name)
{
  g_autoptr(GError) error = NULL;
  QvBundle *b = load (name, &error);
  if (b == NULL)
    fail_msg ("%s: %s", name, error->message);
  return b;
}

static double
test_matrix (gsize i, gsize j)
{
  return 10.0 * (i == j) + (double) (((i + 1) * (j + 1)) % 7) / 4.0;
}

/* Element (i, j) of a column-major QvHessian. */
static double
at (const QvHessian *h, gsize i, gsize j)
{
  return h->data[i + j * h->n];
}

static void
assert_test_matrix (const QvHessian *h, gsize n, double factor, double rel)
{
  assert_non_null (h);
  assert_int_equal (h->n, n);
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      {
        const double want = test_matrix (i, j) * factor;
        if (fabs (at (h, i, j) - want) > rel * fabs (want))
          fail_msg ("H(%zu, %zu) = %.17g, expected %.17g", i, j, at (h, i, j), want);
      }
}

/* --- good bundles --------------------------------------------------------- */

static void
test_inline_layouts (void **state)
{
  static const char *const names[] = {
    "good-inline-full.quaver.json", "good-inline-lower.quaver.json",
    "good-inline-upper.quaver.json",
  };
  static const QvHessianLayout layouts[] = {
    QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_LOWER, QV_HESSIAN_LAYOUT_UPPER,
  };
  g_autoptr(QvBundle) full = load_ok (names[0]);

  for (gsize k = 0; k < G_N_ELEMENTS (names); k++)
    {
      g_autoptr(QvBundle) b = load_ok (names[k]);
      /* The values are quarters, exact in binary: equality is exact. */
      assert_test_matrix (b->hessian, 9, 1.0, 0.0);
      assert_memory_equal (b->hessian->data, full->hessian->data, 81 * sizeof (double));
      assert_int_equal (b->hessian->layout, layouts[k]);
      assert_string_equal (b->hessian_units, "eV/A^2");
      assert_null (b->hessian_path);
      assert_null (b->modes);
      assert_string_equal (b->title, "Invented triatomic for the reader tests");
    }
}

static void
test_structure (void **state)
{
  g_autoptr(QvBundle) b = load_ok ("good-inline-full.quaver.json");
  const QvStructure *s = b->structure;

  assert_int_equal (s->n_atoms, 3);
  assert_int_equal (s->atoms[0].z, 8);
  assert_int_equal (s->atoms[1].z, 1);
  assert_int_equal (s->atoms[2].z, 1);
  /* positions as written in the file */
  assert_true (s->atoms[0].position[2] == 0.1173);
  assert_true (s->atoms[1].position[1] == 0.7572);
  assert_true (s->atoms[2].position[1] == -0.7572);
  assert_true (s->atoms[2].position[2] == -0.4692);
  assert_false (s->has_cell);
  assert_false (qv_structure_is_periodic (s));
  assert_false (s->has_energy);
  assert_null (s->forces);
  assert_null (s->atoms[0].label);
  /* Default "isotopic": 16O, 1H. AME2016 (Wang et al., Chin. Phys. C 41,
   * 030003 (2017)): 15.99491461957 u and 1.00782503223 u (from memory). */
  assert_float_equal (s->atoms[0].mass, 15.99491461957, 1e-9);
  assert_float_equal (s->atoms[1].mass, 1.00782503223, 1e-9);
  assert_int_equal (s->atoms[0].mass_number, 16);
}

static void
test_crystal (void **state)
{
  g_autoptr(QvBundle) b = load_ok ("good-crystal.quaver.json");
  const QvStructure *s = b->structure;

  assert_int_equal (s->n_atoms, 2);
  assert_int_equal (s->atoms[0].z, 11);
  assert_int_equal (s->atoms[1].z, 17);
  assert_true (s->has_cell);
  assert_true (s->cell[0][1] == 2.8 && s->cell[2][0] == 2.8 && s->cell[1][1] == 0.0);
  /* a cell without "pbc" is periodic in all three directions */
  assert_true (s->pbc[0] && s->pbc[1] && s->pbc[2]);
  assert_true (s->has_energy);
  assert_true (s->energy == -6.75);
  assert_non_null (s->forces);
  assert_true (s->forces[0] == 0.01 && s->forces[2] == -0.02);
  assert_true (s->forces[3] == -0.01 && s->forces[5] == 0.02);
  assert_test_matrix (b->hessian, 6, 1.0, 0.0);
  assert_int_equal (b->hessian->layout, QV_HESSIAN_LAYOUT_UPPER);
}

/* "crystal": the primitive cell, the supercell counts, the mesh, and Born
 * charges per primitive site (docs/formats.md, "Crystals"). */
static void
test_crystal_member (void **state)
{
  g_autoptr(QvBundle) b = load_ok ("good-docs-crystal.quaver.json");

  assert_non_null (b->primitive);
  assert_int_equal (b->primitive->n_atoms, 2);
  assert_true (b->primitive->has_cell);
  assert_true (b->primitive->cell[0][1] == 2.82);
  assert_true (b->has_supercell_matrix);
  assert_int_equal (b->supercell_matrix[0][0], 1);
  assert_int_equal (b->supercell_matrix[0][1], 0);
  assert_int_equal (b->mesh[2], 12);
  assert_null (b->band_path);
  assert_non_null (b->born_charges);
  assert_true (b->born_charges[9] == -1.1);
  assert_true (b->has_dielectric && b->dielectric_tensor[2][2] == 2.4);
}

static void
test_slab_and_view (void **state)
{
  g_autoptr(QvBundle) b = load_ok ("good-slab.quaver.json");
  const QvStructure *s = b->structure;

  assert_true (s->has_cell);
  assert_true (s->pbc[0] && s->pbc[1] && !s->pbc[2]);
  assert_null (b->title);
  assert_test_matrix (b->hessian, 3, 1.0, 0.0);
}

static void
test_path_hessians (void **state)
{
  static const struct {
    const char *name;
    const char *file;
  } cases[] = {
    { "good-path-text.quaver.json", "hessian-9.txt" },
    { "good-path-npy.quaver.json", "hessian-9.npy" },
    { "good-path-subdir.quaver.json", "matrices/hessian-9.lower.txt" },
    { "good-path-inner-dotdot.quaver.json", "hessian-9.txt" },
  };
  g_autoptr(QvBundle) inline_bundle = load_ok ("good-inline-full.quaver.json");

  for (gsize k = 0; k < G_N_ELEMENTS (cases); k++)
    {
      g_autoptr(QvBundle) b = load_ok (cases[k].name);
      g_autofree char *expect = data_path (cases[k].file);
      assert_test_matrix (b->hessian, 9, 1.0, 0.0);
      assert_memory_equal (b->hessian->data, inline_bundle->hessian->data,
                           81 * sizeof (double));
      assert_non_null (b->hessian_path);
      assert_string_equal (b->hessian_path, expect);
      assert_string_equal (b->hessian_units, "eV/A^2");
    }
}

static void
test_units (void **state)
{
  g_autoptr(QvBundle) hartree = load_ok ("good-units-hartree.quaver.json");
  g_autoptr(QvBundle) mdyn = load_ok ("good-units-mdyn.quaver.json");
  /* 1 hartree/bohr² = E_h / a_0² in eV/Å², CODATA 2018 values above. */
  const double f_hartree = HARTREE_EV / (BOHR_ANGSTROM * BOHR_ANGSTROM);
  /* 1 mdyn/Å = 1e-8 N / 1e-10 m = 100 N/m = 1e-18 J/Å²; in eV divide by e. */
  const double f_mdyn = 1e-18 / ELEMENTARY_CHARGE;

  assert_test_matrix (hartree->hessian, 9, f_hartree, 1e-14);
  assert_string_equal (hartree->hessian_units, "hartree/bohr^2");
  assert_test_matrix (mdyn->hessian, 9, f_mdyn, 1e-14);
  /* kept as written, including the Å */
  assert_string_equal (mdyn->hessian_units, "mdyn/Å");
  /* a closed-form sanity value: 1 hartree/bohr² ≈ 97.17 eV/Å² (from memory) */
  assert_float_equal (at (hartree->hessian, 0, 0) / test_matrix (0, 0), 97.1736, 1e-3);
}

static void
test_masses (void **state)
{
  g_autoptr(QvBundle) b = load_ok ("good-masses.quaver.json");
  g_autoptr(QvBundle) iso = load_ok ("good-isotopes.quaver.json");
  const QvStructure *s = b->structure;

  /* element given as "o", 1 and "h" */
  assert_int_equal (s->atoms[0].z, 8);
  assert_int_equal (s->atoms[1].z, 1);
  assert_int_equal (s->atoms[2].z, 1);
  assert_string_equal (s->atoms[0].label, "O1");
  assert_string_equal (s->atoms[2].label, "H2");
  /* "isotope": 18 overrides the average model: 18O = 17.99915961286 u
   * (AME2016, from memory). */
  assert_float_equal (s->atoms[0].mass, 17.99915961286, 1e-8);
  assert_int_equal (s->atoms[0].mass_number, 18);
  /* "mass" as typed */
  assert_true (s->atoms[1].mass == 2.0141);
  assert_int_equal (s->atoms[1].mass_number, 0);
  /* no override: "masses": "average" gives H's standard atomic weight,
   * 1.008 (IUPAC CIAAW conventional value, from memory). */
  assert_float_equal (s->atoms[2].mass, 1.008, 1e-9);
  assert_int_equal (s->atoms[2].mass_number, 0);

  /* isotopic model with 17O and 2H: AME2016 16.99913175650 u and
   * 2.01410177812 u (from memory); atom 3 keeps 1H. */
  assert_float_equal (iso->structure->atoms[0].mass, 16.99913175650, 1e-8);
  assert_float_equal (iso->structure->atoms[1].mass, 2.01410177812, 1e-8);
  assert_float_equal (iso->structure->atoms[2].mass, 1.00782503223, 1e-9);
}

static void
test_modes (void **state)
{
  /* the vectors and wavenumbers as written in good-modes.quaver.json */
  static const double wavenumbers[3] = { -120.5, 1595.0, 3657.0 };
  static const double d[3][9] = {
    { 0.0, 0.0, 0.07, 0.0, -0.43, -0.56, 0.0, 0.43, -0.56 },
    { 0.0, 0.0, -0.05, 0.0, 0.58, 0.40, 0.0, -0.58, 0.40 },
    { 0.0, 0.07, 0.0, 0.0, -0.56, 0.43, 0.0, -0.56, -0.43 },
  };
  g_autoptr(QvBundle) b = load_ok ("good-modes.quaver.json");
  const QvModeSet *m = b->modes;

  assert_null (b->hessian);
  assert_null (b->hessian_units);
  assert_non_null (m);
  assert_int_equal (m->n_atoms, 3);
  assert_int_equal (m->n_modes, 3);
  assert_false (m->has_hessian);
  for (gsize k = 0; k < 3; k++)
    {
      /* mass-weighted vector l = √m d / |√m d| (DESIGN §2), compared up to
       * sign because the mode set may choose canonical signs */
      const double *l = qv_mode_set_vector (m, k);
      double norm = 0.0, dot = 0.0;
      assert_float_equal (qv_mode_set_wavenumber (m, k), wavenumbers[k],
                          1e-9 * fabs (wavenumbers[k]));
      for (gsize i = 0; i < 9; i++)
        {
          const double x = d[k][i] * sqrt (b->structure->atoms[i / 3].mass);
          norm += x * x;
          dot += x * l[i];
        }
      assert_float_equal (fabs (dot) / sqrt (norm), 1.0, 1e-12);
    }
  assert_true (qv_mode_set_is_imaginary (m, 0));
  assert_false (qv_mode_set_is_imaginary (m, 1));
}

static void
test_docs_examples (void **state)
{
  g_autoptr(QvBundle) inline_bundle = load_ok ("good-docs-example.quaver.json");
  g_autoptr(QvBundle) path_bundle = load_ok ("good-docs-path.quaver.json");
  g_autoptr(QvBundle) modes_bundle = load_ok ("good-docs-modes.quaver.json");

  assert_int_equal (inline_bundle->hessian->n, 6);
  assert_memory_equal (inline_bundle->hessian->data, path_bundle->hessian->data,
                       36 * sizeof (double));
  assert_true (at (inline_bundle->hessian, 2, 5) == -118.7);
  assert_true (at (inline_bundle->hessian, 5, 2) == -118.7);
  assert_true (at (inline_bundle->hessian, 5, 5) == 118.7);
  assert_string_equal (inline_bundle->structure->atoms[1].label, "O1");
  assert_int_equal (modes_bundle->modes->n_modes, 1);
}

/* qv_bundle_read_data straight from memory, no file name. */
static void
test_read_data (void **state)
{
  static const char text[] =
    "\xEF\xBB\xBF{\"format\": \"quaver-bundle\", \"version\": 1, \"future-key\": {\"x\": 1},\n"
    " \"title\": \"\\u00c5 \\uD83D\\uDE00 \\\"q\\\" \\\\ \\/\",\n"
    " \"structure\": {\"atoms\": [{\"element\": 6, \"position\": [0, 0, 0]}]},\n"
    " \"hessian\": {\"units\": \"N/m\", \"layout\": \"lower\",\n"
    "             \"data\": [[1], [0, 2], [0, 0, 3]]}}";
  static const char with_path[] =
    "{\"format\": \"quaver-bundle\", \"version\": 1,\n"
    " \"structure\": {\"atoms\": [{\"element\": 6, \"position\": [0, 0, 0]}]},\n"
    " \"hessian\": {\"units\": \"N/m\", \"path\": \"h.txt\"}}";
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBundle) b = qv_bundle_read_data (text, strlen (text), NULL, &error);
  /* 1 N/m = 1 J/m² = 1e-20 J/Å², divided by e for eV */
  const double f = 1e-20 / ELEMENTARY_CHARGE;
  QvBundle *none;

  if (b == NULL)
    fail_msg ("%s", error->message);
  /* U+00C5, U+1F600 from a surrogate pair, escaped quote, backslash, slash */
  assert_string_equal (b->title, "\u00c5 \U0001F600 \"q\" \\ /");
  assert_int_equal (b->structure->atoms[0].z, 6);
  /* 12C is 12 u exactly: the definition of the dalton (SI Brochure 2019) */
  assert_true (b->structure->atoms[0].mass == 12.0);
  assert_float_equal (at (b->hessian, 2, 2), 3.0 * f, 1e-15 * f);
  assert_true (at (b->hessian, 0, 1) == 0.0);

  /* without a name the message says "<bundle>"; "h.txt" starts at 3:38 */
  none = qv_bundle_read_data (with_path, strlen (with_path), NULL, &error);
  assert_null (none);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, "<bundle>:3:38: hessian.path: a referenced "
                                 "file needs the bundle's own location"));
}

/* --- bad bundles ---------------------------------------------------------- */

typedef struct {
  const char *file;
  const char *head;           /* the message after "FILE:", from its start:
                                 "LINE:COL: json.path: what" (or the start
                                 of it); NULL: only "FILE:" is checked */
  const char *needles[2];     /* each must appear in the message */
  const char *starts_with;    /* the file the message names first, when it
                                 is not the bundle */
} BadCase;

/* The whole "FILE:LINE:COL: json.path: " prefix is asserted. LINE:COL is
 * where the offending value starts; for a missing key, where the object
 * that lacks it starts; for an unknown key, or the second of two keys that
 * exclude each other, where that key starts. Each was checked by eye
 * against the file (a caret under LINE:COL); the files are ASCII, so
 * characters and bytes count alike (see test_error_positions for text with
 * wider characters). */
static const BadCase bad_cases[] = {
  /* syntax: line and column of the offending character */
  { "bad-syntax-comma", "4:3: expected ',' or '}' after an object member, found '\"'" },
  { "bad-syntax-trailing-comma", "4:1: '}' after a comma" },
  { "bad-syntax-comment", "2:3: comments are not part of JSON" },
  { "bad-syntax-single-quote", "2:3: strings are written in double quotes" },
  { "bad-syntax-nan", "3:13: expected a JSON number" },
  { "bad-syntax-big-integer", "3:14: integer too large" },
  { "bad-syntax-trailing-text", "2:1: unexpected '}' after the end" },
  { "bad-syntax-unclosed", "3:19: line break inside a string" },
  { "bad-syntax-truncated", "7:13: expected a value", { "found the end of the file" } },
  { "bad-syntax-escape", "3:15: invalid escape" },
  /* lone UTF-16 surrogates, which json-glib would mangle */
  { "bad-syntax-surrogate", "3:16: \\uD800 is the first half of a UTF-16 surrogate pair" },
  { "bad-syntax-surrogate-low", "3:26: \\uDE00 is the second half" },
  { "bad-syntax-utf8", "3:18: invalid UTF-8" },
  { "bad-empty", "3:1: the file is empty" },
  { "bad-not-object", "1:1: expected the bundle's JSON object", { "found an array" } },
  /* header */
  { "bad-format-missing", "1:1: not a Quaver bundle" },
  { "bad-format-wrong", "2:13: format: expected \"quaver-bundle\", found \"xyz\"" },
  { "bad-version-2", "3:14: version: the bundle is version 2",
    { "this Quaver reads (version 1)" } },
  { "bad-version-0", "3:14: version: 0 is not a bundle version", { "reads version 1" } },
  { "bad-version-float", "3:14: version: expected an integer, found a number" },
  { "bad-version-string", "3:14: version: expected an integer, found a string" },
  { "bad-version-missing", "1:1: version: missing" },
  { "bad-title-type", "4:12: title: expected a string, found an integer" },
  /* structure */
  { "bad-structure-type", "6:16: structure: expected an object, found an array" },
  { "bad-structure-missing", "1:1: structure: missing" },
  { "bad-structure-key", "7:5: structure.atom: unknown key \"atom\"" },
  { "bad-atoms-empty", "7:14: structure.atoms: expected at least one atom" },
  { "bad-atoms-type", "7:14: structure.atoms: expected an array of atoms, "
                      "found an object" },
  { "bad-atom-type", "12:7: structure.atoms[1]: expected an object, found an integer" },
  { "bad-element-unknown", "13:20: structure.atoms[1].element: unknown element "
                           "symbol \"Xx\"" },
  { "bad-element-deuterium", "17:20: structure.atoms[2].element: ",
    { "\"element\": \"H\", \"isotope\": 2" } },
  { "bad-element-z", "9:20: structure.atoms[0].element: atomic number 0 is outside" },
  { "bad-element-bool", "9:20: structure.atoms[0].element: expected an element "
                        "symbol", { "found true" } },
  { "bad-element-missing", "8:7: structure.atoms[0].element: missing" },
  { "bad-position-count", "18:21: structure.atoms[2].position: expected 3 numbers, "
                          "found 2" },
  { "bad-position-type", "10:27: structure.atoms[0].position[1]: expected a number, "
                         "found a string" },
  { "bad-position-infinite", "10:32: structure.atoms[0].position[2]: number out of "
                             "range" },
  { "bad-label-type", "11:18: structure.atoms[0].label: expected a string, "
                      "found an array" },
  { "bad-atom-key", "11:9: structure.atoms[0].isotop: unknown key \"isotop\"", { "isotope" } },
  { "bad-isotope-unknown", "11:20: structure.atoms[0].isotope: no isotope 99 of O" },
  { "bad-isotope-type", "11:20: structure.atoms[0].isotope: expected a mass number" },
  { "bad-isotope-and-mass", "16:9: structure.atoms[1]: give \"isotope\" or \"mass\", "
                            "not both" },
  { "bad-mass-zero", "15:17: structure.atoms[1].mass: a mass must be positive" },
  { "bad-mass-negative", "15:17: structure.atoms[1].mass: a mass must be positive" },
  { "bad-masses-model", "37:13: masses: expected \"isotopic\" or \"average\"" },
  { "bad-cell-singular", "21:13: structure.cell: the lattice vectors are linearly "
                         "dependent" },
  { "bad-cell-shape", "23:7: structure.cell[1]: expected 3 numbers, found 2" },
  /* a crystal: the supercell needs its cell, the primitive cell too */
  { "bad-crystal-no-cell", "5:16: structure: a bundle with a \"crystal\" needs the supercell's "
                           "\"cell\"" },
  { "bad-crystal-primitive-cell", "82:18: crystal.primitive.cell: missing; the primitive cell "
                                  "needs its lattice vectors" },
  { "bad-crystal-supercell", "121:7: crystal.supercell[1]: expected an integer from 1 to 1000, "
                             "found a number" },
  { "bad-crystal-born-count", "132:13: born_charges.data: expected one 3x3 tensor per site of "
                              "the primitive cell (2), found 3" },
  { "bad-pbc-no-cell", "21:12: structure.pbc: periodic directions need a \"cell\"" },
  { "bad-pbc-type", "21:13: structure.pbc[0]: expected true or false, "
                    "found an integer" },
  { "bad-energy-type", "21:15: structure.energy: expected a number, found a string" },
  { "bad-forces-count", "21:15: structure.forces: expected 3 force vectors, one per "
                        "atom, found 2" },
  /* hessian or modes */
  { "bad-both", "37:3: the bundle has both \"hessian\" and \"modes\"" },
  { "bad-neither", "1:1: the bundle needs a \"hessian\" or precomputed \"modes\"" },
  { "bad-hessian-type", "22:14: hessian: expected an object, found a string" },
  { "bad-hessian-key", "35:5: hessian.unit: unknown key \"unit\"" },
  { "bad-units-missing", "22:14: hessian.units: missing", { "eV/A^2" } },
  { "bad-units-unknown", "23:14: hessian.units: ", { "eV/nm^2", "hartree/bohr^2" } },
  { "bad-layout-auto-inline", "24:15: hessian.layout: expected \"full\", \"lower\" or "
                              "\"upper\" with inline data, found \"auto\"" },
  { "bad-layout-missing", "22:14: hessian.layout: missing" },
  { "bad-layout-unknown", "24:15: hessian.layout: ", { "found \"diagonal\"" } },
  { "bad-data-and-path", "36:5: hessian: has both \"data\" and \"path\"" },
  { "bad-no-matrix", "22:14: hessian: needs the matrix" },
  { "bad-row-lower", "30:7: hessian.data[4]: expected 5 numbers (row 4 of the lower "
                     "layout, n = 9), found 6" },
  { "bad-row-upper", "33:7: hessian.data[7]: expected 2 numbers (row 7 of the upper "
                     "layout, n = 9), found 1" },
  { "bad-row-full", "26:7: hessian.data[0]: expected 9 numbers (row 0 of the full "
                    "layout, n = 9), found 8" },
  { "bad-row-type", "29:7: hessian.data[3]: expected a row of numbers, found a number" },
  { "bad-element-value-type", "26:26: hessian.data[0][3]: expected a number, "
                              "found true" },
  { "bad-hessian-rows", "25:13: hessian.data: expected 9 rows (3 × 3 atoms), "
                        "found 6" },
  { "bad-overflow-after-units", "31:19: hessian.data[5][2]: not a finite number once "
                                "converted from hartree/bohr^2" },
  { "bad-path-absolute", "24:13: hessian.path: \"/etc/hostname\" is an absolute path" },
  { "bad-path-dotdot", "24:13: hessian.path: \"../data/hessian-9.txt\" leads outside "
                       "the bundle's folder" },
  { "bad-path-deep-dotdot", "24:13: hessian.path: \"matrices/../../hessian-9.txt\" "
                            "leads outside" },
  { "bad-path-folder", "24:13: hessian.path: \"matrices/..\" names the bundle's "
                       "folder" },
  { "bad-path-missing", "24:13: hessian.path: cannot open ", { "not-here.txt" } },
  { "bad-path-type", "24:13: hessian.path: expected a string, found an integer" },
  /* the Hessian reader's own message names the matrix file */
  { "bad-path-size", NULL, { "hessian-6.txt:" }, "hessian-6.txt" },
  { "bad-modes-count", "24:22: modes.displacements: expected 2 vectors, one per "
                       "wavenumber, found 1" },
  { "bad-modes-length", "25:7: modes.displacements[0]: expected 9 numbers "
                        "(3 × 3 atoms), found 8" },
  { "bad-modes-too-many", "23:20: modes.wavenumbers: 10 modes, but 3 atoms have "
                          "at most 3N = 9" },
  { "bad-modes-empty", "23:20: modes.wavenumbers: expected at least one wavenumber" },
  { "bad-modes-zero-vector", "22:12: modes: ", { "zero" } },
  { "bad-modes-type", "25:36: modes.displacements[0][5]: expected a number, "
                      "found null" },
  { "bad-modes-missing-vectors", "22:12: modes.displacements: missing" },
};

/* NULL when @b and @error are the expected failure, else what is wrong. */
static char *
bad_problem (const char *label, QvBundle *b, const GError *error, const char *const *needles,
             gsize n_needles)
{
  if (b != NULL)
    return g_strdup_printf ("%s: read without an error", label);
  if (error == NULL)
    return g_strdup_printf ("%s: NULL without an error", label);
  if (!g_error_matches (error, QV_ERROR, QV_ERROR_INPUT))
    return g_strdup_printf ("%s: error is not QV_ERROR_INPUT: %s", label, error->message);
  for (gsize k = 0; k < n_needles && needles[k] != NULL; k++)
    if (strstr (error->message, needles[k]) == NULL)
      return g_strdup_printf ("%s: message\n  %s\nlacks\n  %s", label, error->message,
                              needles[k]);
  return NULL;
}

static void
check_bad (const char *label, QvBundle *b, GError *error, const char *const *needles,
           gsize n_needles)
{
  g_autofree char *problem = bad_problem (label, b, error, needles, n_needles);
  qv_bundle_free (b);
  if (problem != NULL)
    fail_msg ("%s", problem);
}

/* check_bad, and the message starts with @head ("FILE:LINE:COL: path: …"). */
static void
check_bad_head (const char *label, QvBundle *b, GError *error, const char *head,
                const char *const *needles, gsize n_needles)
{
  g_autofree char *problem = bad_problem (label, b, error, needles, n_needles);
  qv_bundle_free (b);
  if (problem == NULL && !g_str_has_prefix (error->message, head))
    problem = g_strdup_printf ("%s: message\n  %s\ndoes not start with\n  %s", label,
                               error->message, head);
  if (problem != NULL)
    fail_msg ("%s", problem);
}

static void
test_bad_bundles (void **state)
{
  GString *problems = g_string_new (NULL);

  for (gsize k = 0; k < G_N_ELEMENTS (bad_cases); k++)
    {
      g_autofree char *name = g_strconcat (bad_cases[k].file, ".quaver.json", NULL);
      g_autofree char *path = data_path (bad_cases[k].starts_with ? bad_cases[k].starts_with
                                                                  : name);
      g_autofree char *head = g_strconcat (path, ":", bad_cases[k].head, NULL);
      g_autoptr(GError) error = NULL;
      QvBundle *b = load (name, &error);
      g_autofree char *problem = bad_problem (name, b, error, bad_cases[k].needles,
                                              G_N_ELEMENTS (bad_cases[k].needles));
      /* every message starts with the file's path, then LINE:COL: */
      if (problem == NULL && !g_str_has_prefix (error->message, head))
        problem = g_strdup_printf ("%s: message\n  %s\ndoes not start with\n  %s", name,
                                   error->message, head);
      if (problem != NULL)
        g_string_append_printf (problems, "%s\n", problem);
      qv_bundle_free (b);
    }
  if (problems->len > 0)
    fail_msg ("%s", problems->str);
  g_string_free (problems, TRUE);
}

/* Every bad-*.quaver.json in the folder is in the table, so none goes
 * unchecked. */
static void
test_bad_cases_complete (void **state)
{
  g_autoptr(GDir) dir = g_dir_open (BUNDLE_DATA, 0, NULL);
  const char *entry;
  gsize found = 0;

  assert_non_null (dir);
  while ((entry = g_dir_read_name (dir)) != NULL)
    {
      gboolean listed = FALSE;
      if (!g_str_has_prefix (entry, "bad-") || !g_str_has_suffix (entry, ".quaver.json"))
        continue;
      found++;
      for (gsize k = 0; k < G_N_ELEMENTS (bad_cases) && !listed; k++)
        listed = strlen (entry) == strlen (bad_cases[k].file) + strlen (".quaver.json")
                 && strncmp (entry, bad_cases[k].file, strlen (bad_cases[k].file)) == 0;
      if (!listed)
        fail_msg ("%s is not in bad_cases", entry);
    }
  assert_int_equal (found, G_N_ELEMENTS (bad_cases));
}

static const char bundle_head[] =
  "{\"format\": \"quaver-bundle\", \"version\": 1,\n"
  " \"structure\": {\"atoms\": [{\"element\": \"O\", \"position\": [0, 0, 0]}]},\n";
static const char bundle_tail[] =
  " \"hessian\": {\"units\": \"eV/A^2\", \"layout\": \"lower\",\n"
  "             \"data\": [[1], [0, 1], [0, 0, 1]]}}\n";

/* 100 000 nested '[': refused at the 65th, quickly, without recursion. */
static void
test_depth_bomb (void **state)
{
  const gsize depth = 100000;
  GString *text = g_string_sized_new (depth + 8);
  g_autoptr(GError) error = NULL;
  const char *needles[] = { "bomb.quaver.json:1:65: nested deeper than 64 levels" };
  QvBundle *b;
  gint64 t0;

  for (gsize k = 0; k < depth; k++)
    g_string_append_c (text, '[');
  t0 = g_get_monotonic_time ();
  b = qv_bundle_read_data (text->str, text->len, "bomb.quaver.json", &error);
  check_bad ("depth bomb", b, error, needles, 1);
  g_clear_error (&error);
  /* also when the brackets are closed, and when they sit after a string
   * that contains brackets and escaped quotes */
  for (gsize k = 0; k < depth; k++)
    g_string_append_c (text, ']');
  b = qv_bundle_read_data (text->str, text->len, "bomb.quaver.json", &error);
  check_bad ("closed depth bomb", b, error, needles, 1);
  g_clear_error (&error);
  g_string_prepend (text, "{\"x\": \"[[\\\"{{\", \"y\": ");
  g_string_append_c (text, '}');
  {
    const char *n2[] = { "bomb.quaver.json:1:85: nested deeper" };
    b = qv_bundle_read_data (text->str, text->len, "bomb.quaver.json", &error);
    check_bad ("bomb after a string", b, error, n2, 1);
  }
  /* Not a timing assertion (DESIGN §7): a guard against a runaway scan. */
  if (g_get_monotonic_time () - t0 > 20 * G_USEC_PER_SEC)
    fail_msg ("the depth check took more than 20 s");
  g_string_free (text, TRUE);
}

/* Depth 64 exactly is accepted: an unknown top-level key (ignored, for
 * forward compatibility) nested 63 deep inside the top-level object. */
static void
test_depth_limit (void **state)
{
  GString *text = g_string_new (bundle_head);
  g_autoptr(GError) error = NULL;
  QvBundle *b;

  g_string_append (text, " \"notes\": ");
  for (int k = 0; k < QV_BUNDLE_MAX_DEPTH - 1; k++)
    g_string_append_c (text, '[');
  for (int k = 0; k < QV_BUNDLE_MAX_DEPTH - 1; k++)
    g_string_append_c (text, ']');
  g_string_append (text, ",\n");
  g_string_append (text, bundle_tail);
  b = qv_bundle_read_data (text->str, text->len, "deep.quaver.json", &error);
  if (b == NULL)
    fail_msg ("depth 64 refused: %s", error->message);
  qv_bundle_free (b);

  /* one more level is refused, at the bracket that passes the limit */
  g_string_assign (text, bundle_head);
  g_string_append (text, " \"notes\": ");
  for (int k = 0; k < QV_BUNDLE_MAX_DEPTH; k++)
    g_string_append_c (text, '[');
  for (int k = 0; k < QV_BUNDLE_MAX_DEPTH; k++)
    g_string_append_c (text, ']');
  g_string_append (text, ",\n");
  g_string_append (text, bundle_tail);
  {
    const char *needles[] = { "deep.quaver.json:3:74: nested deeper than 64" };
    b = qv_bundle_read_data (text->str, text->len, "deep.quaver.json", &error);
    check_bad ("depth 65", b, error, needles, 1);
  }
  g_string_free (text, TRUE);
}

/* The inline limit: n = 600 (200 atoms) inline is read; n = 603 is refused
 * with the advice to use "path". */
static GString *
big_bundle (gsize n_atoms, gboolean rows)
{
  const gsize n = 3 * n_atoms;
  GString *t = g_string_new ("{\"format\": \"quaver-bundle\", \"version\": 1, "
                             "\"structure\": {\"atoms\": [");
  for (gsize a = 0; a < n_atoms; a++)
    g_string_append_printf (t, "%s{\"element\": \"Ar\", \"position\": [%zu.0, 0, 0]}",
                            a ? ", " : "", 4 * a);
  g_string_append (t, "]}, \"hessian\": {\"units\": \"eV/A^2\", \"layout\": \"upper\", "
                      "\"data\": [");
  for (gsize i = 0; rows && i < n; i++)
    {
      g_string_append_printf (t, "%s[%zu", i ? ",\n" : "", i + 1);
      for (gsize j = i + 1; j < n; j++)
        g_string_append (t, j == i + 1 ? ", 0.5" : ", 0");
      g_string_append_c (t, ']');
    }
  g_string_append (t, "]}}");
  return t;
}

static void
test_inline_limit (void **state)
{
  g_autoptr(GError) error = NULL;
  GString *ok = big_bundle (QV_BUNDLE_MAX_INLINE_N / 3, TRUE);
  GString *big = big_bundle (QV_BUNDLE_MAX_INLINE_N / 3 + 1, FALSE);
  const char *needles[] = { "\"path\"" };
  /* one line of ASCII: the column of the data's '[' is its offset + 1 */
  g_autofree char *head = g_strdup_printf ("big.quaver.json:1:%zu: hessian.data: a 603 × 603 "
                                           "matrix (201 atoms) is too large to store inline "
                                           "(at most 600)",
                                           (size_t) (strstr (big->str, "\"data\": [") - big->str)
                                           + strlen ("\"data\": ") + 1);
  QvBundle *b = qv_bundle_read_data (ok->str, ok->len, "ok.quaver.json", &error);

  if (b == NULL)
    fail_msg ("n = 600 inline refused: %s", error->message);
  assert_int_equal (b->hessian->n, 600);
  assert_true (at (b->hessian, 599, 599) == 600.0);
  assert_true (at (b->hessian, 10, 11) == 0.5 && at (b->hessian, 11, 10) == 0.5);
  assert_true (at (b->hessian, 10, 12) == 0.0);
  qv_bundle_free (b);

  b = qv_bundle_read_data (big->str, big->len, "big.quaver.json", &error);
  check_bad_head ("n = 603 inline", b, error, head, needles, 1);
  g_string_free (ok, TRUE);
  g_string_free (big, TRUE);
}

/* Four argon atoms and a 12 × 12 lower triangle, row i alone on line 4 + i
 * as "  [0, 0, …, 1]" (so element k of a row starts at column 4 + 3k); row
 * @short_row has one number too few, and with @bad_value element [11][10]
 * is true. */
static GString *
rows_bundle (gsize short_row, gboolean bad_value)
{
  GString *t = g_string_new ("{\"format\": \"quaver-bundle\", \"version\": 1,\n"
                             " \"structure\": {\"atoms\": [");
  for (gsize a = 0; a < 4; a++)
    g_string_append_printf (t, "%s{\"element\": \"Ar\", \"position\": [%zu, 0, 0]}",
                            a ? ", " : "", 4 * a);
  g_string_append (t, "]},\n \"hessian\": {\"units\": \"eV/A^2\", \"layout\": \"lower\", "
                      "\"data\": [\n");
  for (gsize i = 0; i < 12; i++)
    {
      const gsize count = i == short_row ? i : i + 1;
      g_string_append (t, "  [");
      for (gsize j = 0; j < count; j++)
        g_string_append_printf (t, "%s%s", j ? ", " : "",
                                j == i ? "1" : bad_value && i == 11 && j == 10 ? "true" : "0");
      g_string_append (t, i + 1 < 12 ? "],\n" : "]\n");
    }
  g_string_append (t, "]}}\n");
  return t;
}

/* Positions of content errors in text written here, where the expected
 * LINE:COL is counted by hand in the text (columns in characters, as
 * docs/formats.md says). */
static void
test_error_positions (void **state)
{
  static const struct {
    const char *label;
    const char *text;
    const char *head;
  } cases[] = {
    /* Å, é (2 bytes each) and U+1F600 (4 bytes) are one column each: the
     * value 7 is character 56 of the line, byte 61. */
    { "wide characters",
      "{\"format\": \"quaver-bundle\", \"title\": \"\xC3\x85\xC3\xA9\xF0\x9F\x98\x80\", "
      "\"version\": 7}",
      "pos.quaver.json:1:56: version: the bundle is version 7" },
    /* a byte order mark is skipped and not counted, as for syntax errors */
    { "byte order mark",
      "\xEF\xBB\xBF{\"format\": \"quaver-bundle\", \"title\": \"\xC3\x85\xC3\xA9\xF0\x9F\x98\x80\", "
      "\"version\": 7}",
      "pos.quaver.json:1:56: version: the bundle is version 7" },
    /* key names with escapes are followed as json-glib decodes them; the
     * unknown key is placed at its opening quote */
    { "escaped keys",
      "{\"format\": \"quaver-bundle\", \"version\": 1,\n"
      " \"struct\\u0075re\": {\"atoms\": [{\"element\": \"C\", \"position\": [0, 0, 0], "
      "\"\\u0069sotop\": 13}]}}",
      "pos.quaver.json:2:71: structure.atoms[0].isotop: unknown key \"isotop\"" },
    /* of two equal keys json-glib keeps the last, so that is the one placed */
    { "duplicate key",
      "{\"format\": \"quaver-bundle\", \"version\": 1, \"version\": 5}",
      "pos.quaver.json:1:54: version: the bundle is version 5" },
    /* "version_" begins like "version" but is another key (ignored at the
     * top level) */
    { "key with the same start",
      "{\"version_\": [7], \"format\": \"quaver-bundle\", \"version\": [2]}",
      "pos.quaver.json:1:57: version: expected an integer, found an array" },
    /* "hessian" after "modes": placed at the later key */
    { "hessian after modes",
      "{\"format\": \"quaver-bundle\", \"version\": 1, \"modes\": 3,\n"
      " \"structure\": {\"atoms\": [{\"element\": \"O\", \"position\": [0, 0, 0]}]},\n"
      " \"hessian\": 4}",
      "pos.quaver.json:3:2: the bundle has both \"hessian\" and \"modes\"" },
  };
  GString *short_row = rows_bundle (10, FALSE), *bad_value = rows_bundle (G_MAXSIZE, TRUE);
  g_autoptr(GError) error = NULL;
  QvBundle *b;

  for (gsize k = 0; k < G_N_ELEMENTS (cases); k++)
    {
      b = qv_bundle_read_data (cases[k].text, strlen (cases[k].text), "pos.quaver.json", &error);
      check_bad_head (cases[k].label, b, error, cases[k].head, NULL, 0);
      g_clear_error (&error);
    }

  /* indices of two digits: hessian.data[1] does not lead to hessian.data[10] */
  b = qv_bundle_read_data (short_row->str, short_row->len, "pos.quaver.json", &error);
  check_bad_head ("row 10", b, error, "pos.quaver.json:14:3: hessian.data[10]: expected 11 "
                  "numbers (row 10 of the lower layout, n = 12), found 10", NULL, 0);
  g_clear_error (&error);
  b = qv_bundle_read_data (bad_value->str, bad_value->len, "pos.quaver.json", &error);
  check_bad_head ("element [11][10]", b, error, "pos.quaver.json:15:34: hessian.data[11][10]: "
                  "expected a number, found true", NULL, 0);
  g_clear_error (&error);
  /* the same text with the row fixed reads, so the errors above are the
   * ones made on purpose */
  {
    GString *good = rows_bundle (G_MAXSIZE, FALSE);
    b = qv_bundle_read_data (good->str, good->len, "pos.quaver.json", &error);
    if (b == NULL)
      fail_msg ("the good rows bundle: %s", error->message);
    assert_int_equal (b->hessian->n, 12);
    assert_true (at (b->hessian, 11, 11) == 1.0 && at (b->hessian, 10, 11) == 0.0);
    qv_bundle_free (b);
    g_string_free (good, TRUE);
  }
  g_string_free (short_row, TRUE);
  g_string_free (bad_value, TRUE);
}

/* A symbolic link beside the bundle that leads out of its folder. */
static void
test_symlink_escape (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autofree char *root = g_dir_make_tmp ("qv-bundle-XXXXXX", &error);
  g_autofree char *inside = NULL, *outside = NULL, *link = NULL, *good_link = NULL;
  g_autofree char *bundle = NULL, *bundle2 = NULL, *matrix = NULL;
  g_autofree char *text = NULL;
  QvBundle *b;

  assert_non_null (root);
  inside = g_build_filename (root, "inside", NULL);
  outside = g_build_filename (root, "outside.txt", NULL);
  link = g_build_filename (inside, "h.txt", NULL);
  good_link = g_build_filename (inside, "same.txt", NULL);
  matrix = g_build_filename (inside, "real.txt", NULL);
  bundle = g_build_filename (inside, "b.quaver.json", NULL);
  bundle2 = g_build_filename (inside, "c.quaver.json", NULL);
  assert_int_equal (g_mkdir (inside, 0700), 0);
  assert_true (g_file_set_contents (outside, "1 0 0\n0 1 0\n0 0 1\n", -1, NULL));
  assert_true (g_file_set_contents (matrix, "1 0 0\n0 1 0\n0 0 1\n", -1, NULL));
  assert_int_equal (symlink (outside, link), 0);
  assert_int_equal (symlink ("real.txt", good_link), 0);

  text = g_strconcat (bundle_head, " \"hessian\": {\"units\": \"eV/A^2\", \"path\": \"h.txt\"}}",
                      NULL);
  assert_true (g_file_set_contents (bundle, text, -1, NULL));
  b = qv_bundle_read_file (bundle, &error);
  {
    /* line 3 of the text, ' "hessian": {"units": "eV/A^2", "path": "h.txt"}}' */
    const char *needles[] = { "outside the bundle's folder" };
    g_autofree char *head = g_strconcat (bundle, ":3:41: hessian.path: \"h.txt\" is a symbolic "
                                         "link", NULL);
    check_bad_head ("symlink escape", b, error, head, needles, 1);
  }
  g_clear_error (&error);

  /* a link that stays inside is fine */
  g_free (text);
  text = g_strconcat (bundle_head, " \"hessian\": {\"units\": \"eV/A^2\", \"path\": "
                      "\"same.txt\"}}", NULL);
  assert_true (g_file_set_contents (bundle2, text, -1, NULL));
  b = qv_bundle_read_file (bundle2, &error);
  if (b == NULL)
    fail_msg ("link inside the folder refused: %s", error->message);
  assert_true (at (b->hessian, 1, 1) == 1.0 && at (b->hessian, 0, 1) == 0.0);
  qv_bundle_free (b);

  g_unlink (link);
  g_unlink (good_link);
  g_unlink (matrix);
  g_unlink (bundle);
  g_unlink (bundle2);
  g_unlink (outside);
  g_rmdir (inside);
  g_rmdir (root);
}

static void
test_missing_file (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autofree char *path = data_path ("no-such.quaver.json");
  QvBundle *b = qv_bundle_read_file (path, &error);
  const char *needles[] = { "no-such.quaver.json: cannot open" };
  check_bad ("missing file", b, error, needles, 1);
}

/* Every prefix of a good bundle, and the bundle with each value swapped for
 * one of the wrong type: an error or a bundle, never a crash (run under
 * ASan/UBSan to make that check mean something). */
static void
test_never_crash (void **state)
{
  static const char *const files[] = {
    "good-masses.quaver.json", "good-modes.quaver.json", "good-crystal.quaver.json",
    "good-path-text.quaver.json",
  };
  static const char *const swaps[] = { "null", "true", "\"x\"", "[]", "{}", "-1", "1e400",
                                       "0", "[[]]", "[null]", "3.5" };

  for (gsize f = 0; f < G_N_ELEMENTS (files); f++)
    {
      g_autofree char *path = data_path (files[f]);
      g_autofree char *text = NULL;
      gsize length = 0, last = 0;
      assert_true (g_file_get_contents (path, &text, &length, NULL));
      last = (gsize) (strrchr (text, '}') - text);

      /* the text only closes at its last '}': every prefix without it fails */
      for (gsize cut = 0; cut <= last; cut++)
        {
          g_autoptr(GError) error = NULL;
          QvBundle *b = qv_bundle_read_data (text, cut, path, &error);
          if (b != NULL)
            fail_msg ("%s cut at %zu read without an error", files[f], cut);
          assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
        }

      /* swap each value that follows ": " or "[" or ", " */
      for (gsize pos = 0; pos + 1 < length; pos++)
        {
          gsize end;
          if (!(text[pos] == ':' || text[pos] == '[' || text[pos] == ','))
            continue;
          end = pos + 1;
          while (end < length && text[end] == ' ')
            end++;
          if (end >= length || strchr ("\"-0123456789tfn[{", text[end]) == NULL)
            continue;
          /* the extent of a scalar value (strings without escapes here) */
          {
            gsize stop = end;
            if (text[stop] == '"')
              {
                stop++;
                while (stop < length && text[stop] != '"')
                  stop++;
                stop++;
              }
            else if (text[stop] == '[' || text[stop] == '{')
              {
                int level = 0;
                do
                  {
                    if (text[stop] == '[' || text[stop] == '{')
                      level++;
                    else if (text[stop] == ']' || text[stop] == '}')
                      level--;
                    stop++;
                  }
                while (stop < length && level > 0);
              }
            else
              while (stop < length && strchr (",]}\n ", text[stop]) == NULL)
                stop++;
            for (gsize s = 0; s < G_N_ELEMENTS (swaps); s++)
              {
                g_autoptr(GError) error = NULL;
                GString *t = g_string_new_len (text, (gssize) end);
                QvBundle *b;
                g_string_append (t, swaps[s]);
                g_string_append_len (t, text + stop, (gssize) (length - stop));
                b = qv_bundle_read_data (t->str, t->len, path, &error);
                assert_true (b != NULL || g_error_matches (error, QV_ERROR, QV_ERROR_INPUT)
                             || g_error_matches (error, QV_ERROR, QV_ERROR_LIMIT));
                qv_bundle_free (b);
                g_string_free (t, TRUE);
              }
          }
        }
    }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_inline_layouts),
    cmocka_unit_test (test_structure),
    cmocka_unit_test (test_crystal),
    cmocka_unit_test (test_crystal_member),
    cmocka_unit_test (test_slab_and_view),
    cmocka_unit_test (test_path_hessians),
    cmocka_unit_test (test_units),
    cmocka_unit_test (test_masses),
    cmocka_unit_test (test_modes),
    cmocka_unit_test (test_docs_examples),
    cmocka_unit_test (test_read_data),
    cmocka_unit_test (test_bad_bundles),
    cmocka_unit_test (test_bad_cases_complete),
    cmocka_unit_test (test_depth_bomb),
    cmocka_unit_test (test_depth_limit),
    cmocka_unit_test (test_inline_limit),
    cmocka_unit_test (test_error_positions),
    cmocka_unit_test (test_symlink_escape),
    cmocka_unit_test (test_missing_file),
    cmocka_unit_test (test_never_crash),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
