/* qv-export-displace.c — the files of `quaver displace`: structures pushed
 * along one or two normal modes, each comment line carrying the mode, q, Q,
 * the largest displacement in Å and the level.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-element.h"
#include "qv-error.h"
#include "qv-export-private.h"
#include "qv-json-writer.h"

static void
append_number (GString *s, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append (s, qv_json_format_double (buf, value == 0.0 ? 0.0 : value));
}

/* Comma-joined per-mode values for the comment line. */
typedef enum { F_MODE, F_WAVENUMBER, F_q, F_Q, F_DISP, F_ATOM, F_LEVEL, F_TP } Field;

static char *
joined (const QvDisplaced *d, const QvModeSet *modes, Field field)
{
  GString *s = g_string_new (NULL);

  for (guint i = 0; i < d->n_amplitudes; i++)
    {
      const QvAmplitude *a = &d->amplitudes[i];
      if (i > 0)
        g_string_append_c (s, ',');
      switch (field)
        {
        case F_MODE: g_string_append_printf (s, "%" G_GSIZE_FORMAT, a->mode + 1); break;
        case F_WAVENUMBER: append_number (s, qv_mode_set_wavenumber (modes, a->mode)); break;
        case F_q: append_number (s, a->q); break;
        case F_Q: append_number (s, a->Q); break;
        case F_DISP: append_number (s, a->max_displacement); break;
        case F_ATOM: g_string_append_printf (s, "%" G_GSIZE_FORMAT, a->max_atom + 1); break;
        case F_LEVEL: g_string_append_printf (s, "%u", a->level); break;
        case F_TP: append_number (s, a->turning_multiple); break;
        default: break;
        }
    }
  return g_string_free (s, FALSE);
}

static gboolean
all_defined (const QvDisplaced *d)
{
  for (guint i = 0; i < d->n_amplitudes; i++)
    if (!isfinite (d->amplitudes[i].q))
      return FALSE;
  return TRUE;
}

/* The file name of structure @s (one file per structure), or of the
 * single file (@s < 0). */
static char *
file_name (const QvDisplacementSet *set, const QvDisplaceRequest *r, gssize s)
{
  const gsize m0 = r->modes[0] + 1, m1 = r->modes[1] + 1;
  const int width = set->n_structures > 100 ? (set->n_structures > 1000 ? 5 : 3) : 2;
  const char *sign;

  if (s < 0)
    switch (r->kind)
      {
      case QV_DISPLACE_GRID:
        return g_strdup_printf ("modes%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT "-grid.xyz", m0, m1);
      default:
        return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-%s.xyz", m0, qv_displace_kind_name (r->kind));
      }
  sign = set->structures[s].amplitudes[0].Q < 0 ? "minus" : "plus";
  switch (r->kind)
    {
    case QV_DISPLACE_SCAN:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-scan-%0*" G_GSSIZE_FORMAT ".xyz", m0, width, s);
    case QV_DISPLACE_GRID:
      return g_strdup_printf ("modes%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT "-grid-%0*u-%0*u.xyz",
                              m0, m1, width, (guint) ((gsize) s / r->points),
                              width, (guint) ((gsize) s % r->points));
    case QV_DISPLACE_LEVELS:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-v%u-%s.xyz", m0,
                              set->structures[s].amplitudes[0].level, sign);
    case QV_DISPLACE_ESCAPE:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-escape-%s.xyz", m0, sign);
    case QV_DISPLACE_PAIR:
    default:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-%s.xyz", m0, sign);
    }
}

static void
append_frame (QvExport *e, gsize s, GString *text)
{
  const QvDisplacementSet *set = e->set;
  const QvDisplaced *d = &set->structures[s];
  g_autoptr(GPtrArray) keep = g_ptr_array_new_with_free_func (g_free);
  g_autoptr(GArray) pairs = g_array_new (FALSE, FALSE, sizeof (QvXyzPair));
  const gboolean defined = all_defined (d);
  QvXyzFrame frame = {
    .style = e->format.style,
    .precision = e->format.exact ? QV_XYZ_EXACT : QV_XYZ_FIXED,
    .positions = d->positions,
    .masses = e->masses_column,
  };
#define ADD(k, v) G_STMT_START { char *v_ = (v); QvXyzPair p_ = { (k), v_ }; \
  g_ptr_array_add (keep, v_); g_array_append_val (pairs, p_); } G_STMT_END

  ADD ("kind", g_strdup (qv_displace_kind_name (set->kind)));
  ADD ("index", g_strdup_printf ("%" G_GSIZE_FORMAT, s));
  ADD ("mode", joined (d, e->modes, F_MODE));
  ADD ("wavenumber", joined (d, e->modes, F_WAVENUMBER));
  if (defined)
    ADD ("q", joined (d, e->modes, F_q));
  ADD ("Q", joined (d, e->modes, F_Q));
  ADD ("max_displacement", joined (d, e->modes, F_DISP));
  ADD ("max_atom", joined (d, e->modes, F_ATOM));
  if (defined)
    {
      ADD ("level", joined (d, e->modes, F_LEVEL));
      ADD ("turning_point", joined (d, e->modes, F_TP));
    }
  ADD ("units", g_strdup ("Q:u^1/2_A,max_displacement:A,wavenumber:cm^-1"));
