/* bench-thermo-panel.c — benchmark (not a test): what the Thermochemistry
 * page costs the main thread. For the demo (invented data, 9 atoms) and an
 * invented N-atom molecule (qvg_spring_system, default 1000 atoms), each
 * shown in a window: showing the document on the page, a change of an
 * option (the soft-mode treatment: every mode's share at one T, the rows
 * updated and re-sorted), a change of T, and the 191-temperature sweep the
 * plot needs after an option changed. Median and largest of 21 rounds, in
 * ms. Exits 0 whenever it could run.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "gui-test-util.h"

#define ROUNDS 21

static int
by_value (gconstpointer a, gconstpointer b)
{
  const double x = *(const double *) a, y = *(const double *) b;
  return x < y ? -1 : x > y;
}

static void
report (const char *what, const char *system, double *ms, int n)
{
  qsort (ms, (size_t) n, sizeof *ms, by_value);
  printf ("%-10s %-34s median %8.3f ms, largest %8.3f ms\n", system, what, ms[n / 2], ms[n - 1]);
}

static double
now_ms (void)
{
  return (double) g_get_monotonic_time () / 1000.0;
}

static void
measure (QvWindow *window, const char *system)
{
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  QvDocument *doc = qv_window_get_document (window);
  double ms[ROUNDS];

  qv_window_show_side_page (window, "thermo");
  qvg_spin (0.2);
  for (int i = 0; i < ROUNDS; i++)
    {
      const double t0 = now_ms ();
      qv_thermo_panel_set_document (panel, doc);
      ms[i] = now_ms () - t0;
      qvg_spin (0.01);
    }
  report ("show the document", system, ms, ROUNDS);
  for (int i = 0; i < ROUNDS; i++)
    {
      const double t0 = now_ms ();
      g_object_set (panel, "soft-modes", i % 2 ? QV_SOFT_MODES_NONE : QV_SOFT_MODES_QUASI_RRHO, NULL);
      ms[i] = now_ms () - t0;
      qvg_spin (0.01);
    }
  report ("option change (soft modes)", system, ms, ROUNDS);
  for (int i = 0; i < ROUNDS; i++)
    {
      const double t0 = now_ms ();
      g_object_set (panel, "temperature", 250.0 + 10.0 * i, NULL);
      ms[i] = now_ms () - t0;
      qvg_spin (0.01);
    }
  report ("temperature change", system, ms, ROUNDS);
  for (int i = 0; i < ROUNDS; i++)
    {
      double t0;
      gsize n = 0;
      g_object_set (panel, "soft-modes", i % 2 ? QV_SOFT_MODES_NONE : QV_SOFT_MODES_QUASI_RRHO, NULL);
      t0 = now_ms ();
      qv_thermo_panel_get_sweep (panel, &n);
      ms[i] = now_ms () - t0;
      qvg_spin (0.01);
    }
  report ("sweep, 191 T (none/quasi-rrho)", system, ms, ROUNDS);
}

int
main (int argc, char **argv)
{
  gsize atoms = 1000;
  QvWindow *window;
  char name[64];

  if (argc == 3 && strcmp (argv[1], "--atoms") == 0)
    atoms = (gsize) g_ascii_strtoull (argv[2], NULL, 10);
  qvg_app ();
  window = qvg_window ();
  qv_window_open_demo (window);
  if (!qvg_wait (qvg_window_has_document, window, 120.0))
    {
      fprintf (stderr, "the demo did not open\n");
      return 1;
    }
  measure (window, "demo");
  {
    QvHessian *hessian = NULL;
    QvStructure *s = qvg_spring_system (atoms, 7, &hessian);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvDocument) doc = qv_document_new_solved ("springs", s, hessian, &error);
    if (doc == NULL)
      {
        fprintf (stderr, "%s\n", error->message);
        return 1;
      }
    qv_window_set_document (window, doc);
    qvg_spin (0.5);
    g_snprintf (name, sizeof name, "%zu atoms", atoms);
    measure (window, name);
  }
  gtk_window_destroy (GTK_WINDOW (window));
  return 0;
}
