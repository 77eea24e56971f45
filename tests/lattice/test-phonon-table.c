/* test-phonon-table.c — the tables of qv-phonon-table.h as the app writes
 * them (sources partly unknown: NULL strings), read back: CSV cells and
 * JSON numbers (json-glib) equal the numbers given, to the digits printed;
 * the labels sit on their rows with their distances; the DOS in THz is
 * the cm⁻¹ DOS over the unit's factor (ν = c ν̃, CODATA 2018 c exact); the
 * thermal rows per mole are the per-cell values times e N_A / 1000 per
 * formula unit. Invented data throughout; the CLI's tables of the same
 * functions are checked against NumPy in test_bands_numpy.py and
 * test_thermo_numpy.py.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include <json-glib/json-glib.h>
#include "qv-phonon-table.h"

#define NB 3

static double
wave (gsize k, gsize b)
{
  return (b == 0 ? -12.5 : 0.0) + 100.0 * (double) (b + 1) * sin (0.1 * (double) k + 0.3 * (double) b);
}

static JsonNode *
parse (const char *text)
{
  g_autoptr(JsonParser) p = json_parser_new ();
  g_autoptr(GError) error = NULL;
  assert_true (json_parser_load_from_data (p, text, -1, &error));
  return json_node_copy (json_parser_get_root (p));
}

static void
test_bands (void **state)
{
  const double cell[3][3] = { { 4, 0, 0 }, { 0, 4, 0 }, { 0, 0, 4 } };
  g_autoptr(QvBandPath) path = qv_band_path_parse ("G 0 0 0; X 0 0.5 0 | M 0.5 0.5 0; G", NULL);
  g_autoptr(QvBandSampling) s = qv_band_path_sample (path, cell, 25, 0, NULL);
  g_autofree double *w = g_new (double, s->n_q * NB);
  QvBandTableInfo info;
  g_autofree char *csv = NULL, *json = NULL, *text = NULL;
  g_auto(GStrv) rows = NULL;
  g_autoptr(JsonNode) root = NULL;
  JsonArray *points;

  for (gsize k = 0; k < s->n_q; k++)
    for (gsize b = 0; b < NB; b++)
      w[k * NB + b] = wave (k, b);
  memset (&info, 0, sizeof info);
  info.source.n_sites = 1;
  info.overlap = TRUE;
  info.source.sum_rule = TRUE;

  csv = qv_phonon_table_bands (&info, s, NB, w, QV_PHONON_TABLE_CSV);
  rows = g_strsplit (csv, "\n", -1);
  assert_string_equal (rows[0], "distance_1/A,qa,qb,qc,label,branch_1_cm-1,branch_2_cm-1,branch_3_cm-1");
  assert_int_equal (g_strv_length (rows), s->n_q + 2);    /* header, rows, the empty tail */
  for (gsize k = 0; k < s->n_q; k++)
    {
      g_auto(GStrv) cells = g_strsplit (rows[k + 1], ",", -1);
      const char *label = NULL;
      assert_int_equal (g_strv_length (cells), 5 + NB);
      assert_true (fabs (g_ascii_strtod (cells[0], NULL) - s->distance[k]) <= 5e-7);
      for (int i = 0; i < 3; i++)
        assert_true (fabs (g_ascii_strtod (cells[1 + i], NULL) - s->q[3 * k + i]) <= 5e-7);
      for (gsize i = 0; i < s->n_labels; i++)
        if (s->label_index[i] == k)
          label = s->labels[i];
      assert_string_equal (cells[4], label ? label : "");
      for (gsize b = 0; b < NB; b++)
        assert_true (fabs (g_ascii_strtod (cells[5 + b], NULL) - w[k * NB + b]) <= 5e-5);
    }

  json = qv_phonon_table_bands (&info, s, NB, w, QV_PHONON_TABLE_JSON);
  root = parse (json);
  assert_true (json_object_get_null_member (json_node_get_object (root), "primitive"));
  assert_int_equal (json_object_get_int_member (json_node_get_object (root), "n_branches"), NB);
  points = json_object_get_array_member (json_node_get_object (root), "points");
  assert_int_equal (json_array_get_length (points), s->n_q);
  for (gsize k = 0; k < s->n_q; k++)
    {
      JsonObject *pt = json_array_get_object_element (points, (guint) k);
      JsonArray *wn = json_object_get_array_member (pt, "wavenumbers");
      assert_true (json_object_get_double_member (pt, "distance") == s->distance[k]);
      for (gsize b = 0; b < NB; b++)
        assert_true (json_array_get_double_element (wn, (guint) b) == w[k * NB + b]);
    }
  {
    JsonArray *labels = json_object_get_array_member (json_node_get_object (root), "labels");
    assert_int_equal (json_array_get_length (labels), s->n_labels);
    for (gsize i = 0; i < s->n_labels; i++)
      {
        JsonObject *l = json_array_get_object_element (labels, (guint) i);
        assert_string_equal (json_object_get_string_member (l, "label"), s->labels[i]);
        assert_true (json_object_get_double_member (l, "distance") == s->label_distance[i]);
      }
  }

  /* text: unknown sources as "-", the jump's label on its row */
  text = qv_phonon_table_bands (&info, s, NB, w, QV_PHONON_TABLE_TEXT);
  assert_non_null (strstr (text, "# quaver bands: -, 1 sites"));
  assert_non_null (strstr (text, "  # X|M\n"));
  assert_non_null (strstr (text, "# labels: G 0.000000 X|M "));
}

