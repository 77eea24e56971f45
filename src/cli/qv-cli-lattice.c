/* qv-cli-lattice.c — the input of the lattice commands: primitive cell,
 * supercell, Hessian → force constants (see qv-cli-lattice.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-born-file.h"
#include "qv-cif.h"
#include "qv-cli-lattice.h"
#include "qv-error.h"
#include "qv-xyz.h"

const char qv_cli_lattice_help[] =
  "The cell (PRIMITIVE, or any unit cell the supercell repeats) is an extended\n"
  "XYZ file with Lattice=\"...\" or a CIF (its sites expanded by the symmetry\n"
  "operators it lists; the cell as written, often the conventional one).\n"
  "The supercell and its Hessian (3N x 3N for its N atoms, in its own atom\n"
  "order, x1 y1 z1 x2 …) come either as\n"
  "  --supercell-structure FILE   the supercell's extended XYZ: atoms in any\n"
  "                               order, each matched to a primitive site and a\n"
  "                               lattice translation by position (--tolerance)\n"
  "or as\n"
  "  --supercell NxMxL            (or nine integers, rows = supercell vectors\n"
  "                               in primitive vectors) when the Hessian's atoms\n"
  "                               are in the standard order: lattice points\n"
  "                               (n1 n2 n3) with n3 fastest, and inside each\n"
  "                               point the primitive atoms in file order.\n"
  "The acoustic sum rule is imposed (a projection that keeps the force\n"
  "constants symmetric); the acoustic wavenumbers at Gamma before it are\n"
  "reported. --no-sum-rule leaves the force constants as read.\n"
  "--born FILE adds the non-analytic (LO-TO) term of a polar crystal from its\n"
  "Born effective charges and eps_inf (the text file of docs/methods.md,\n"
  "\"Non-analytic correction\"), interpolated away from Gamma.\n";

void
qv_cli_lattice_options_init (QvCliLatticeOptions *o)
{
  memset (o, 0, sizeof *o);
  o->tolerance = QV_SUPERCELL_DEFAULT_TOLERANCE;
}

void
qv_cli_lattice_options_clear (QvCliLatticeOptions *o)
{
  g_clear_pointer (&o->supercell_structure, g_free);
  g_clear_pointer (&o->supercell, g_free);
  g_clear_pointer (&o->hessian, g_free);
  g_clear_pointer (&o->units, g_free);
  g_clear_pointer (&o->layout, g_free);
  g_clear_pointer (&o->born, g_free);
}

void
qv_cli_lattice_add_entries (GOptionContext *context, QvCliLatticeOptions *o)
{
  const GOptionEntry entries[] = {
    { "supercell-structure", 'S', 0, G_OPTION_ARG_FILENAME, &o->supercell_structure,
      "The supercell's structure (extended XYZ), atoms in the Hessian's order", "FILE" },
    { "supercell", 0, 0, G_OPTION_ARG_STRING, &o->supercell,
      "Supercell matrix NxMxL or 9 integers (standard atom order without -S)", "MATRIX" },
    { "hessian", 'H', 0, G_OPTION_ARG_FILENAME, &o->hessian, "The supercell's Hessian (text or .npy)", "FILE" },
    { "hessian-units", 'u', 0, G_OPTION_ARG_STRING, &o->units, "Units of the Hessian (eV/A^2, hartree/bohr^2, …)", "UNIT" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &o->layout, "full, lower or upper (default: detected)", "LAYOUT" },
    { "no-sum-rule", 0, 0, G_OPTION_ARG_NONE, &o->no_sum_rule, "Do not impose the acoustic sum rule", NULL },
    { "tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &o->tolerance,
      "Relative position tolerance for matching atoms (default 0.001)", "T" },
    { "threads", 0, 0, G_OPTION_ARG_INT64, &o->threads, "Worker threads (default: one per processor)", "N" },
    { "born", 0, 0, G_OPTION_ARG_FILENAME, &o->born,
      "Born charges and eps_inf (text file): the LO-TO correction near Gamma", "FILE" },
    { NULL }
  };
  g_option_context_add_main_entries (context, entries, NULL);
}

void
qv_cli_lattice_free (QvCliLattice *lattice)
{
  if (lattice == NULL)
    return;
  qv_crystal_free (lattice->crystal);    /* the other members are its own */
  g_free (lattice);
}