#undef ADD
  frame.pairs = (const QvXyzPair *) pairs->data;
  frame.n_pairs = pairs->len;
  qv_xyz_append_frame (text, e->structure, &frame);
}

static gboolean
displace_produce (QvExport *e, gsize file, GString *text, const QvProgress *progress,
                  GError **error)
{
  for (gsize s = 0; s < e->n_structures; s++)
    if (e->structure_file[s] == file)
      append_frame (e, s, text);
  return TRUE;
}

static void
displace_record (QvExport *e, gsize file, QvManifestFile *entry)
{
  for (gsize s = 0; s < e->n_structures; s++)
    {
      const QvDisplaced *d = &e->set->structures[s];
      QvManifestFrame *frame;

      if (e->structure_file[s] != file)
        continue;
      frame = qv_manifest_file_add_frame (entry);
      for (guint i = 0; i < d->n_amplitudes; i++)
        {
          const QvAmplitude *a = &d->amplitudes[i];
          QvManifestAmplitude m = {
            .mode = (guint) a->mode + 1,
            .wavenumber = qv_mode_set_wavenumber (e->modes, a->mode),
            .q = a->q,
            .Q = a->Q,
            .max_displacement = a->max_displacement,
            .max_atom = (guint) a->max_atom + 1,
            .level = isfinite (a->turning_multiple) ? (gint) a->level : -1,
            .turning_multiple = a->turning_multiple,
          };
          qv_manifest_frame_add_amplitude (frame, &m);
        }
      qv_manifest_set_string (frame->fields, "kind", qv_displace_kind_name (e->set->kind));
      qv_manifest_set_integer (frame->fields, "structure", (gint64) s);
    }
}

static void
displace_free (QvExport *e)
{
  qv_displacement_set_free (e->set);
}

static const QvExportClass displace_class = {
  displace_produce, displace_record, NULL, displace_free,
};

/* TRUE when a mass differs from its element's default (an isotope or a
 * typed mass): then the files carry a masses column so they read back with
 * the same masses. */
static gboolean
has_custom_masses (const QvStructure *s)
{
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      const QvElement *el = qv_element_from_z (s->atoms[a].z);
      if (el == NULL || s->atoms[a].mass != el->isotope_mass)
        return TRUE;
    }
  return FALSE;
}

/* One mode's amplitude in every unit, for a person. */
static void
describe_amplitude (GString *s, const QvModeSet *modes, const QvAmplitude *a)
{
  const double w = qv_mode_set_wavenumber (modes, a->mode);

  g_string_append_printf (s, "mode %" G_GSIZE_FORMAT " (%.1f%s cm^-1): ", a->mode + 1, fabs (w),
                          w < 0 ? "i" : "");
  if (isfinite (a->q))
    g_string_append_printf (s, "q = %.4g, ", fabs (a->q));
  g_string_append_printf (s, "Q = %.4g u^1/2 A, largest displacement %.4g A (atom %" G_GSIZE_FORMAT ")",
                          fabs (a->Q), fabs (a->max_displacement), a->max_atom + 1);
  if (isfinite (a->turning_multiple))
    g_string_append_printf (s, ", %.4g x the turning point of v = %u", fabs (a->turning_multiple),
                            a->level);
}

