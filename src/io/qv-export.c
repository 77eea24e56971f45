/* qv-export.c — the shared part of an export: its plan (files, notes,
 * description) and writing it into a directory with its manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-error.h"
#include "qv-export-private.h"

void
qv_export_format_init (QvExportFormat *format)
{
  memset (format, 0, sizeof *format);
  format->style = QV_XYZ_EXTENDED;
}

const char *
qv_export_style_name (QvXyzStyle style)
{
  return style == QV_XYZ_PLAIN ? "xyz" : "extxyz";
}

QvExport *
qv_export_alloc (const QvExportClass *klass, const char *command, const QvStructure *structure,
                 const QvModeSet *modes, const QvExportFormat *format, QvManifest *manifest)
{
  QvExport *e = g_new0 (QvExport, 1);

  e->klass = klass;
  e->command = g_strdup (command);
  e->manifest = manifest;
  e->structure = structure;
  e->modes = modes;
  if (format)
    e->format = *format;
  else
    qv_export_format_init (&e->format);
  e->files = g_ptr_array_new_with_free_func (g_free);
  e->formats = g_ptr_array_new ();
  e->notes = g_ptr_array_new_with_free_func (g_free);
  g_ptr_array_add (e->notes, NULL);
  e->written_names = g_ptr_array_new_with_free_func (g_free);
  g_ptr_array_add (e->written_names, NULL);
  return e;
}

void
qv_export_plan_file (QvExport *e, char *name, const char *format)
{
  g_ptr_array_add (e->files, name);
  g_ptr_array_add (e->formats, (gpointer) format);
}

void
qv_export_add_note (QvExport *e, const char *note)
{
  e->notes->pdata[e->notes->len - 1] = g_strdup (note);
  g_ptr_array_add (e->notes, NULL);
  qv_manifest_add_note (e->manifest, note);
}

void
qv_export_describe_structure (QvExport *e)
{
  e->manifest->n_atoms = e->structure->n_atoms;
  g_free (e->manifest->formula);
  e->manifest->formula = qv_structure_formula (e->structure);
  e->manifest->periodic = qv_structure_is_periodic (e->structure);
}

void
qv_export_free (QvExport *e)
{
  if (e == NULL)
    return;
  if (e->klass->free)
    e->klass->free (e);
  qv_manifest_free (e->manifest);
  g_ptr_array_unref (e->files);
  g_ptr_array_unref (e->formats);
  g_ptr_array_unref (e->notes);
  g_ptr_array_unref (e->written_names);
  g_free (e->structure_file);
  g_free (e->description);
  g_free (e->directory);
  g_free (e->command);
  g_free (e);
}

const char *
qv_export_command (const QvExport *e)
{
  return e->command;
}

gsize
qv_export_n_files (const QvExport *e)
{
  return e->files->len;
}

const char *
qv_export_file_name (const QvExport *e, gsize i)
{
  g_return_val_if_fail (i < e->files->len, NULL);
  return e->files->pdata[i];
}

gsize
qv_export_n_structures (const QvExport *e)
{
  return e->n_structures;
}

char *
qv_export_describe (const QvExport *e)
{
  return g_strdup (e->description ? e->description : "");
}

const char *const *
qv_export_notes (const QvExport *e)
{
  return (const char *const *) e->notes->pdata;
}

const char *
qv_export_structure_file (const QvExport *e, gsize s)
{
  g_return_val_if_fail (s < e->n_structures, NULL);
  return e->files->pdata[e->structure_file[s]];
}

const QvDisplacementSet *
qv_export_displacement_set (const QvExport *e)
{
  return e->set;
}

const QvEnsemble *
qv_export_ensemble (const QvExport *e)
{
  return e->ensemble;
}

const QvStencil *
qv_export_stencil (const QvExport *e)
{
  return e->stencil;
}

const char *
qv_export_directory (const QvExport *e)
{
  return e->directory;
}

const char *const *
qv_export_written (const QvExport *e, gsize *n)
{
  if (n)
    *n = e->written_names->len - 1;
  return (const char *const *) e->written_names->pdata;
}

const QvManifest *
qv_export_manifest (const QvExport *e)
{
  return e->manifest;
}

static void
add_written (QvExport *e, const char *name)
{
  e->written_names->pdata[e->written_names->len - 1] = g_strdup (name);
  g_ptr_array_add (e->written_names, NULL);
}

/* Progress of one file inside the whole export. */
typedef struct {
  const QvProgress *outer;
  double start, span;
} SubProgress;

static gboolean
sub_progress (double fraction, const char *stage, gpointer data)
{
  SubProgress *s = data;
  return s->outer->func (s->start + s->span * CLAMP (fraction, 0.0, 1.0), stage, s->outer->user_data);
}

static void
incomplete (GError **error, const QvExport *e, gsize n)
{
  if (error == NULL || *error == NULL)
    return;
  {
    char *message = g_strdup_printf ("%s; %" G_GSIZE_FORMAT " file%s written before stay in %s, "
                                     "but without manifest.json the export is incomplete",
                                     (*error)->message, n, n == 1 ? "" : "s", e->directory);
    g_free ((*error)->message);
    (*error)->message = message;
  }
}

gboolean
qv_export_write (QvExport *e, const char *directory, gboolean force, const QvProgress *progress,
                 GError **error)
{
  g_autoptr(QvOutputDir) dir = NULL;
  const gsize n = e->files->len;

  if (e->written)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "this export was written already");
      return FALSE;
    }
  e->written = TRUE;
  if (!qv_progress_report (progress, 0.0, "writing", error))
    return FALSE;
  dir = qv_output_dir_open (directory, force, error);
  if (dir == NULL)
    return FALSE;
  e->directory = g_strdup (qv_output_dir_path (dir));

  for (gsize i = 0; i < n; i++)
    {
      g_autoptr(GString) text = g_string_new (NULL);
      SubProgress sub = { progress, (double) i / (double) n, 1.0 / (double) n };
      QvProgress inner = { sub_progress, &sub };
      const QvProgress *p = progress && progress->func ? &inner : NULL;
      const char *name = e->files->pdata[i];
      QvManifestFile *entry;

      if (!e->klass->produce (e, i, text, p, error)
          || !qv_output_dir_write (dir, name, text->str, text->len, error))
        {
          incomplete (error, e, i);
          return FALSE;
        }
      add_written (e, name);
      entry = qv_manifest_add_file (e->manifest, name, e->formats->pdata[i], text->str, text->len);
      e->klass->record (e, i, entry);
      if (!qv_progress_report (progress, (double) (i + 1) / (double) n, "writing", error))
        {
          incomplete (error, e, i + 1);
          return FALSE;
        }
    }
  if (e->klass->finish)
    e->klass->finish (e);
  {
    g_autofree char *json = qv_manifest_to_json (e->manifest);
    if (!qv_output_dir_write (dir, "manifest.json", json, strlen (json), error))
      {
        incomplete (error, e, n);
        return FALSE;
      }
  }
  add_written (e, "manifest.json");
  return TRUE;
}
