/* qv-cli-input.c — loading what the commands work on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <errno.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>
#include <gio/gio.h>
#include "qv-cli.h"
#include "qv-output.h"
#include "qv-error.h"

int
qv_cli_fail (const char *command, GError *error)
{
  int code = QV_EXIT_INPUT;
  if (error->domain == QV_ERROR)
    switch ((QvErrorCode) error->code)
      {
      case QV_ERROR_USAGE: code = QV_EXIT_USAGE; break;
      case QV_ERROR_WRITE: code = QV_EXIT_WRITE; break;
      default: code = QV_EXIT_INPUT; break;
      }
  else if (error->domain == G_OPTION_ERROR)
    code = QV_EXIT_USAGE;
  g_printerr ("quaver: %s\n", error->message);
  if (code == QV_EXIT_USAGE && command)
    g_printerr ("Try 'quaver %s --help'.\n", command);
  return code;
}

int
qv_cli_fail_usage (const char *command, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;
  g_autoptr(GError) error = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE, message);
  return qv_cli_fail (command, error);
}

static gboolean
parse_atom_assignment (const char *text, const char *option, gsize n_atoms,
                       gsize *atom, char **value, GError **error)
{
  const char *eq = strchr (text, '=');
  char *end = NULL;
  guint64 index;

  if (eq == NULL || eq == text || eq[1] == '\0')
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s takes ATOM=VALUE (atoms count from 1), got '%s'", option, text);
      return FALSE;
    }
  errno = 0;
  index = g_ascii_strtoull (text, &end, 10);
  if (end != eq || errno != 0 || index < 1 || index > n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s %s: the atom must be a number from 1 to %" G_GSIZE_FORMAT,
                   option, text, n_atoms);
      return FALSE;
    }
  *atom = (gsize) index - 1;
  *value = g_strdup (eq + 1);
  return TRUE;
}

static gboolean
apply_masses (QvInput *input, const QvCliInputOptions *o, GError **error)
{
  QvStructure *s = input->structure;
  gboolean changed = FALSE;

  if (o->masses)
    {
      if (g_ascii_strcasecmp (o->masses, "isotopic") == 0)
        input->mass_model = QV_MASS_ISOTOPIC;
      else if (g_ascii_strcasecmp (o->masses, "average") == 0)
        input->mass_model = QV_MASS_AVERAGE;
      else
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--masses takes isotopic or average, got '%s'", o->masses);
          return FALSE;
        }
      qv_structure_apply_mass_model (s, input->mass_model);
      changed = TRUE;
    }
  for (char **p = o->isotopes; p && *p; p++)
    {
      gsize atom;
      g_autofree char *value = NULL;
      char *end = NULL;
      guint64 a;
      g_autoptr(GError) local = NULL;

      if (!parse_atom_assignment (*p, "--isotope", s->n_atoms, &atom, &value, error))
        return FALSE;
      a = g_ascii_strtoull (value, &end, 10);
      if (end == value || *end != '\0' || a == 0 || a > 400)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--isotope %s: the mass number must be a whole number such as 2 or 13", *p);
          return FALSE;
        }
      if (!qv_structure_set_isotope (s, atom, (guint) a, &local))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--isotope %s: atom %" G_GSIZE_FORMAT ": %s",
                       *p, atom + 1, local->message);
          return FALSE;
        }
      changed = TRUE;
    }
  for (char **p = o->mass_overrides; p && *p; p++)
    {
      gsize atom;
      g_autofree char *value = NULL;
      char *end = NULL;
      double m;
      g_autoptr(GError) local = NULL;

      if (!parse_atom_assignment (*p, "--mass", s->n_atoms, &atom, &value, error))
        return FALSE;
      m = g_ascii_strtod (value, &end);
      if (end == value || *end != '\0' || !qv_structure_set_mass (s, atom, m, &local))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--mass %s: the mass must be a positive number in u", *p);
          return FALSE;
        }
      changed = TRUE;
    }
  if (changed && input->modes)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s holds precomputed modes, not a Hessian: masses cannot be changed",
                   input->name);
      return FALSE;
    }
  return TRUE;
}

QvInput *
qv_cli_input_load (const QvCliInputOptions *o, GError **error)
{
  QvInputOptions io = {
    .geometry = o->geometry, .demo = o->demo, .hessian = o->hessian,
    .hessian_units = o->hessian_units, .hessian_layout = o->hessian_layout,
    .all_modes = o->all_modes, .hessian_deferred = o->hessian_deferred,
  };
  g_autoptr(QvInput) input = qv_input_load (&io, error);

  if (input == NULL)
    return NULL;
  if (input->n_frames > 1)
    g_printerr ("quaver: %s has %u frames; using the first\n", input->name, input->n_frames);
  if (!apply_masses (input, o, error))
    return NULL;
  return g_steal_pointer (&input);
}

int
qv_cli_emit (const char *command, const char *path, const char *text, gboolean force)
{
  g_autoptr(GError) error = NULL;

  if (path)
    return qv_output_write (path, text, strlen (text), force, &error) ? QV_EXIT_OK
                                                                       : qv_cli_fail (command, error);
  errno = 0;
  if (fputs (text, stdout) < 0 || fflush (stdout) != 0)
    {
      g_printerr ("quaver: cannot write to standard output: %s\n", g_strerror (errno));
      return QV_EXIT_WRITE;
    }
  return QV_EXIT_OK;
}

gboolean
qv_cli_progress (double fraction, const char *stage, gpointer user_data)
{
  if (isatty (STDERR_FILENO))
    g_printerr ("\r\033[Kquaver: %3.0f%% %s", fraction * 100.0, stage);
  if (fraction >= 1.0 && isatty (STDERR_FILENO))
    g_printerr ("\r\033[K");
  return TRUE;
}
