/* qv-document-analysis.c — the core's verdicts on a document's modes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <string.h>
#include "qv-document-analysis.h"

QvDerivatives *
qv_document_analysis_copy_derivatives (const QvDocumentAnalysis *a)
{
  QvDerivatives *d;

  if (a == NULL || a->derivatives == NULL)
    return NULL;
  d = qv_derivatives_new (a->derivatives->n_atoms);
  if (a->derivatives->dipole)
    qv_derivatives_set_dipole (d, a->derivatives->dipole, 1.0);
  if (a->derivatives->polarizability)
    qv_derivatives_set_polarizability (d, QV_ALPHA_N_COMPONENTS, a->derivatives->polarizability, 1.0);
  d->polarizability_asymmetry = a->derivatives->polarizability_asymmetry;
  return d;
}

QvDocumentAnalysis *
qv_document_analysis_new (const QvStructure *structure, const QvModeSet *modes,
                          QvDerivatives *derivatives)
{
  QvDocumentAnalysis *a = g_new0 (QvDocumentAnalysis, 1);
  g_autoptr(GError) error = NULL;

  if (structure->n_atoms > QV_DOCUMENT_ANALYSIS_MAX_SYMMETRY_ATOMS)
    a->group_note = g_strdup_printf (_("not searched for more than %d atoms"),
                                     QV_DOCUMENT_ANALYSIS_MAX_SYMMETRY_ATOMS);
  else
    {
      /* The default tolerance, as `quaver modes` uses it. */
      a->group = qv_point_group_detect (structure, 0.0, &error);
      if (a->group)
        a->symmetry = qv_symmetry_report_new (a->group, modes);
      else
        a->group_note = g_strdup (error->message);
      g_clear_error (&error);
    }

  if (structure->n_atoms > QV_DOCUMENT_ANALYSIS_MAX_CHARACTER_ATOMS)
    a->character_note = g_strdup_printf (_("Make-up not computed for more than %d atoms "
                                           "(quaver modes --character computes it)"),
                                         QV_DOCUMENT_ANALYSIS_MAX_CHARACTER_ATOMS);
  else
    {
      /* Without the Hessian, as `quaver modes --character` does: F from
       * the modes, so the app and the command agree. */
      a->character = qv_mode_character_new (structure, modes, NULL, &error);
      if (a->character == NULL)
        a->character_note = g_strdup (error->message);
      g_clear_error (&error);
    }

  a->derivatives = derivatives;
  if (derivatives)
    {
      a->intensities = qv_intensities_compute (modes, derivatives, NULL, 1.0, &error);
      if (a->intensities == NULL)
        a->intensity_note = g_strdup (error->message);
    }
  else
    a->intensity_note = g_strdup (_("This input has no dipole or polarisability derivatives, "
                                    "so there is no spectrum to show. A bundle with "
                                    "\"dipole_derivatives\" (and optionally "
                                    "\"polarizability_derivatives\") has one."));
  return a;
}

void
qv_document_analysis_free (QvDocumentAnalysis *a)
{
  if (a == NULL)
    return;
  g_clear_pointer (&a->symmetry, qv_symmetry_report_free);
  g_clear_pointer (&a->group, qv_point_group_free);
  g_free (a->group_note);
  g_clear_pointer (&a->character, qv_mode_character_free);
  g_free (a->character_note);
  g_clear_pointer (&a->intensities, qv_intensities_free);
  g_clear_pointer (&a->derivatives, qv_derivatives_free);
  g_free (a->intensity_note);
  g_free (a);
}

char *
qv_document_analysis_display (const char *name)
{
  static const struct { const char *ascii, *shown; } words[] = {
    { "inf", "∞" }, { "Sigma_", "Σ" }, { "Sigma", "Σ" }, { "Pi_", "Π" }, { "Pi", "Π" },
    { "Delta_", "Δ" }, { "Delta", "Δ" }, { "Phi_", "Φ" }, { "Phi", "Φ" },
  };
  GString *out = g_string_new (NULL);

  for (const char *p = name; p && *p;)
    {
      gsize i;
      for (i = 0; i < G_N_ELEMENTS (words); i++)
        if (g_str_has_prefix (p, words[i].ascii))
          break;
      if (i < G_N_ELEMENTS (words))
        {
          g_string_append (out, words[i].shown);
          p += strlen (words[i].ascii);
        }
      else
        g_string_append_c (out, *p++);
    }
  return g_string_free (out, FALSE);
}

const char *
qv_document_analysis_label (const QvDocumentAnalysis *a, gsize k)
{
  if (a == NULL || a->symmetry == NULL || k >= a->symmetry->n_modes)
    return NULL;
  return a->symmetry->modes[k].label;
}

int
qv_document_analysis_label_order (const QvDocumentAnalysis *a, gsize k)
{
  const char *label = qv_document_analysis_label (a, k);
  const QvCharacterTable *t = a && a->symmetry ? a->symmetry->table : NULL;
  gsize len;

  if (label == NULL || t == NULL || !a->symmetry->modes[k].defined)
    return G_MAXINT;
  /* A sum ("A1 + E") sorts with its first species. */
  len = strcspn (label, " ");
  for (gsize i = 0; i < qv_character_table_n_irreps (t); i++)
    {
      const char *irrep = qv_character_table_label (t, i);
      if (strlen (irrep) == len && strncmp (irrep, label, len) == 0)
        return (int) i;
    }
  return G_MAXINT - 1;
}
