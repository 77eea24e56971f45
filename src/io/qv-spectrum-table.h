/* qv-spectrum-table.h — spectra as CSV: the stick table (one row per mode:
 * wavenumber, scaled wavenumber, IR intensity, Raman activity and
 * intensity) and the broadened envelope on its grid, as `quaver spectrum`
 * writes them and the app saves them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-intensity.h"
#include "qv-spectrum.h"

G_BEGIN_DECLS

/* One row per mode; empty cells where a quantity is undefined (imaginary
 * modes, no tensor). @scale multiplies the scaled wavenumber column. */
char *qv_spectrum_table_sticks_csv (const QvIntensities *intensities, double scale);
/* The envelope: "wavenumber_cm-1,QUANTITY_UNIT_per_cm-1" then one row per
 * grid point; @quantity such as "ir", @unit such as "km/mol" (spaces,
 * slashes and carets become '_' in the header). */
char *qv_spectrum_table_envelope_csv (const QvSpectrum *spectrum, const char *quantity,
                                      const char *unit);

G_END_DECLS
