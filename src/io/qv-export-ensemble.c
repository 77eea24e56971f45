/* qv-export-ensemble.c — the files of `quaver ensemble`: harmonic Wigner
 * samples with positions and velocities, one file each or all in one.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-export-private.h"

/* Samples made per round: up to 256 (one wide matrix product per round is
 * what makes sampling fast, qv-ensemble.c), fewer for huge structures so a
 * round holds at most 2²⁴ coordinates per array. */
#define BLOCK_MAX 256
#define BLOCK_COORDINATES ((gsize) 1 << 24)
#define SAMPLE_WIDTH(count) MAX (4, (int) floor (log10 ((double) (count))) + 1)

/* "1-3,7,9-12" (1-based) of the modes with @status. */
static char *
mode_ranges (const QvEnsemble *e, QvEnsembleModeStatus status, gsize *count)
{
  GString *s = g_string_new (NULL);
  const gsize n = e->modes->n_modes;

  *count = 0;
  for (gsize k = 0; k < n; k++)
    {
      gsize j = k;
      if (e->status[k] != status)
        continue;
      while (j + 1 < n && e->status[j + 1] == status)
        j++;
      if (s->len)
        g_string_append_c (s, ',');
      if (j == k)
        g_string_append_printf (s, "%" G_GSIZE_FORMAT, k + 1);
      else
        g_string_append_printf (s, "%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT, k + 1, j + 1);
      *count += j - k + 1;
      k = j;
    }
  return g_string_free (s, FALSE);
}

/* Makes sure sample @s (0-based) is in the block, generating the block that
 * starts with it when not. */
static gboolean
ensure_sample (QvExport *e, gsize s, const QvProgress *progress, GError **error)
{
  const gsize n = 3 * e->structure->n_atoms;

  if (s >= e->block_first && s < e->block_first + e->block_count)
    return TRUE;
  if (e->block_positions == NULL)
    {
      e->block_capacity = CLAMP (BLOCK_COORDINATES / n, (gsize) 1, (gsize) BLOCK_MAX);
      e->block_capacity = MIN (e->block_capacity, (gsize) e->count);
      e->block_positions = g_try_new (double, n * e->block_capacity);
      e->block_velocities = g_try_new (double, n * e->block_capacity);
      if (e->block_positions == NULL || e->block_velocities == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for a block of %"
                       G_GSIZE_FORMAT " samples of %" G_GSIZE_FORMAT " atoms",
                       e->block_capacity, e->structure->n_atoms);
          return FALSE;
        }
    }
  e->block_first = s;
  e->block_count = (gsize) MIN ((guint64) e->block_capacity, e->count - s);
  if (!qv_ensemble_generate (e->ensemble, s, e->block_count, e->block_positions,
                             e->block_velocities, &e->stats, progress, error))
    {
      e->block_count = 0;
      return FALSE;
    }
  return TRUE;
}

static void
append_sample (QvExport *e, gsize s, GString *text)
{
  const gsize n = 3 * e->structure->n_atoms, b = s - e->block_first;
  const gboolean plain = e->format.style == QV_XYZ_PLAIN;
  char sample_buf[24], seed_buf[24], temp_buf[G_ASCII_DTOSTR_BUF_SIZE];
  QvXyzPair pairs[4] = {
    { "sample", sample_buf }, { "temperature", temp_buf }, { "seed", seed_buf },
    { "velocity_unit", "A/fs" },
  };
  QvXyzFrame frame = {
    .style = e->format.style,
    .precision = e->format.exact ? QV_XYZ_EXACT : QV_XYZ_FIXED,
    .positions = e->block_positions + b * n,
    .velocities = plain ? NULL : e->block_velocities + b * n,
    .pairs = pairs, .n_pairs = plain ? 3 : 4,
  };

  g_snprintf (sample_buf, sizeof sample_buf, "%" G_GSIZE_FORMAT, s + 1);
  g_snprintf (seed_buf, sizeof seed_buf, "%" G_GUINT64_FORMAT, e->ensemble->options.seed);
  g_ascii_formatd (temp_buf, sizeof temp_buf, "%g", e->ensemble->options.temperature);
  qv_xyz_append_frame (text, e->structure, &frame);
}

