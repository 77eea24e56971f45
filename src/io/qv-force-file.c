/* qv-force-file.c — plain force files and force units.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-force-file.h"
#include "qv-io-error.h"
#include "qv-units.h"

/* Largest force file read (bytes): ~ 80 bytes per atom for 10 million. */
#define MAX_BYTES ((gsize) 1 << 30)

static const char *const unit_names[QV_FORCE_UNIT_COUNT] = {
  "eV/A", "hartree/bohr", "Ry/bohr", "kcal/mol/A", "kJ/mol/A",
};

const char *
qv_force_unit_name (QvForceUnit unit)
{
  return unit < QV_FORCE_UNIT_COUNT ? unit_names[unit] : "?";
}

const char *
qv_force_unit_list (void)
{
  return "eV/A, hartree/bohr, Ry/bohr, kcal/mol/A, kJ/mol/A";
}

gboolean
qv_force_unit_parse (const char *text, QvForceUnit *unit, GError **error)
{
  g_autoptr(GString) t = g_string_new (text ? text : "");

  /* "Å" (UTF-8 C3 85) spelled as "A". */
  g_string_replace (t, "\xc3\x85", "A", 0);
  for (int u = 0; u < QV_FORCE_UNIT_COUNT; u++)
    if (g_ascii_strcasecmp (t->str, unit_names[u]) == 0)
      {
        *unit = (QvForceUnit) u;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown force unit '%s'; accepted: %s",
               text ? text : "", qv_force_unit_list ());
  return FALSE;
}

double
qv_force_unit_to_ev_a (QvForceUnit unit)
{
  /* CODATA 2018 (qv-units.h); kcal is the thermochemical 4.184 kJ. */
  const double ev_j = QV_ELEMENTARY_CHARGE;
  switch (unit)
    {
    case QV_FORCE_UNIT_EV_A: return 1.0;
    case QV_FORCE_UNIT_HARTREE_BOHR: return QV_HARTREE_EV / QV_BOHR_ANGSTROM;
    case QV_FORCE_UNIT_RY_BOHR: return 0.5 * QV_HARTREE_EV / QV_BOHR_ANGSTROM;
    case QV_FORCE_UNIT_KCAL_MOL_A: return QV_CALORIE * 1000.0 / QV_AVOGADRO / ev_j;
    case QV_FORCE_UNIT_KJ_MOL_A: return 1000.0 / QV_AVOGADRO / ev_j;
    default: return NAN;
    }
}

/* One number at @p (locale-independent, finite); NULL when there is none. */
static const char *
parse_number (const char *p, const char *end, double *value)
{
  char buf[64];
  gsize len = 0;
  char *stop = NULL;

  while (p + len < end && len < sizeof buf - 1 && strchr ("+-.0123456789eEdD", p[len]))
    len++;
  if (len == 0 || len == sizeof buf - 1)
    return NULL;
  memcpy (buf, p, len);
  buf[len] = '\0';
  /* Fortran exponents: 1.0D+00 */
  for (gsize i = 0; i < len; i++)
    if (buf[i] == 'd' || buf[i] == 'D')
      buf[i] = 'e';
  *value = g_ascii_strtod (buf, &stop);
  if (stop != buf + len)
    return NULL;
  return p + len;
}

double *
qv_force_file_read_data (const char *data, gsize length, const char *name,
                         gsize n_atoms, GError **error)
{
  g_autofree double *f = g_new (double, 3 * MAX (n_atoms, 1));
  const char *p = data, *end = data + length;
  gsize line = 0, rows = 0;

  while (p < end)
    {
      const char *eol = memchr (p, '\n', (gsize) (end - p));
      const char *stop = eol ? eol : end;
      const char *q = p;
      int found = 0;

      line++;
      if (stop > p && stop[-1] == '\r')
        stop--;
      for (;;)
        {
          double v;
          const char *after;

          while (q < stop && (*q == ' ' || *q == '\t' || *q == ','))
            q++;
          if (q >= stop || *q == '#')
            break;
          if (found == 3)
            {
              qv_io_error (error, name, line, (gsize) (q - p) + 1,
                           "more than 3 numbers on the line of atom %" G_GSIZE_FORMAT
                           " (one line per atom: Fx Fy Fz)", rows + 1);
              return NULL;
            }
          after = parse_number (q, stop, &v);
          if (after == NULL || (after < stop && !strchr (" \t,#", *after)))
            {
              const char *t = q;
              while (t < stop && !strchr (" \t,#", *t))
                t++;
              const char *w = (*q == '+' || *q == '-') ? q + 1 : q;
              const gboolean nonfinite = stop - w >= 3 && (g_ascii_strncasecmp (w, "nan", 3) == 0
                                                           || g_ascii_strncasecmp (w, "inf", 3) == 0);
              qv_io_error (error, name, line, (gsize) (q - p) + 1,
                           nonfinite ? "the force is not a finite number ('%.*s')"
                                     : "expected a number, got '%.*s'",
                           (int) MIN (t - q, 40), q);
              return NULL;
            }
          if (!isfinite (v))
            {
              qv_io_error (error, name, line, (gsize) (q - p) + 1,
                           "the force is not a finite number ('%.*s')", (int) MIN (after - q, 40), q);
              return NULL;
            }
          if (rows >= n_atoms)
            {
              qv_io_error (error, name, line, (gsize) (q - p) + 1,
                           "more lines of forces than the %" G_GSIZE_FORMAT " atoms", n_atoms);
              return NULL;
            }
          f[3 * rows + (gsize) found++] = v;
          q = after;
        }
      if (found > 0 && found < 3)
        {
          qv_io_error (error, name, line, (gsize) (q - p) + 1,
                       "%d number%s on the line of atom %" G_GSIZE_FORMAT ", expected 3 (Fx Fy Fz)",
                       found, found == 1 ? "" : "s", rows + 1);
          return NULL;
        }
      if (found == 3)
        rows++;
      p = eol ? eol + 1 : end;
    }
  if (rows != n_atoms)
    {
      qv_io_error (error, name, line, 0, "%" G_GSIZE_FORMAT " lines of forces, expected one for each of "
                   "the %" G_GSIZE_FORMAT " atoms", rows, n_atoms);
      return NULL;
    }
  return g_steal_pointer (&f);
}

double *
qv_force_file_read (const char *path, gsize n_atoms, GError **error)
{
  g_autofree char *data = NULL;
  gsize length = 0;

  if (!qv_io_read_file (path, MAX_BYTES, &data, &length, error))
    return NULL;
  return qv_force_file_read_data (data, length, path, n_atoms, error);
}