QvStructure *
qv_cli_lattice_read_structure (const char *command, const char *path, const char *what,
                               GError **error)
{
  g_autoptr(GPtrArray) frames = NULL;
  QvStructure *s;

  if (qv_cif_is_cif_path (path))
    {
      /* the cell as the CIF writes it (often the conventional one), every
       * site expanded by its operators (qv-cif.h); it needs no "Lattice" */
      return qv_cif_read_file (path, NULL, error);
    }
  frames = qv_xyz_read_file (path, error);
  if (frames == NULL)
    return NULL;
  s = qv_structure_copy (g_ptr_array_index (frames, 0));
  if (!s->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s: the %s has no cell; add Lattice=\"ax ay az bx by bz cx cy cz\" (Å) to its "
                   "comment line (extended XYZ)", path, what);
      qv_structure_free (s);
      return NULL;
    }
  return s;
}

QvCliLattice *
qv_cli_lattice_load (const char *command, const QvCliLatticeOptions *o,
                     const char *primitive_path, GError **error)
{
  g_autoptr(QvCliLattice) lat = g_new0 (QvCliLattice, 1);
  g_autoptr(QvStructure) primitive = NULL, supercell = NULL;
  g_autoptr(QvHessian) h = NULL;
  QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;
  int matrix[3][3];
  gboolean have_matrix = FALSE;

  if (o->hessian == NULL || o->units == NULL)
    {
      if (o->hessian == NULL)
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                     "%s needs the supercell's Hessian: --hessian FILE --hessian-units UNIT", command);
      else
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                     "--hessian needs --hessian-units (one of %s): units are never guessed",
                     qv_hessian_unit_list ());
      return NULL;
    }
  if (o->supercell_structure == NULL && o->supercell == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "say which supercell the Hessian belongs to: --supercell-structure FILE, or "
                   "--supercell NxMxL when its atoms are in the standard order");
      return NULL;
    }
  if (!qv_hessian_unit_parse (o->units, &lat->unit, error)
      || (o->layout && !qv_hessian_layout_parse (o->layout, &layout, error))
      || (o->supercell && !(have_matrix = qv_supercell_matrix_parse (o->supercell, matrix, error))))
    return NULL;
  if (o->threads < 0 || o->threads > 1024 || !(o->tolerance > 0 && o->tolerance < 0.5))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   (o->threads < 0 || o->threads > 1024) ? "--threads must be from 0 (automatic) to 1024" :
                   "--tolerance must be a small positive fraction such as 0.001");
      return NULL;
    }

  primitive = qv_cli_lattice_read_structure (command, primitive_path, "primitive cell", error);
  if (primitive == NULL)
    return NULL;
  if (o->supercell_structure)
    supercell = qv_cli_lattice_read_structure (command, o->supercell_structure, "supercell", error);
  else
    supercell = qv_supercell_build (primitive, matrix, error);
  if (supercell == NULL)
    return NULL;
  lat->crystal = qv_crystal_new (primitive, supercell, o->tolerance, error);
  if (lat->crystal == NULL)
    {
      g_prefix_error (error, "%s: ", o->supercell_structure ? o->supercell_structure
                      : primitive_path);
      return NULL;
    }
  lat->primitive = lat->crystal->primitive;
  lat->map = lat->crystal->map;
  if (have_matrix && memcmp (matrix, lat->map->matrix, sizeof matrix) != 0)
    {
      const QvSupercellMap *map = lat->map;
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s is the supercell [%d %d %d; %d %d %d; %d %d %d] of the primitive cell, not "
                   "--supercell %s: drop --supercell or give the matching one", o->supercell_structure,
                   map->matrix[0][0], map->matrix[0][1], map->matrix[0][2], map->matrix[1][0],
                   map->matrix[1][1], map->matrix[1][2], map->matrix[2][0], map->matrix[2][1],
                   map->matrix[2][2], o->supercell);
      return NULL;
    }
  h = qv_hessian_read_file (o->hessian, 3 * supercell->n_atoms, layout, error);
  if (h == NULL)
    return NULL;
  qv_hessian_scale (h, qv_hessian_unit_to_ev_a2 (lat->unit));
  if (!qv_crystal_set_hessian (lat->crystal, h, !o->no_sum_rule, error))
    {
      g_prefix_error (error, "%s: ", o->hessian);
      return NULL;
    }
  lat->fc = lat->crystal->fc;
  lat->row_sum = lat->crystal->row_sum;
  memcpy (lat->before, lat->crystal->before, sizeof lat->before);
  if (lat->crystal->periodicity > 1e-3)
    g_printerr ("quaver: note: %s departs from the crystal's translation symmetry by %.2g "
                "(largest difference between equivalent pairs / largest element); the force "
                "constants average over the equivalent pairs\n", o->hessian,
                lat->crystal->periodicity);
  if (fabs (lat->before[0]) > 10 || fabs (lat->before[2]) > 10)
    g_printerr ("quaver: note: the acoustic modes at Gamma are at %.1f, %.1f, %.1f cm^-1 %s; "
                "tens of cm^-1 mean the Hessian or the geometry is not converged (or the "
                "supercell is too small)\n", lat->before[0], lat->before[1], lat->before[2],
                o->no_sum_rule ? "(no sum rule imposed)" : "before the sum rule");
  if (o->born)
    {
      /* Polar crystals: the non-analytic term (qv-nonanalytic.h), built on
       * the force constants as they now are; no direction of approach to Γ
       * is set, so D(Γ) itself gets no term unless a command sets one. */
      g_autoptr(QvBornCharges) born = qv_born_charges_read_file (o->born, error);
      if (born == NULL)
        return NULL;
      if (!qv_crystal_set_born (lat->crystal, born->n_atoms, born->born, born->epsilon, error))
        {
          g_prefix_error (error, "%s: ", o->born);
          return NULL;
        }
      lat->na = lat->crystal->na;
      if (qv_nonanalytic_neutrality (lat->na) > 1e-3)
        g_printerr ("quaver: note: the Born charges in %s did not add up to zero; %.3g e was "
                    "removed from each element (common practice)\n", o->born,
                    qv_nonanalytic_neutrality (lat->na));
    }
  return g_steal_pointer (&lat);
}

gboolean
qv_cli_lattice_parse (const char *command, GOptionContext *context, QvCliLatticeOptions *o,
                      const GOptionEntry *entries, int *argc, char ***argv, GError **error)
{
  qv_cli_lattice_options_init (o);
  qv_cli_lattice_add_entries (context, o);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, argc, argv, error))
    return FALSE;
  if (*argc != 2)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, *argc < 2
                   ? "%s needs the PRIMITIVE cell (extended XYZ with Lattice=\"…\", or CIF)"
                   : "%s takes one PRIMITIVE file, got %d", command, *argc - 1);
      return FALSE;
    }
  return TRUE;
}

gboolean
qv_cli_lattice_format_parse (const char *text, QvCliLatticeFormat *format, GError **error)
{
  static const char *const names[] = { "text", "csv", "json" };

  for (int i = 0; i < 3; i++)
    if (g_ascii_strcasecmp (text, names[i]) == 0)
      {
        *format = (QvCliLatticeFormat) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown format '%s'; accepted: text, csv, json", text);
  return FALSE;
}
