/* qv-window-scan.h — "Load Scan Energies…" (win.load-scan-energies): the
 * manifest.json of a scan that `quaver displace` wrote is chosen, then,
 * unless its XYZ files carry energy= themselves, the NAME ENERGY file with
 * its unit; an anharmonic window (qv-anharmonic-window.h) reads and solves
 * it, as `quaver anharmonic` does.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-anharmonic-window.h"
#include "qv-window.h"

G_BEGIN_DECLS

/* The file choosers, then the window. */
void qv_window_choose_scan_energies (QvWindow *window);
/* What the choosers end in (and tests call): an anharmonic window beside
 * @window for the scan of @manifest with the energies of @options (NULL:
 * energy= of the XYZ files, in eV), presented and loading. */
QvAnharmonicWindow *qv_window_load_scan_energies (QvWindow *window, const char *manifest,
                                                  const QvScanEnergiesOptions *options);

/* For tests: the chooser on screen, or NULL. */
GtkFileChooserNative *qv_window_scan_get_chooser (QvWindow *window);

G_END_DECLS
