/* gui-test-util.h — driving the app in tests: the main loop, windows,
 * snapshots, invented systems.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-application.h"
#include "qv-hessian.h"
#include "qv-structure.h"
#include "qv-window.h"

/* The application, registered (startup has run: styles, actions). */
QvApplication *qvg_app (void);
/* A new main window, presented and mapped. */
QvWindow *qvg_window (void);
/* Runs the main loop until @cond(@data) or @timeout_s (a guard against a
 * hang, not a speed check); returns what @cond said last. */
gboolean qvg_wait (gboolean (*cond) (gpointer data), gpointer data, double timeout_s);
/* Runs the main loop for about @seconds. */
void qvg_spin (double seconds);
gboolean qvg_window_has_document (gpointer window);
gboolean qvg_window_idle (gpointer window);
/* Renders @widget's window as the compositor would, into a texture. */
GdkTexture *qvg_snapshot (GtkWidget *window);
/* RGBA8 pixels of @texture (width × height × 4, straight order B,G,R,A as
 * gdk_texture_download gives them on little-endian machines). */
guchar *qvg_pixels (GdkTexture *texture, gsize *stride);
/* Distinct colours in a rectangle of the pixels. */
guint qvg_count_colours (const guchar *pixels, gsize stride, int x, int y, int w, int h);
/* A file in the build tree's tests/gui directory (created). */
char *qvg_build_path (const char *name);
/* Runs `$QUAVER ARGS…` (@args NULL-terminated) in @cwd (NULL: here) and
 * returns its standard output; NULL, with its standard error printed,
 * unless it exited 0. */
char *qvg_run_quaver (const char *cwd, const char *const *args);
/* Removes @dir and everything below it (a test's temporary folder). */
void qvg_remove_tree (const char *dir);

/* An invented system: @n atoms on a jittered cubic lattice (1.5 Å, ±0.25 Å,
 * elements drawn H 50 %, C 30 %, N 10 %, O 10 %), a spring of random
 * stiffness in [2, 20] eV/Å² at its rest length between every pair closer
 * than 2.4 Å. Its Hessian, H_ab = −k uuᵀ and H_aa = Σ k uuᵀ (an elastic
 * network), is exactly symmetric and positive semi-definite with exact
 * rigid-body zero modes. Fixed seed; fast for thousands of atoms (cell
 * list). */
QvStructure *qvg_spring_system (gsize n, guint32 seed, QvHessian **hessian);
