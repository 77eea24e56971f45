/* qv-cli-input.c — loading what the commands work on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>
#include <gio/gio.h>
#include "qv-bundle.h"
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-hessian-file.h"
#include "qv-solver.h"
#include "qv-units.h"
#include "qv-xyz.h"

#define DEMO_RESOURCE "/org/quaverlab/Quaver/examples/demo.quaver.json"

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

static gboolean
is_bundle (const char *path)
{
  return g_str_has_suffix (path, ".json");
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
apply_masses (QvCliInput *input, const QvCliInputOptions *o, GError **error)
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
                   input->geometry_name);
      return FALSE;
    }
  return TRUE;
}

static gboolean
load_bundle (QvCliInput *input, QvBundle *bundle)
{
  input->structure = g_steal_pointer (&bundle->structure);
  input->mass_model = bundle->mass_model;
  input->hessian = g_steal_pointer (&bundle->hessian);
  input->modes = g_steal_pointer (&bundle->modes);
  input->hessian_units = g_strdup (bundle->hessian_units);
  input->hessian_source = g_strdup (bundle->hessian_path ? bundle->hessian_path : "inline in the bundle");
  if (input->hessian)
    input->layout = input->hessian->layout;
  return TRUE;
}

gboolean
qv_cli_input_load (QvCliInput *input, const QvCliInputOptions *o, GError **error)
{
  memset (input, 0, sizeof *input);

  if (o->demo)
    {
      g_autoptr(GBytes) bytes = g_resources_lookup_data (DEMO_RESOURCE, 0, NULL);
      gsize len = 0;
      const char *data;
      g_autoptr(QvBundle) bundle = NULL;

      if (bytes == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the built-in demo is missing from this build");
          return FALSE;
        }
      data = g_bytes_get_data (bytes, &len);
      input->geometry_name = g_strdup ("demo");
      bundle = qv_bundle_read_data (data, len, "demo.quaver.json", error);
      if (bundle == NULL)
        return FALSE;
      load_bundle (input, bundle);
    }
  else if (o->geometry == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "no input: give a geometry file, a bundle, or --demo");
      return FALSE;
    }
  else if (is_bundle (o->geometry))
    {
      g_autoptr(QvBundle) bundle = NULL;
      input->geometry_name = g_strdup (o->geometry);
      if (o->hessian)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%s is a bundle and brings its own Hessian: leave out --hessian", o->geometry);
          return FALSE;
        }
      bundle = qv_bundle_read_file (o->geometry, error);
      if (bundle == NULL)
        return FALSE;
      load_bundle (input, bundle);
    }
  else
    {
      g_autoptr(GPtrArray) frames = NULL;
      QvHessianUnit unit;
      QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;

      input->geometry_name = g_strdup (o->geometry);
      if (o->hessian == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%s has no Hessian: pass --hessian FILE --hessian-units UNIT, or use a bundle",
                       o->geometry);
          return FALSE;
        }
      if (o->hessian_units == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--hessian needs --hessian-units (one of %s): units are never guessed",
                       qv_hessian_unit_list ());
          return FALSE;
        }
      if (!qv_hessian_unit_parse (o->hessian_units, &unit, error))
        return FALSE;
      if (o->hessian_layout && !qv_hessian_layout_parse (o->hessian_layout, &layout, error))
        return FALSE;
      frames = qv_xyz_read_file (o->geometry, error);
      if (frames == NULL)
        return FALSE;
      if (frames->len > 1)
        g_printerr ("quaver: %s has %u frames; using the first\n", o->geometry, frames->len);
      input->structure = qv_structure_copy (g_ptr_array_index (frames, 0));
      if (o->all_modes && 3 * input->structure->n_atoms > qv_solver_max_full_dimension ())
        {
          g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                       "%s: %" G_GSIZE_FORMAT " atoms make a %" G_GSIZE_FORMAT "-row Hessian, beyond "
                       "what this LAPACK's 32-bit all-modes solver takes (3N ≤ %" G_GSIZE_FORMAT "); "
                       "ask for the lowest modes only with --lowest K", o->geometry,
                       input->structure->n_atoms, 3 * input->structure->n_atoms,
                       qv_solver_max_full_dimension ());
          return FALSE;
        }
      input->hessian = qv_hessian_read_file (o->hessian, 3 * input->structure->n_atoms, layout, error);
      if (input->hessian == NULL)
        return FALSE;
      qv_hessian_scale (input->hessian, qv_hessian_unit_to_ev_a2 (unit));
      input->hessian_source = g_strdup (o->hessian);
      input->hessian_units = g_strdup (qv_hessian_unit_name (unit));
      input->layout = input->hessian->layout;
    }
  return apply_masses (input, o, error);
}

void
qv_cli_input_clear (QvCliInput *input)
{
  g_free (input->geometry_name);
  qv_structure_free (input->structure);
  qv_hessian_free (input->hessian);
  qv_mode_set_free (input->modes);
  g_free (input->hessian_source);
  g_free (input->hessian_units);
  memset (input, 0, sizeof *input);
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
