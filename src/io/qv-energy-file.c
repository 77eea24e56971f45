/* qv-energy-file.c — "NAME ENERGY" lines with a stated unit.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-energy-file.h"
#include "qv-error.h"
#include "qv-io-error.h"
#include "qv-units.h"

typedef struct {
  const char *name;
  const char *const spellings[4];
} UnitName;

static const UnitName unit_names[QV_ENERGY_UNIT_COUNT] = {
  [QV_ENERGY_UNIT_HARTREE]  = { "hartree",  { "hartree", "eh", "au", NULL } },
  [QV_ENERGY_UNIT_EV]       = { "eV",       { "ev", NULL } },
  [QV_ENERGY_UNIT_KCAL_MOL] = { "kcal/mol", { "kcal/mol", NULL } },
  [QV_ENERGY_UNIT_KJ_MOL]   = { "kJ/mol",   { "kj/mol", NULL } },
  [QV_ENERGY_UNIT_CM1]      = { "cm^-1",    { "cm^-1", "cm-1", "1/cm", NULL } },
};

const char *
qv_energy_unit_list (void)
{
  return "hartree, eV, kcal/mol, kJ/mol, cm^-1";
}

gboolean
qv_energy_unit_parse (const char *text, QvEnergyUnit *unit, GError **error)
{
  g_autofree char *folded = g_ascii_strdown (text, -1);

  for (int u = 0; u < QV_ENERGY_UNIT_COUNT; u++)
    for (const char *const *s = unit_names[u].spellings; *s; s++)
      if (strcmp (folded, *s) == 0)
        {
          *unit = (QvEnergyUnit) u;
          return TRUE;
        }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown energy unit '%s'; accepted: %s", text,
               qv_energy_unit_list ());
  return FALSE;
}

const char *
qv_energy_unit_name (QvEnergyUnit unit)
{
  return unit < QV_ENERGY_UNIT_COUNT ? unit_names[unit].name : "?";
}

double
qv_energy_unit_to_ev (QvEnergyUnit unit)
{
  /* CODATA 2018 (qv-units.h); a mole of them, and h·c·(1 cm⁻¹) */
  switch (unit)
    {
    case QV_ENERGY_UNIT_HARTREE: return QV_HARTREE_EV;
    case QV_ENERGY_UNIT_EV: return 1.0;
    case QV_ENERGY_UNIT_KCAL_MOL: return 1000.0 * QV_CALORIE / QV_AVOGADRO / QV_ELEMENTARY_CHARGE;
    case QV_ENERGY_UNIT_KJ_MOL: return 1000.0 / QV_AVOGADRO / QV_ELEMENTARY_CHARGE;
    case QV_ENERGY_UNIT_CM1: return QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0 / QV_ELEMENTARY_CHARGE;
    default: return NAN;
    }
}

static void
entry_free (gpointer data)
{
  QvEnergyEntry *e = data;
  g_free (e->name);
  g_free (e);
}

void
qv_energy_file_free (QvEnergyFile *file)
{
  if (file == NULL)
    return;
  g_free (file->path);
  if (file->by_name)
    g_hash_table_unref (file->by_name);
  if (file->entries)
    g_ptr_array_unref (file->entries);
  g_free (file);
}

static gboolean
is_separator (char c)
{
  return c == ' ' || c == '\t' || c == ',' || c == '\r';
}