static char *
describe (const QvExport *e)
{
  const QvDisplacementSet *set = e->set;
  const QvDisplaced *last = &set->structures[set->n_structures - 1];
  GString *s = g_string_new (NULL);
  g_autofree char *formula = qv_structure_formula (e->structure);

  g_string_append_printf (s, "%" G_GSIZE_FORMAT " structure%s of %s (%s) in %u file%s (%s)\n",
                          set->n_structures, set->n_structures == 1 ? "" : "s", formula,
                          qv_displace_kind_name (set->kind), e->files->len,
                          e->files->len == 1 ? "" : "s", qv_export_style_name (e->format.style));
  switch (set->kind)
    {
    case QV_DISPLACE_LEVELS:
      for (gsize k = 1; k < set->n_structures; k += 2)
        {
          g_string_append_printf (s, "v = %u: +/- ", set->structures[k].amplitudes[0].level);
          describe_amplitude (s, e->modes, &set->structures[k].amplitudes[0]);
          g_string_append_c (s, '\n');
        }
      break;
    default:
      for (guint i = 0; i < last->n_amplitudes; i++)
        {
          g_string_append (s, set->kind == QV_DISPLACE_PAIR || set->kind == QV_DISPLACE_ESCAPE
                              ? "A = +/- " : "from -A to +A, A = ");
          describe_amplitude (s, e->modes, &last->amplitudes[i]);
          g_string_append_c (s, '\n');
        }
      break;
    }
  g_string_append (s, "and manifest.json");
  return g_string_free (s, FALSE);
}

QvExport *
qv_export_new_displace (const QvStructure *structure, const QvModeSet *modes,
                        QvMassModel mass_model, const QvDisplaceRequest *request,
                        const QvExportFormat *format, QvManifest *manifest, GError **error)
{
  g_autoptr(QvExport) e = qv_export_alloc (&displace_class, "displace", structure, modes,
                                           format, manifest);
  QvManifest *m = manifest;

  if (e->format.style == QV_XYZ_PLAIN && qv_structure_is_periodic (structure))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "the structure is periodic and plain XYZ has no cell; write extended XYZ");
      return NULL;
    }
  e->request = *request;
  e->set = qv_displace (structure, modes, request, error);
  if (e->set == NULL)
    return NULL;
  e->masses_column = e->format.style == QV_XYZ_EXTENDED && has_custom_masses (structure);
  e->n_structures = e->set->n_structures;
  e->structure_file = g_new0 (gsize, e->n_structures);
  if (e->format.single_file)
    qv_export_plan_file (e, file_name (e->set, request, -1), qv_export_style_name (e->format.style));
  else
    for (gsize s = 0; s < e->n_structures; s++)
      {
        qv_export_plan_file (e, file_name (e->set, request, (gssize) s),
                             qv_export_style_name (e->format.style));
        e->structure_file[s] = s;
      }

  qv_export_describe_structure (e);
  qv_manifest_set_string (m->options, "kind", qv_displace_kind_name (request->kind));
  {
    g_autofree char *list = request->kind == QV_DISPLACE_GRID
      ? g_strdup_printf ("%" G_GSIZE_FORMAT ",%" G_GSIZE_FORMAT, request->modes[0] + 1,
                         request->modes[1] + 1)
      : g_strdup_printf ("%" G_GSIZE_FORMAT, request->modes[0] + 1);
    qv_manifest_set_string (m->options, "modes", list);
  }
  if (isnan (request->value))
    qv_manifest_set_string (m->options, "amplitude", "default");
  else
    {
      qv_manifest_set_string (m->options, "amplitude_unit", qv_amplitude_unit_name (request->unit));
      qv_manifest_set_number (m->options, "amplitude", request->value);
    }
  qv_manifest_set_integer (m->options, "level", request->level);
  if (request->points)
    qv_manifest_set_integer (m->options, "points", request->points);
  qv_manifest_set_string (m->options, "format", qv_export_style_name (e->format.style));
  qv_manifest_set_boolean (m->options, "single_file", e->format.single_file);
  qv_manifest_set_string (m->options, "projection", qv_projection_name (modes->projection));
  qv_manifest_set_string (m->options, "masses", mass_model == QV_MASS_AVERAGE ? "average" : "isotopic");
  if (e->set->note)
    qv_export_add_note (e, e->set->note);
  qv_manifest_add_note (m, "Cartesian displacement of atom a: dr_a = Q l_a / sqrt(m_a); "
                        "q = Q sqrt(omega/hbar); turning_point_multiple = Q / Q_tp(level), "
                        "Q_tp = sqrt((2 level + 1) hbar/omega)");
  e->description = describe (e);
  return g_steal_pointer (&e);
}
