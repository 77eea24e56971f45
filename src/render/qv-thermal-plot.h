/* qv-thermal-plot.h — harmonic thermal properties of a crystal against
 * temperature, drawn with cairo in two panels over one T axis: energies
 * (F, U, and the zero-point energy as a dashed level) above, entropy and
 * heat capacity (S, Cv) below; per mole of formula units (kJ/mol,
 * J/(K mol)) or per primitive cell (eV, meV/K). As SVG or RGBA like
 * qv-dispersion-plot.h, and a read-out that turns a pixel into T and the
 * values there.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-phonon-thermal.h"

G_BEGIN_DECLS

typedef struct {
  int width, height;           /* pixels */
  gboolean transparent;        /* no background fill */
  gboolean dark;               /* the dark palette */
  const char *title;           /* top left, or NULL */
  gboolean per_cell;           /* eV and meV/K per primitive cell; else per mole
                                  of formula units */
  gsize formula_units;         /* formula units per primitive cell (0 counts as 1) */
  gboolean has_range;          /* else the table's first to last temperature */
  double t_min, t_max;         /* K */
  gboolean has_hover;          /* a marker line at hover_t (K) */
  double hover_t;
  /* Axis labels, NULL: "energy (kJ/mol)", "S, Cv (J/(K mol))" (or the per-cell
   * units), "temperature (K)" — English, not translated (as the spectrum
   * plot); the app passes its translations. The legend's F, U, ZPE, S, Cv
   * are symbols. */
  const char *energy_label, *entropy_label, *temperature_label;
} QvThermalPlotOptions;

typedef enum {
  QV_THERMAL_PANEL_ENERGY,     /* F, U, ZPE */
  QV_THERMAL_PANEL_ENTROPY,    /* S, Cv */
} QvThermalPanel;

/* Values at one temperature in the plot's units (qv_thermal_plot_unit). */
typedef struct {
  double t;                    /* K */
  double free_energy, energy, zpe;       /* kJ/mol or eV/cell */
  double entropy, heat_capacity;         /* J/(K mol) or meV/(K cell) */
} QvThermalReadout;

/* 900 × 560, per mole with one formula unit per cell, the table's range. */
void qv_thermal_plot_options_init (QvThermalPlotOptions *options);

void qv_thermal_plot_draw (cairo_t *cr, const QvThermal *thermal,
                           const QvThermalPlotOptions *options);
/* QV_ERROR_USAGE for a size outside 240–16384 × 240–16384. */
char *qv_thermal_plot_svg (const QvThermal *thermal, const QvThermalPlotOptions *options,
                           gsize *length, GError **error);
guint8 *qv_thermal_plot_rgba (const QvThermal *thermal, const QvThermalPlotOptions *options,
                              GError **error);

/* "kJ/mol" or "eV/cell" for the energy panel, "J/(K mol)" or "meV/(K cell)"
 * for the entropy panel. */
const char *qv_thermal_plot_unit (const QvThermalPlotOptions *options, QvThermalPanel panel);
/* The box of a panel (pixels); both share left and right. */
void qv_thermal_plot_area (const QvThermalPlotOptions *options, QvThermalPanel panel,
                           double *left, double *top, double *right, double *bottom);
/* The temperature range shown (K) and a panel's value range (plot units). */
void qv_thermal_plot_range (const QvThermal *thermal, const QvThermalPlotOptions *options,
                            QvThermalPanel panel, double *t_min, double *t_max,
                            double *v_min, double *v_max);
/* T (K) ↔ pixel column. */
double qv_thermal_plot_t_to_pixel (const QvThermal *thermal, const QvThermalPlotOptions *options,
                                   double t);
double qv_thermal_plot_pixel_to_t (const QvThermal *thermal, const QvThermalPlotOptions *options,
                                   double pixel);
/* A value in plot units ↔ pixel row of @panel. */
double qv_thermal_plot_value_to_pixel (const QvThermal *thermal,
                                       const QvThermalPlotOptions *options, QvThermalPanel panel,
                                       double value);
double qv_thermal_plot_pixel_to_value (const QvThermal *thermal,
                                       const QvThermalPlotOptions *options, QvThermalPanel panel,
                                       double pixel);
/* The values at temperature @t (linear between the table's temperatures;
 * FALSE outside them). */
gboolean qv_thermal_plot_value_at (const QvThermal *thermal, const QvThermalPlotOptions *options,
                                   double t, QvThermalReadout *out);
/* The read-out under pixel (@px, @py): FALSE unless it is over one of the
 * panels (*@panel says which, when given) and within the table's
 * temperatures. */
gboolean qv_thermal_plot_readout (const QvThermal *thermal, const QvThermalPlotOptions *options,
                                  double px, double py, QvThermalPanel *panel,
                                  QvThermalReadout *out);

G_END_DECLS