QvEnergyFile *
qv_energy_file_read_data (const char *data, gsize length, const char *name, GError **error)
{
  g_autoptr(QvEnergyFile) file = g_new0 (QvEnergyFile, 1);
  const char *p = data, *end = data + length;
  gsize line = 0;

  file->path = g_strdup (name);
  file->entries = g_ptr_array_new_with_free_func (entry_free);
  file->by_name = g_hash_table_new (g_str_hash, g_str_equal);
  if (memchr (data, '\0', length))
    {
      qv_io_error (error, name, 0, 0, "a NUL byte: this is not a text file of NAME ENERGY lines");
      return NULL;
    }
  while (p < end)
    {
      const char *eol = memchr (p, '\n', (gsize) (end - p));
      const char *stop = eol ? eol : end, *hash;
      const char *f[3] = { NULL }, *fe[3] = { NULL };
      int nf = 0;
      const char *q = p;

      line++;
      hash = memchr (p, '#', (gsize) (stop - p));
      if (hash)
        stop = hash;
      while (q < stop)
        {
          while (q < stop && is_separator (*q))
            q++;
          if (q >= stop)
            break;
          if (nf < 3)
            f[nf] = q;
          while (q < stop && !is_separator (*q))
            q++;
          if (nf < 3)
            fe[nf] = q;
          nf++;
        }
      if (nf == 0)
        ;
      else if (nf != 2)
        {
          qv_io_error (error, name, line, (gsize) (f[0] - p) + 1,
                       "expected NAME ENERGY (two fields), found %d field%s", nf, nf == 1 ? "" : "s");
          return NULL;
        }
      else
        {
          g_autofree char *key = g_strndup (f[0], (gsize) (fe[0] - f[0]));
          g_autofree char *num = g_strndup (f[1], (gsize) (fe[1] - f[1]));
          char *nend = NULL;
          double value = g_ascii_strtod (num, &nend);
          QvEnergyEntry *e, *prev;

          if (nend == num || *nend != '\0')
            {
              qv_io_error (error, name, line, (gsize) (f[1] - p) + 1,
                           "the energy of '%s' is not a number: '%s'", key, num);
              return NULL;
            }
          if (!isfinite (value))
            {
              qv_io_error (error, name, line, (gsize) (f[1] - p) + 1,
                           "the energy of '%s' is not a finite number: '%s'", key, num);
              return NULL;
            }
          prev = g_hash_table_lookup (file->by_name, key);
          if (prev)
            {
              qv_io_error (error, name, line, (gsize) (f[0] - p) + 1,
                           "'%s' is given a second time (first on line %" G_GSIZE_FORMAT ")",
                           key, prev->line);
              return NULL;
            }
          e = g_new0 (QvEnergyEntry, 1);
          e->name = g_steal_pointer (&key);
          e->value = value;
          e->line = line;
          g_ptr_array_add (file->entries, e);
          g_hash_table_insert (file->by_name, e->name, e);
        }
      p = eol ? eol + 1 : end;
    }
  if (file->entries->len == 0)
    {
      qv_io_error (error, name, 0, 0, "no NAME ENERGY lines in the file");
      return NULL;
    }
  return g_steal_pointer (&file);
}

QvEnergyFile *
qv_energy_file_read (const char *path, GError **error)
{
  g_autofree char *data = NULL;
  gsize length = 0;

  if (!qv_io_read_file (path, QV_ENERGY_FILE_MAX_BYTES, &data, &length, error))
    return NULL;
  return qv_energy_file_read_data (data, length, path, error);
}

#define MAX_LISTED 10

gboolean
qv_energy_file_match (const QvEnergyFile *file, const char *const *names, gsize n,
                      double *values, GError **error)
{
  g_autoptr(GHashTable) used = g_hash_table_new (g_direct_hash, g_direct_equal);
  g_autoptr(GString) missing = g_string_new (NULL);
  g_autoptr(GString) extra = g_string_new (NULL);
  gsize n_missing = 0, n_extra = 0;

  for (gsize i = 0; i < n; i++)
    {
      QvEnergyEntry *e = g_hash_table_lookup (file->by_name, names[i]);
      if (e == NULL)
        {
          const char *dot = strrchr (names[i], '.');
          if (dot && dot != names[i])
            {
              g_autofree char *stem = g_strndup (names[i], (gsize) (dot - names[i]));
              e = g_hash_table_lookup (file->by_name, stem);
            }
        }
      if (e == NULL || g_hash_table_contains (used, e))
        {
          if (n_missing++ < MAX_LISTED)
            g_string_append_printf (missing, "%s%s", n_missing > 1 ? ", " : "", names[i]);
          continue;
        }
      g_hash_table_add (used, e);
      values[i] = e->value;
    }
  for (guint k = 0; k < file->entries->len; k++)
    {
      const QvEnergyEntry *e = g_ptr_array_index (file->entries, k);
      if (g_hash_table_contains (used, e))
        continue;
      if (n_extra++ < MAX_LISTED)
        g_string_append_printf (extra, "%s'%s' (line %" G_GSIZE_FORMAT ")", n_extra > 1 ? ", " : "",
                                e->name, e->line);
    }
  if (n_missing == 0 && n_extra == 0)
    return TRUE;
  if (n_missing > MAX_LISTED)
    g_string_append_printf (missing, " and %" G_GSIZE_FORMAT " more", n_missing - MAX_LISTED);
  if (n_extra > MAX_LISTED)
    g_string_append_printf (extra, " and %" G_GSIZE_FORMAT " more", n_extra - MAX_LISTED);
  if (n_extra > 0)
    {
      const QvEnergyEntry *first = NULL;
      for (guint k = 0; k < file->entries->len && first == NULL; k++)
        if (!g_hash_table_contains (used, g_ptr_array_index (file->entries, k)))
          first = g_ptr_array_index (file->entries, k);
      qv_io_error (error, file->path, first->line, 1,
                   "%" G_GSIZE_FORMAT " name%s not in the manifest: %s%s%s",
                   n_extra, n_extra == 1 ? " is" : "s are", extra->str,
                   n_missing ? "; and no energy for " : "", n_missing ? missing->str : "");
    }
  else
    qv_io_error (error, file->path, 0, 0, "no energy for %" G_GSIZE_FORMAT " structure%s of the "
                 "manifest: %s", n_missing, n_missing == 1 ? "" : "s", missing->str);
  return FALSE;
}
