/* qv-thermochem-plot.h — a molecule's gas-phase thermochemistry
 * (qv-gas-thermo.h) against temperature, drawn with cairo in two panels
 * over one T axis: the thermal corrections H and G with the zero-point
 * energy as a dashed level above (kJ/mol), the entropy S, its vibrational
 * part S_vib and the heat capacity Cp below (J/(K mol)), each axis labelled
 * with its unit and each curve named in a legend. A dashed marker
 * can show the temperature of the tables beside the plot. As SVG or RGBA
 * like qv-thermal-plot.h, and a read-out that turns a pixel into T and
 * the values there.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-gas-thermo.h"

G_BEGIN_DECLS

typedef struct {
  int width, height;           /* pixels */
  gboolean transparent;        /* no background fill */
  gboolean dark;               /* the dark palette */
  const char *title;           /* top left, or NULL */
  gboolean has_range;          /* else the sweep's first to last temperature */
  double t_min, t_max;         /* K */
  gboolean has_hover;          /* a solid line at hover_t (K) */
  double hover_t;
  gboolean has_marker;         /* a dashed line at marker_t (K) */
  double marker_t;
} QvThermochemPlotOptions;

typedef enum {
  QV_THERMOCHEM_PANEL_ENERGY,  /* H, G, ZPE (kJ/mol) */
  QV_THERMOCHEM_PANEL_ENTROPY, /* S, S_vib, Cp (J/(K mol)) */
} QvThermochemPanel;

/* Values at one temperature in the plot's units. */
typedef struct {
  double t;                    /* K */
  double enthalpy, free_energy, zpe;             /* kJ/mol */
  double entropy, entropy_vibration, heat_capacity_p;   /* J/(K mol) */
} QvThermochemReadout;

/* 900 × 560, the sweep's range, no hover, no marker. */
void qv_thermochem_plot_options_init (QvThermochemPlotOptions *options);

/* @sweep: @n results at ascending temperatures (qv_gas_thermo_sweep). */
void qv_thermochem_plot_draw (cairo_t *cr, const QvGasThermo *sweep, gsize n,
                              const QvThermochemPlotOptions *options);
/* QV_ERROR_USAGE for a size outside 240–16384 × 240–16384. */
char *qv_thermochem_plot_svg (const QvGasThermo *sweep, gsize n,
                              const QvThermochemPlotOptions *options, gsize *length,
                              GError **error);
guint8 *qv_thermochem_plot_rgba (const QvGasThermo *sweep, gsize n,
                                 const QvThermochemPlotOptions *options, GError **error);

/* "kJ/mol" for the energy panel, "J/(K mol)" for the entropy panel. */
const char *qv_thermochem_plot_unit (QvThermochemPanel panel);
/* The box of a panel (pixels); both share left and right. */
void qv_thermochem_plot_area (const QvThermochemPlotOptions *options, QvThermochemPanel panel,
                              double *left, double *top, double *right, double *bottom);
/* The temperature range shown (K) and a panel's value range (plot units). */
void qv_thermochem_plot_range (const QvGasThermo *sweep, gsize n,
                               const QvThermochemPlotOptions *options, QvThermochemPanel panel,
                               double *t_min, double *t_max, double *v_min, double *v_max);
/* T (K) ↔ pixel column. */
double qv_thermochem_plot_t_to_pixel (const QvGasThermo *sweep, gsize n,
                                      const QvThermochemPlotOptions *options, double t);
double qv_thermochem_plot_pixel_to_t (const QvGasThermo *sweep, gsize n,
                                      const QvThermochemPlotOptions *options, double pixel);
/* A value in plot units ↔ pixel row of @panel. */
double qv_thermochem_plot_value_to_pixel (const QvGasThermo *sweep, gsize n,
                                          const QvThermochemPlotOptions *options,
                                          QvThermochemPanel panel, double value);
double qv_thermochem_plot_pixel_to_value (const QvGasThermo *sweep, gsize n,
                                          const QvThermochemPlotOptions *options,
                                          QvThermochemPanel panel, double pixel);
/* The values at temperature @t (linear between the sweep's temperatures;
 * FALSE outside them). */
gboolean qv_thermochem_plot_value_at (const QvGasThermo *sweep, gsize n, double t,
                                      QvThermochemReadout *out);
/* The read-out under pixel (@px, @py): FALSE unless it is over one of the
 * panels (*@panel says which, when given) and within the sweep's
 * temperatures. */
gboolean qv_thermochem_plot_readout (const QvGasThermo *sweep, gsize n,
                                     const QvThermochemPlotOptions *options, double px, double py,
                                     QvThermochemPanel *panel, QvThermochemReadout *out);

G_END_DECLS