static void
test_dos (void **state)
{
  QvPhononDos dos = { 0 };
  double omega[5] = { 0, 10, 20, 30, 40 }, total[5] = { 0, 0.1, 0.3, 0.1, 0 };
  double partial[10] = { 0, 0.04, 0.1, 0.06, 0, 0, 0.06, 0.2, 0.04, 0 };
  guint z[2] = { 8, 14 };
  QvDosTableInfo info;
  g_autofree char *csv = NULL, *json = NULL;
  g_auto(GStrv) rows = NULL;
  g_autoptr(JsonNode) root = NULL;
  const double thz = 299792458.0 * 100.0 * 1e-12;    /* THz per cm⁻¹ */

  dos.method = QV_DOS_TETRAHEDRON;
  dos.step = 10;
  dos.n_points = 5;
  dos.omega = omega;
  dos.total = total;
  dos.n_groups = 2;
  dos.z = z;
  dos.partial = partial;
  dos.mesh[0] = dos.mesh[1] = dos.mesh[2] = 4;
  memset (&info, 0, sizeof info);
  info.source.n_sites = 3;
  info.n_q = 64;
  info.unit = QV_FREQUENCY_THZ;

  csv = qv_phonon_table_dos (&info, &dos, QV_PHONON_TABLE_CSV);
  rows = g_strsplit (csv, "\n", -1);
  assert_string_equal (rows[0], "frequency_THz,total,O,Si");
  for (int i = 0; i < 5; i++)
    {
      g_auto(GStrv) cells = g_strsplit (rows[i + 1], ",", -1);
      assert_true (fabs (g_ascii_strtod (cells[0], NULL) - omega[i] * thz) <= 5e-7);
      assert_true (fabs (g_ascii_strtod (cells[1], NULL) - total[i] / thz) <= 1e-8 * (total[i] / thz) + 1e-300);
      assert_true (fabs (g_ascii_strtod (cells[2], NULL) - partial[i] / thz) <= 1e-8 * (partial[i] / thz) + 1e-300);
      assert_true (fabs (g_ascii_strtod (cells[3], NULL) - partial[5 + i] / thz) <= 1e-8 * (partial[5 + i] / thz) + 1e-300);
    }
  json = qv_phonon_table_dos (&info, &dos, QV_PHONON_TABLE_JSON);
  root = parse (json);
  {
    JsonObject *o = json_node_get_object (root);
    JsonArray *t = json_object_get_array_member (o, "total");
    JsonObject *p = json_object_get_object_member (o, "partial");
    assert_string_equal (json_object_get_string_member (o, "frequency_unit"), "THz");
    assert_true (fabs (json_array_get_double_element (t, 2) - 0.3 / thz) <= 1e-14 * (0.3 / thz));
    assert_true (fabs (json_array_get_double_element (json_object_get_array_member (p, "Si"), 2) - 0.2 / thz)
                 <= 1e-14 * (0.2 / thz));
    assert_true (json_object_get_double_member (o, "states_per_cell") == 9.0);
  }
}

