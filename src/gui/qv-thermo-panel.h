/* qv-thermo-panel.h — a molecule's gas-phase thermochemistry beside the
 * view (the Thermochemistry page of the side panel): the model's controls
 * (temperature, standard state or pressure, soft-mode treatment with its
 * cut-off or ω₀, symmetry number, frequency scale), the totals split into
 * translation, rotation and vibration, each vibration's share of S and G
 * (a sortable table; imaginary modes marked as left out, with a loud
 * warning) and a sweep from 50 to 1000 K. Every number comes from the core
 * (qv-gas-thermo.h), as `quaver thermo MOLECULE` computes it; the tables
 * save through src/io/qv-thermochem-table.h, the plot through
 * src/render/qv-thermochem-plot.h.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"
#include "qv-gas-thermo.h"

G_BEGIN_DECLS

#define QV_TYPE_THERMO_PANEL (qv_thermo_panel_get_type ())
G_DECLARE_FINAL_TYPE (QvThermoPanel, qv_thermo_panel, QV, THERMO_PANEL, GtkWidget)

/* The sweep: QV_THERMO_PANEL_SWEEP_MIN to _MAX K in steps of _STEP. */
#define QV_THERMO_PANEL_SWEEP_MIN 50.0
#define QV_THERMO_PANEL_SWEEP_MAX 1000.0
#define QV_THERMO_PANEL_SWEEP_STEP 5.0

/* The standard-state choice ("standard-state" property): the core's three,
 * or a pressure of the user's own ("pressure" property, bar). */
typedef enum {
  QV_THERMO_STATE_1BAR,
  QV_THERMO_STATE_1ATM,
  QV_THERMO_STATE_1M,
  QV_THERMO_STATE_PRESSURE,
} QvThermoState;

/* The per-mode table's columns (qv_thermo_panel_cell_text). */
typedef enum {
  QV_THERMO_COLUMN_INDEX,          /* mode number, from 1 (the mode list's) */
  QV_THERMO_COLUMN_WAVENUMBER,     /* cm⁻¹, "i" for imaginary */
  QV_THERMO_COLUMN_ENTROPY,        /* S, J/(K mol) */
  QV_THERMO_COLUMN_SHARE,          /* S as a percentage of S_vib */
  QV_THERMO_COLUMN_FREE_ENERGY,    /* G, kJ/mol */
  QV_THERMO_COLUMN_ZPE,            /* kJ/mol */
  QV_THERMO_COLUMN_HEAT_CAPACITY,  /* Cv, J/(K mol) */
  QV_THERMO_COLUMN_TREATED,        /* raise: the wavenumber used; quasi-RRHO: w */
  QV_THERMO_N_COLUMNS,
} QvThermoColumn;

/* Shows @doc's thermochemistry: a molecule with all its modes; a crystal,
 * a --lowest mode set or NULL shows why there is none. Follows the
 * document's ::changed (masses edited). */
void qv_thermo_panel_set_document (QvThermoPanel *self, QvDocument *doc);

/* The options as the controls set them (what the numbers were computed
 * with), and whether there are numbers. */
void qv_thermo_panel_get_options (QvThermoPanel *self, QvGasThermoOptions *options);
gboolean qv_thermo_panel_has_results (QvThermoPanel *self);
/* The results at the temperature: totals, one entry per mode of the
 * document (@n_modes), and the sweep (@n temperatures). NULL without. */
const QvGasThermo *qv_thermo_panel_get_thermo (QvThermoPanel *self);
const QvGasMode *qv_thermo_panel_get_modes (QvThermoPanel *self, gsize *n_modes);
const QvGasThermo *qv_thermo_panel_get_sweep (QvThermoPanel *self, gsize *n);
/* The loud warning shown (imaginary modes left out), or NULL. */
const char *qv_thermo_panel_get_warning (QvThermoPanel *self);
/* The text of a total in the summary: @term 0 translation, 1 rotation,
 * 2 vibration, 3 total; @quantity 0 ZPE, 1 U, 2 H, 3 S, 4 Cv, 5 G. */
const char *qv_thermo_panel_summary_text (QvThermoPanel *self, guint term, guint quantity);

/* The table as shown (sorted): rows, the mode of a row, a cell's text. */
guint qv_thermo_panel_get_n_rows (QvThermoPanel *self);
int qv_thermo_panel_row_mode (QvThermoPanel *self, guint row);
char *qv_thermo_panel_cell_text (QvThermoPanel *self, guint row, QvThermoColumn column);
/* TRUE when the cell is drawn as a mode left out (warm italics). */
gboolean qv_thermo_panel_cell_left_out (QvThermoPanel *self, guint row, QvThermoColumn column);
void qv_thermo_panel_sort_by (QvThermoPanel *self, QvThermoColumn column, gboolean ascending);
/* Selects a row as a click does: emits ::mode-activated (int mode). */
void qv_thermo_panel_select_row (QvThermoPanel *self, guint row);
/* Marks mode @mode's row selected (−1: none) without emitting. */
void qv_thermo_panel_set_selected (QvThermoPanel *self, int mode);
int qv_thermo_panel_get_selected (QvThermoPanel *self);

/* "modes" (the table) or "sweep" (the plot). */
void qv_thermo_panel_show_page (QvThermoPanel *self, const char *name);
/* The plot's drawing area, and what a point of it reads ("" off the plot). */
GtkWidget *qv_thermo_panel_get_plot_area (QvThermoPanel *self);
char *qv_thermo_panel_describe_point (QvThermoPanel *self, double x, double y);

/* Writes the per-mode table at the temperature (.csv, .json or .txt, as
 * `quaver thermo --per-mode` writes it) or the sweep (.png or .svg the
 * plot, .csv, .json or .txt the table) to @path, atomically; an existing
 * file only with @force. */
gboolean qv_thermo_panel_save_table (QvThermoPanel *self, const char *path, gboolean force,
                                     GError **error);
gboolean qv_thermo_panel_save_sweep (QvThermoPanel *self, const char *path, gboolean force,
                                     GError **error);

G_END_DECLS