typedef struct {
  const QvProgress *outer;
  double start, span;
} Share;

static gboolean
share_progress (double fraction, const char *stage, gpointer data)
{
  Share *s = data;
  return s->outer->func (s->start + s->span * fraction, stage, s->outer->user_data);
}

static gboolean
ensemble_produce (QvExport *e, gsize file, GString *text, const QvProgress *progress,
                  GError **error)
{
  if (!e->format.single_file)
    {
      if (!ensure_sample (e, file, NULL, error))
        return FALSE;
      append_sample (e, file, text);
      return TRUE;
    }
  for (gsize s = 0; s < e->count; s++)
    {
      if (s < e->block_first || s >= e->block_first + e->block_count)
        {
          const gsize capacity = e->block_capacity ? e->block_capacity : BLOCK_MAX;
          Share share = { progress, (double) s / (double) e->count,
                          (double) MIN ((guint64) capacity, e->count - s) / (double) e->count };
          QvProgress inner = { share_progress, &share };

          if (!ensure_sample (e, s, progress ? &inner : NULL, error))
            return FALSE;
        }
      append_sample (e, s, text);
      if (s == 0 && e->count > 1)
        {
          /* frames differ in length by a few bytes at most: make room for
           * all of them at once (with some slack) instead of doubling */
          const gsize first = text->len;
          if (first < G_MAXSIZE / 2 / e->count)
            {
              g_string_set_size (text, first * (gsize) e->count + first * (gsize) e->count / 64);
              g_string_truncate (text, first);
            }
        }
    }
  return TRUE;
}

static void
ensemble_record (QvExport *e, gsize file, QvManifestFile *entry)
{
  if (!e->format.single_file)
    {
      QvManifestFrame *frame = qv_manifest_file_add_frame (entry);
      qv_manifest_set_integer (frame->fields, "sample", (gint64) file + 1);
      return;
    }
  for (guint64 s = 1; s <= e->count; s++)
    {
      QvManifestFrame *frame = qv_manifest_file_add_frame (entry);
      qv_manifest_set_integer (frame->fields, "sample", (gint64) s);
    }
}

static void
ensemble_finish (QvExport *e)
{
  QvManifest *m = e->manifest;

  qv_manifest_set_number (m->parameters, "max_linear_momentum_removed", e->stats.max_linear_removed);
  qv_manifest_set_number (m->parameters, "max_angular_momentum_removed", e->stats.max_angular_removed);
  qv_manifest_set_number (m->parameters, "max_angular_momentum_left", e->stats.max_angular_left);
}

static void
ensemble_free (QvExport *e)
{
  qv_ensemble_free (e->ensemble);
  g_free (e->block_positions);
  g_free (e->block_velocities);
}

static const QvExportClass ensemble_class = {
  ensemble_produce, ensemble_record, ensemble_finish, ensemble_free,
};