static void
test_thermal (void **state)
{
  const double q[3] = { 0.5, 0, 0 }, w[3] = { 150, 250, 350 }, t[3] = { 0, 300, 600 };
  g_autoptr(QvThermal) th = qv_thermal_compute (1, 3, q, w, FALSE, t, 3);
  const guint site_z[2] = { 19, 35 };
  QvThermalTableInfo info;
  g_autofree char *csv = NULL, *json = NULL;
  g_auto(GStrv) rows = NULL;
  g_autoptr(JsonNode) root = NULL;
  /* e N_A / 1000 for one mole of formula units, two formula units per cell */
  const double kj = 1.602176634e-19 * 6.02214076e23 / 1000.0 / 2.0;

  memset (&info, 0, sizeof info);
  info.source.n_sites = 2;
  info.formula = "KBr";
  info.formula_units = 2;
  info.site_z = site_z;
  csv = qv_phonon_table_thermal (&info, th, QV_PHONON_TABLE_CSV);
  rows = g_strsplit (csv, "\n", -1);
  assert_string_equal (rows[0], "T_K,F_kJ/mol,U_kJ/mol,S_J/(K.mol),Cv_J/(K.mol),ZPE_kJ/mol,F_eV/cell,"
                                "U_eV/cell,S_meV/(K.cell),Cv_meV/(K.cell)");
  for (int i = 0; i < 3; i++)
    {
      g_auto(GStrv) c = g_strsplit (rows[i + 1], ",", -1);
      const double want[10] = { t[i], th->free_energy[i] * kj, th->energy[i] * kj, th->entropy[i] * kj * 1000,
                                th->heat_capacity[i] * kj * 1000, th->zpe[i] * kj, th->free_energy[i],
                                th->energy[i], th->entropy[i] * 1000, th->heat_capacity[i] * 1000 };
      assert_int_equal (g_strv_length (c), 10);
      for (int k = 0; k < 10; k++)
        assert_true (fabs (g_ascii_strtod (c[k], NULL) - want[k]) <= 1e-7 * fabs (want[k]) + 1e-12);
    }
  json = qv_phonon_table_thermal (&info, th, QV_PHONON_TABLE_JSON);
  root = parse (json);
  {
    JsonObject *o = json_node_get_object (root);
    JsonArray *cv = json_object_get_array_member (o, "Cv");
    JsonObject *pc = json_object_get_object_member (o, "per_cell");
    assert_true (fabs (json_array_get_double_element (cv, 1) - th->heat_capacity[1] * kj * 1000)
                 <= 1e-14 * th->heat_capacity[1] * kj * 1000);
    assert_true (json_array_get_double_element (json_object_get_array_member (pc, "F"), 2) == th->free_energy[2]);
    assert_int_equal (json_object_get_int_member (o, "formula_units_per_cell"), 2);
    assert_false (json_object_has_member (o, "adp"));
  }
}

static void
test_format_parse (void **state)
{
  QvPhononTableFormat f;
  g_autoptr(GError) error = NULL;
  assert_true (qv_phonon_table_format_parse ("CSV", &f, NULL) && f == QV_PHONON_TABLE_CSV);
  assert_true (qv_phonon_table_format_parse ("json", &f, NULL) && f == QV_PHONON_TABLE_JSON);
  assert_false (qv_phonon_table_format_parse ("xlsx", &f, &error));
  assert_non_null (strstr (error->message, "text, csv, json"));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_bands),
    cmocka_unit_test (test_dos),
    cmocka_unit_test (test_thermal),
    cmocka_unit_test (test_format_parse),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