QvExport *
qv_export_new_ensemble (const QvStructure *structure, const QvModeSet *modes,
                        const QvEnsembleOptions *options, guint64 count,
                        const QvExportFormat *format, QvManifest *manifest, GError **error)
{
  g_autoptr(QvExport) e = qv_export_alloc (&ensemble_class, "ensemble", structure, modes,
                                           format, manifest);
  QvManifest *m = manifest;
  g_auto(GStrv) warnings = NULL;
  g_autofree char *formula = NULL, *sampled = NULL;
  gsize n_sampled;
  static const struct { QvEnsembleModeStatus st; const char *key; } groups[] = {
    { QV_ENSEMBLE_MODE_SAMPLED, "modes_sampled" },
    { QV_ENSEMBLE_MODE_IMAGINARY, "modes_imaginary" },
    { QV_ENSEMBLE_MODE_BELOW_CUTOFF, "modes_below_cutoff" },
    { QV_ENSEMBLE_MODE_ZERO, "modes_zero" },
    { QV_ENSEMBLE_MODE_RIGID_BODY, "modes_rigid_body" },
  };

  if (count < 1 || count > QV_EXPORT_MAX_SAMPLES)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the number of samples must be from 1 to %d",
                   QV_EXPORT_MAX_SAMPLES);
      return NULL;
    }
  if (options->seed >= QV_EXPORT_SEED_LIMIT)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the seed must be below 2^53 (%"
                   G_GUINT64_FORMAT ") so that every JSON reader holds it exactly",
                   QV_EXPORT_SEED_LIMIT);
      return NULL;
    }
  e->ensemble = qv_ensemble_new (structure, modes, options, error);
  if (e->ensemble == NULL)
    return NULL;
  e->count = count;
  e->n_structures = (gsize) count;
  e->structure_file = g_new0 (gsize, e->n_structures);
  if (e->format.single_file)
    qv_export_plan_file (e, g_strdup ("ensemble.xyz"), qv_export_style_name (e->format.style));
  else
    for (gsize s = 0; s < e->n_structures; s++)
      {
        qv_export_plan_file (e, g_strdup_printf ("sample-%0*" G_GSIZE_FORMAT ".xyz",
                                                 SAMPLE_WIDTH (count), s + 1),
                             qv_export_style_name (e->format.style));
        e->structure_file[s] = s;
      }

  qv_export_describe_structure (e);
  qv_manifest_set_number (m->options, "temperature", options->temperature);
  qv_manifest_set_integer (m->options, "count", (gint64) count);
  qv_manifest_set_integer (m->options, "seed", (gint64) options->seed);
  qv_manifest_set_number (m->options, "min_wavenumber", options->min_wavenumber);
  qv_manifest_set_string (m->options, "project", qv_projection_name (modes->projection));
  qv_manifest_set_boolean (m->options, "single_file", e->format.single_file);
  qv_manifest_set_string (m->options, "format", qv_export_style_name (e->format.style));
  qv_manifest_set_string (m->parameters, "sampling", "harmonic Wigner");
  qv_manifest_set_number (m->parameters, "temperature", options->temperature);
  qv_manifest_set_integer (m->parameters, "seed", (gint64) options->seed);
  qv_manifest_set_string (m->parameters, "random",
                          "xoshiro256** seeded by splitmix64; sample s uses stream s-1; "
                          "Marsaglia polar pairs (Q_k, P_k) for every mode k in order");
  qv_manifest_set_integer (m->parameters, "samples", (gint64) count);
  qv_manifest_set_string (m->parameters, "position_unit", "A");
  qv_manifest_set_string (m->parameters, "velocity_unit", "A/fs");
  qv_manifest_set_number (m->parameters, "min_wavenumber", options->min_wavenumber);
  for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
    {
      gsize c;
      g_autofree char *r = mode_ranges (e->ensemble, groups[g].st, &c);
      g_autofree char *key = g_strconcat ("n_", groups[g].key, NULL);
      qv_manifest_set_string (m->parameters, groups[g].key, r);
      qv_manifest_set_integer (m->parameters, key, (gint64) c);
    }
  warnings = qv_ensemble_warnings (e->ensemble);
  for (char **w = warnings; *w; w++)
    qv_export_add_note (e, *w);

  formula = qv_structure_formula (structure);
  sampled = mode_ranges (e->ensemble, QV_ENSEMBLE_MODE_SAMPLED, &n_sampled);
  e->description = g_strdup_printf (
    "%" G_GUINT64_FORMAT " sample%s of %s at %g K (seed %" G_GUINT64_FORMAT ") in %s\n"
    "%" G_GSIZE_FORMAT " mode%s sampled: %s\n"
    "positions in A%s\n"
    "and manifest.json",
    count, count == 1 ? "" : "s", formula, options->temperature, options->seed,
    e->format.single_file ? "one file, ensemble.xyz" : count == 1 ? "one file" : "one file each",
    n_sampled, n_sampled == 1 ? "" : "s", sampled,
    e->format.style == QV_XYZ_PLAIN ? " (plain XYZ: no velocities)" : ", velocities in A/fs");
  return g_steal_pointer (&e);
}
