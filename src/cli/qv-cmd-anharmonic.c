/* qv-cmd-anharmonic.c — `quaver anharmonic`: vibrational levels on the
 * potential of a scan (or a two-mode grid) that `quaver displace` wrote,
 * from the energies the user's electronic-structure code computed for it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-energy-file.h"
#include "qv-error.h"
#include "qv-io-error.h"
#include "qv-json-writer.h"
#include "qv-manifest.h"
#include "qv-scan-potential.h"
#include "qv-units.h"
#include "qv-xyz.h"

/* Default largest distance (Å) of an atom from the straight line (plane for
 * a grid) the scan moves it along: above the rounding of codes that print
 * 6 decimals, far below any step of a scan. */
#define DEFAULT_GEOMETRY_TOLERANCE 1e-4

static const char anharmonic_description[] =
  "Vibrational levels along a normal mode beyond the harmonic approximation.\n"
  "MANIFEST is the manifest.json (or its directory) of a scan along one mode\n"
  "('quaver displace --scan N') or of a grid over two ('--grid N'); the\n"
  "energies of its structures come back from your electronic-structure code\n"
  "either as energy= on the comment line of each extended XYZ file (eV, the\n"
  "extended XYZ convention, unless --energy-units says otherwise) or, with\n"
  "--energies FILE, as lines 'NAME ENERGY' ('#' starts a comment) in the unit\n"
  "given by --energy-units (required then: hartree, eV, kcal/mol, kJ/mol,\n"
  "cm^-1). NAME is the structure's file name in the manifest, with or without\n"
  "'.xyz'; for a multi-frame file, FILE@K for frame K (from 0). Every\n"
  "structure needs exactly one energy; missing, repeated, unknown or\n"
  "non-finite ones are named, and an XYZ file whose atoms are off the line of\n"
  "the scan (more than --geometry-tolerance A) is refused (exit 2).\n"
  "\n"
  "V(Q) along the mass-weighted normal coordinate Q (u^1/2 A, the Q of the\n"
  "manifest) is a least-squares polynomial (--degree N; default from the\n"
  "number of points, leaving at least one for the residual, which is\n"
  "reported) or a natural cubic spline through the points (--spline; bicubic\n"
  "on a grid). It is never extrapolated: the grid of the solver stays inside\n"
  "the scanned range. The Schroedinger equation in Q (unit mass) is solved\n"
  "with the sinc DVR of Colbert & Miller (J. Chem. Phys. 96, 1982, 1992) on\n"
  "grids refined until the levels change by less than 1e-6 cm^-1. The\n"
  "wavefunctions vanish at the ends of the scan (the DVR of a finite\n"
  "interval): a level that reaches them is a level of that box, and flagged.\n"
  "\n"
  "Reported: the levels E_0..E_n (--levels, default 6) above the minimum of\n"
  "V, the anharmonic fundamental E_1-E_0 and first overtone E_2-E_0, the\n"
  "harmonic wavenumber from the curvature at the minimum, omega_e and the\n"
  "anharmonicity constant omega_e x_e from E_v = omega_e (v+1/2) -\n"
  "omega_e x_e (v+1/2)^2 through the lowest three levels, and per level <Q>,\n"
  "the outer classical turning points and the weight of the wavefunction near\n"
  "the grid's edge. Warnings: a level above the highest scanned energy or\n"
  "with weight at the edge (the scan is too short), a grid that did not\n"
  "converge, a minimum at the scan's end, a double well (both minima, the\n"
  "barrier and the tunnelling splitting E_1-E_0 are reported). For a grid:\n"
  "the coupled fundamentals, the two levels most strongly linked to the\n"
  "ground state through Q1 and Q2, and the harmonic values from the 2x2\n"
  "curvature at the minimum.\n"
  "\n"
  "A rectilinear normal coordinate describes a torsion or another large\n"
  "curvilinear motion only at small amplitude.\n"
  "\n"
  "Output (--format): text (default), csv (the level table), json (all).\n"
  "-o FILE writes it atomically (an existing file only with --force).\n"
  "\n"
  "Examples:\n"
  "  quaver displace mol.quaver.json --mode 7 --scan 15 --q 4 -o scan7\n"
  "  (run the structures, add energy=... to each comment line)\n"
  "  quaver anharmonic scan7\n"
  "  quaver anharmonic scan7/manifest.json --energies scan7.txt --energy-units hartree\n"
  "  quaver anharmonic grid --energies e.txt --energy-units eV --spline -f json -o grid.json\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "The levels are only as good as the energies, the coordinate and the fit:\n"
  "validate them before relying on them.";

typedef struct {
  char *name;                  /* as an energy file names it */
  char *file;                  /* the manifest's file */
  guint frame;
  guint n_frames;              /* frames of its file */
  double Q[2];
  double energy;               /* eV */
} Point;

static void
point_clear (gpointer data)
{
  Point *p = data;
  g_free (p->name);
  g_free (p->file);
}

static int
usage (const char *format, ...) G_GNUC_PRINTF (1, 2);

static int
usage (const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;
  g_autoptr(GError) error = NULL;
  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE, message);
  return qv_cli_fail ("anharmonic", error);
}

/* The structures of the manifest, with their Q; the modes and the
 * manifest's harmonic wavenumbers into @modes / @wavenumbers. */
static GArray *
collect_points (const QvManifest *m, const char *path, guint *dim, guint modes[2],
                double wavenumbers[2], GError **error)
{
  g_autoptr(GArray) points = g_array_new (FALSE, TRUE, sizeof (Point));
  g_array_set_clear_func (points, point_clear);
  *dim = 0;

  if (g_strcmp0 (m->command, "displace") != 0)
    {
      qv_io_error (error, path, 0, 0, "this manifest was written by 'quaver %s'; anharmonic reads "
                   "the scan or grid of 'quaver displace'", m->command ? m->command : "?");
      return NULL;
    }
  for (guint f = 0; f < m->files->len; f++)
    {
      const QvManifestFile *file = g_ptr_array_index (m->files, f);
      for (guint k = 0; k < file->frames->len; k++)
        {
          const QvManifestFrame *frame = g_ptr_array_index (file->frames, k);
          Point p = { 0 };
          const guint na = frame->amplitudes->len;

          if (na < 1 || na > 2 || (*dim && na != *dim))
            {
              qv_io_error (error, path, 0, 0, "%s frame %u displaces along %u modes; a scan has "
                           "one throughout, a grid two", file->name, k, na);
              return NULL;
            }
          if (*dim == 0)
            {
              *dim = na;
              for (guint d = 0; d < na; d++)
                {
                  const QvManifestAmplitude *a = &g_array_index (frame->amplitudes, QvManifestAmplitude, d);
                  modes[d] = a->mode;
                  wavenumbers[d] = a->wavenumber;
                }
            }
          for (guint d = 0; d < na; d++)
            {
              const QvManifestAmplitude *a = &g_array_index (frame->amplitudes, QvManifestAmplitude, d);
              if (a->mode != modes[d])
                {
                  qv_io_error (error, path, 0, 0, "%s frame %u is along mode %u, the others along "
                               "mode %u: not one scan", file->name, k, a->mode, modes[d]);
                  return NULL;
                }
              if (!isfinite (a->Q))
                {
                  qv_io_error (error, path, 0, 0, "%s frame %u has no finite Q", file->name, k);
                  return NULL;
                }
              p.Q[d] = a->Q;
            }
          p.file = g_strdup (file->name);
          p.frame = k;
          p.n_frames = file->frames->len;
          p.name = file->frames->len == 1 ? g_strdup (file->name)
                                          : g_strdup_printf ("%s@%u", file->name, k);
          p.energy = NAN;
          g_array_append_val (points, p);
        }
    }
  if (points->len < 3)
    {
      qv_io_error (error, path, 0, 0, "the manifest lists %u structure%s; a scan needs at least 3",
                   points->len, points->len == 1 ? "" : "s");
      return NULL;
    }
  return g_steal_pointer (&points);
}

/* Energies from energy= of each structure file, and the geometry check: the
 * positions must lie on r = r0 + Σ_d Q_d c_d (the scan's line or plane)
 * within @tolerance Å. One file's frames are held at a time; the positions
 * of all structures are kept (np·3N doubles) for the fit. */
static gboolean
read_xyz_energies (GArray *points, guint dim, const char *dir, double factor, gboolean unit_given,
                   const QvManifest *m, double tolerance, GError **error)
{
  g_autoptr(GPtrArray) frames = NULL;
  g_autofree char *frames_path = NULL;
  g_autofree double *x = NULL;
  g_autofree guint *z = NULL;
  const char *first_path = NULL;
  gsize n_atoms = 0;
  const gsize np = points->len, cols = dim + 1;

  for (guint i = 0; i < np; i++)
    {
      Point *p = &g_array_index (points, Point, i);
      g_autofree char *path = g_build_filename (dir, p->file, NULL);
      const QvStructure *s;
      const gsize comment_line = (gsize) p->frame * (n_atoms + 2) + 2;

      if (frames_path == NULL || strcmp (frames_path, path) != 0)
        {
          g_clear_pointer (&frames, g_ptr_array_unref);
          g_clear_pointer (&frames_path, g_free);
          if (!g_file_test (path, G_FILE_TEST_EXISTS))
            {
              qv_io_error (error, path, 0, 0, "missing: structure %u of the manifest (%s); give "
                           "its energy with --energies FILE, or put the file back", i + 1, p->name);
              return FALSE;
            }
          frames = qv_xyz_read_file (path, error);
          if (frames == NULL)
            return FALSE;
          if (frames->len != p->n_frames)
            {
              qv_io_error (error, path, 0, 0, "%u frame%s, the manifest lists %u", frames->len,
                           frames->len == 1 ? "" : "s", p->n_frames);
              return FALSE;
            }
          frames_path = g_strdup (path);
        }
      s = g_ptr_array_index (frames, p->frame);
      if (z == NULL)
        {
          first_path = p->file;
          n_atoms = s->n_atoms;
          if (m->n_atoms && n_atoms != m->n_atoms)
            {
              qv_io_error (error, path, 1, 0, "%" G_GSIZE_FORMAT " atoms, the manifest's structure "
                           "has %" G_GSIZE_FORMAT, n_atoms, m->n_atoms);
              return FALSE;
            }
          z = g_new (guint, n_atoms);
          for (gsize a = 0; a < n_atoms; a++)
            z[a] = s->atoms[a].z;
          if (n_atoms > G_MAXSIZE / sizeof (double) / 3 / np
              || (x = g_try_malloc (sizeof (double) * np * 3 * n_atoms)) == NULL)
            {
              g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "%" G_GSIZE_FORMAT " structures of %"
                           G_GSIZE_FORMAT " atoms are too many to check their geometry in memory; "
                           "give the energies with --energies FILE instead", np, n_atoms);
              return FALSE;
            }
        }
      if (s->n_atoms != n_atoms)
        {
          qv_io_error (error, path, (gsize) p->frame * (n_atoms + 2) + 1, 0,
                       "%" G_GSIZE_FORMAT " atoms, %s has %" G_GSIZE_FORMAT, s->n_atoms,
                       first_path, n_atoms);
          return FALSE;
        }
      for (gsize a = 0; a < n_atoms; a++)
        if (s->atoms[a].z != z[a])
          {
            qv_io_error (error, path, comment_line + a + 1, 0, "atom %" G_GSIZE_FORMAT " is element "
                         "%u, in %s it is %u (atoms in another order?)", a + 1, s->atoms[a].z,
                         first_path, z[a]);
            return FALSE;
          }
      if (!s->has_energy)
        {
          qv_io_error (error, path, comment_line, 0, "no energy= on the comment line%s; add the "
                       "energy your code computed for this structure, or give --energies FILE",
                       p->n_frames > 1 ? " of this frame" : "");
          return FALSE;
        }
      if (!isfinite (s->energy))
        {
          qv_io_error (error, path, comment_line, 0, "energy= is not a finite number");
          return FALSE;
        }
      p->energy = s->energy * (unit_given ? factor : 1.0);
      for (gsize a = 0; a < n_atoms; a++)
        for (int c = 0; c < 3; c++)
          x[(gsize) i * 3 * n_atoms + 3 * a + c] = s->atoms[a].position[c];
    }

  /* positions on r = c0 + Σ Q_d c_d: least squares through the normal
   * equations (AᵀA)C = AᵀX, A = [1, Q_1, Q_2] with Q centred, which is
   * (dim+1)² and well conditioned */
  {
    const gsize rhs = 3 * n_atoms;
    g_autofree double *atx = g_new0 (double, cols * rhs);
    double ata[9] = { 0 }, mean[2] = { 0, 0 }, worst = -1;
    guint worst_i = 0;
    gsize worst_a = 0;
    lapack_int info;

    for (guint i = 0; i < np; i++)
      for (guint d = 0; d < dim; d++)
        mean[d] += g_array_index (points, Point, i).Q[d] / (double) np;
    for (guint i = 0; i < np; i++)
      {
        const Point *p = &g_array_index (points, Point, i);
        double row[3] = { 1.0, 0, 0 };
        for (guint d = 0; d < dim; d++)
          row[d + 1] = p->Q[d] - mean[d];
        for (gsize r = 0; r < cols; r++)
          {
            for (gsize c = 0; c < cols; c++)
              ata[r + cols * c] += row[r] * row[c];
            for (gsize k = 0; k < rhs; k++)
              atx[r + cols * k] += row[r] * x[(gsize) i * rhs + k];
          }
      }
    info = LAPACKE_dposv (LAPACK_COL_MAJOR, 'L', (lapack_int) cols, (lapack_int) rhs, ata,
                          (lapack_int) cols, atx, (lapack_int) cols);
    if (info != 0)
      {
        qv_io_error (error, dir, 0, 0, "the structures do not span the scan: their Q are not "
                     "independent (least squares INFO = %d)", (int) info);
        return FALSE;
      }
    for (guint i = 0; i < np; i++)
      {
        const Point *p = &g_array_index (points, Point, i);
        double row[3] = { 1.0, 0, 0 };
        for (guint d = 0; d < dim; d++)
          row[d + 1] = p->Q[d] - mean[d];
        for (gsize at = 0; at < n_atoms; at++)
          {
            double d2 = 0.0;
            for (int c = 0; c < 3; c++)
              {
                const gsize k = 3 * at + c;
                double fit = 0.0;
                for (gsize r = 0; r < cols; r++)
                  fit += row[r] * atx[r + cols * k];
                d2 += (x[(gsize) i * rhs + k] - fit) * (x[(gsize) i * rhs + k] - fit);
              }
            if (sqrt (d2) > worst)
              worst = sqrt (d2), worst_i = i, worst_a = at;
          }
      }
    if (worst > tolerance)
      {
        const Point *p = &g_array_index (points, Point, worst_i);
        g_autofree char *path = g_build_filename (dir, p->file, NULL);
        qv_io_error (error, path, (gsize) p->frame * (n_atoms + 2) + 2 + worst_a + 1, 0,
                     "atom %" G_GSIZE_FORMAT " is %.3g A off the %s the scan moves it along "
                     "(tolerance %.3g A, --geometry-tolerance): this is not the geometry the "
                     "manifest lists for %s (re-oriented or re-optimised by the other code?)",
                     worst_a + 1, worst, dim == 1 ? "line" : "plane", tolerance, p->name);
        return FALSE;
      }
  }
  return TRUE;
}

static int
compare_double (gconstpointer a, gconstpointer b)
{
  const double x = *(const double *) a, y = *(const double *) b;
  return x < y ? -1 : x > y;
}

/* The grid's axes: the distinct Q values of each mode; every pair exactly
 * once. @v_out: the energies on the grid, V[i + n0·j]. */
static gboolean
grid_axes (GArray *points, const char *path, GArray *ax0, GArray *ax1, double **v_out,
           GError **error)
{
  GArray *axes[2] = { ax0, ax1 };
  double span[2] = { 0, 0 };
  g_autofree double *v = NULL;
  g_autofree gboolean *seen = NULL;
  gsize n0, n1;

  for (guint d = 0; d < 2; d++)
    {
      for (guint i = 0; i < points->len; i++)
        span[d] = MAX (span[d], fabs (g_array_index (points, Point, i).Q[d]));
      for (guint i = 0; i < points->len; i++)
        {
          const double q = g_array_index (points, Point, i).Q[d];
          gboolean found = FALSE;
          for (guint k = 0; k < axes[d]->len && !found; k++)
            found = fabs (g_array_index (axes[d], double, k) - q) <= 1e-9 * span[d];
          if (!found)
            g_array_append_val (axes[d], q);
        }
      g_array_sort (axes[d], compare_double);
    }
  n0 = ax0->len;
  n1 = ax1->len;
  if (n0 * n1 != points->len)
    {
      qv_io_error (error, path, 0, 0, "the %u structures are not a full grid: %" G_GSIZE_FORMAT
                   " values of Q1 and %" G_GSIZE_FORMAT " of Q2 would make %" G_GSIZE_FORMAT,
                   points->len, n0, n1, n0 * n1);
      return FALSE;
    }
  v = g_new (double, n0 * n1);
  seen = g_new0 (gboolean, n0 * n1);
  for (guint i = 0; i < points->len; i++)
    {
      const Point *p = &g_array_index (points, Point, i);
      gsize at[2] = { 0, 0 };
      for (guint d = 0; d < 2; d++)
        for (guint k = 0; k < axes[d]->len; k++)
          if (fabs (g_array_index (axes[d], double, k) - p->Q[d]) <= 1e-9 * span[d])
            at[d] = k;
      if (seen[at[0] + n0 * at[1]])
        {
          qv_io_error (error, path, 0, 0, "%s is at the same (Q1, Q2) as another structure: not "
                       "a grid", p->name);
          return FALSE;
        }
      seen[at[0] + n0 * at[1]] = TRUE;
      v[at[0] + n0 * at[1]] = p->energy;
    }
  *v_out = g_steal_pointer (&v);
  return TRUE;
}

typedef struct {
  const QvScanPotential *potential;
  const QvScanLevels *levels;
  guint dim;
  guint modes[2];
  double wavenumbers[2];       /* harmonic, from the manifest */
  guint n_points;
  const char *source;          /* where the energies came from */
  GPtrArray *warnings;
  GPtrArray *notes;
} Report;

static double
cm (double ev)
{
  return ev / qv_scan_ev_per_wavenumber ();
}

static void
num (GString *s, const char *format, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  if (!isfinite (v))
    g_string_append (s, "-");
  else
    g_string_append (s, g_ascii_formatd (buf, sizeof buf, format, v + 0.0));
}

static const char *
fit_name (const QvScanPotential *p)
{
  if (qv_scan_potential_fit (p) == QV_SCAN_FIT_SPLINE)
    return qv_scan_potential_dim (p) == 2 ? "bicubic spline" : "natural cubic spline";
  return "polynomial";
}

static void
collect_warnings (Report *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  const QvDvrStep *last = &g_array_index (ref->steps, QvDvrStep, ref->steps->len - 1);
  g_autoptr(GString) above = g_string_new (NULL), edge = g_string_new (NULL);

  if (!ref->converged)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "the DVR grid did not converge: %" G_GSIZE_FORMAT " points per mode moved the levels by %.3g "
      "cm^-1 (target 1e-6); the levels carry that uncertainty", last->n[0], cm (last->max_change)));
  for (gsize k = 0; k < l->n_levels; k++)
    {
      if (l->levels[k].above_scan)
        g_string_append_printf (above, "%s%" G_GSIZE_FORMAT, above->len ? ", " : "", k);
      if (l->levels[k].edge_weight > QV_SCAN_EDGE_WEIGHT_LIMIT)
        g_string_append_printf (edge, "%s%" G_GSIZE_FORMAT, edge->len ? ", " : "", k);
    }
  if (above->len)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "level%s %s lie%s above the highest scanned energy: the scan is too short for them; "
      "extend it", strchr (above->str, ',') ? "s" : "", above->str,
      strchr (above->str, ',') ? "" : "s"));
  if (edge->len)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "the wavefunction of level%s %s has weight near the ends of the scanned range (over %g "
      "within %g%% of an end): the ends confine %s and push the energy up; extend the scan",
      strchr (edge->str, ',') ? "s" : "", edge->str, QV_SCAN_EDGE_WEIGHT_LIMIT,
      100 * QV_SCAN_EDGE_FRACTION, strchr (edge->str, ',') ? "them" : "it"));
  if (!l->minimum_inside)
    g_ptr_array_add (r->warnings, g_strdup (
      "the lowest energy is at an end of the scan: it does not bracket a minimum (is the "
      "structure optimised? is the mode imaginary?); the harmonic value is not meaningful"));
  if (r->dim == 1 && l->minima->len >= 2)
    {
      g_autoptr(GString) s = g_string_new (NULL);
      for (guint k = 0; k < l->minima->len; k++)
        {
          const QvScanMinimum *mn = &g_array_index (l->minima, QvScanMinimum, k);
          g_string_append_printf (s, "%sQ = %.5f u^1/2 A (%.2f cm^-1)", k ? ", " : "", mn->Q[0],
                                  cm (mn->energy));
        }
      g_ptr_array_add (r->warnings, g_strdup_printf (
        "a multiple well: %u minima, at %s; barrier %.2f cm^-1 between the two lowest; "
        "tunnelling splitting E_1 - E_0 = %.6g cm^-1%s; omega_e and omega_e x_e (a single-well "
        "formula) do not describe it", l->minima->len, s->str, cm (l->barrier), cm (l->splitting),
        l->levels[1].energy > l->barrier ? " (E_1 is above the barrier: not a tunnelling pair)" : ""));
    }
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    {
      double rms, max;
      qv_scan_potential_residual (r->potential, &rms, &max);
      const double fundamental = r->dim == 1 ? l->fundamental : l->fundamentals[0];
      if (isfinite (fundamental) && max > 0.01 * fundamental)
        g_ptr_array_add (r->warnings, g_strdup_printf (
          "the polynomial misses a point by %.3g cm^-1, over 1%% of the %sfundamental: try another "
          "--degree or --spline", cm (max), r->dim == 1 ? "" : "lower "));
    }
  g_ptr_array_add (r->notes, g_strdup (
    "a rectilinear normal coordinate describes a torsion (or another large curvilinear motion) "
    "only at small amplitude"));
  g_ptr_array_add (r->notes, g_strdup_printf (
    "V(Q) is a %s inside the scanned range only (never extrapolated); the DVR grid spans that "
    "range", fit_name (r->potential)));
}

static char *
format_text (const Report *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  GString *s = g_string_new (NULL);
  double lo, hi, rms, max;

  qv_scan_potential_range (r->potential, 0, &lo, &hi);
  qv_scan_potential_residual (r->potential, &rms, &max);
  if (r->dim == 1)
    g_string_append_printf (s, "# quaver anharmonic: mode %u (harmonic %.2f cm^-1 in the manifest), "
                            "%u points, Q from %.5f to %.5f u^1/2 A\n", r->modes[0],
                            r->wavenumbers[0], r->n_points, lo, hi);
  else
    {
      double lo1, hi1;
      qv_scan_potential_range (r->potential, 1, &lo1, &hi1);
      g_string_append_printf (s, "# quaver anharmonic: modes %u and %u (harmonic %.2f and %.2f "
                              "cm^-1 in the manifest), a %u-point grid, Q1 from %.5f to %.5f, Q2 "
                              "from %.5f to %.5f u^1/2 A\n", r->modes[0], r->modes[1],
                              r->wavenumbers[0], r->wavenumbers[1], r->n_points, lo, hi, lo1, hi1);
    }
  g_string_append_printf (s, "# energies: %s\n", r->source);
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    g_string_append_printf (s, "# V(Q): polynomial of %sdegree %u, residual at the points rms %.4g "
                            "cm^-1, largest %.4g cm^-1\n", r->dim == 2 ? "total " : "",
                            qv_scan_potential_degree (r->potential), cm (rms), cm (max));
  else
    g_string_append_printf (s, "# V(Q): %s through every point\n", fit_name (r->potential));
  if (r->dim == 1)
    g_string_append_printf (s, "# minimum at Q = %.6f u^1/2 A; harmonic wavenumber from the "
                            "curvature there: %.4f cm^-1\n", l->q_min[0], l->harmonic[0]);
  else
    g_string_append_printf (s, "# minimum at Q1 = %.6f, Q2 = %.6f u^1/2 A; harmonic wavenumbers "
                            "from the curvature there: %.4f and %.4f cm^-1\n", l->q_min[0],
                            l->q_min[1], l->harmonic[0], l->harmonic[1]);
  if (r->dim == 1)
    g_string_append_printf (s, "# %3s %14s %14s %12s %12s %12s %11s\n", "v", "E_v", "E_v-E_0",
                            "<Q>", "Q_tp-", "Q_tp+", "edge");
  else
    g_string_append_printf (s, "# %3s %14s %14s %12s %12s %11s\n", "v", "E_v", "E_v-E_0",
                            "<Q1>", "<Q2>", "edge");
  g_string_append_printf (s, "# %3s %14s %14s %12s %12s%s\n", "", "cm^-1", "cm^-1", "u^1/2 A",
                          "u^1/2 A", r->dim == 1 ? "      u^1/2 A" : "");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      g_string_append_printf (s, "  %3" G_GSIZE_FORMAT " ", k);
      {
        GString *t = g_string_new (NULL);
        num (t, "%.6f", cm (v->energy));
        g_string_append_printf (s, "%14s ", t->str);
        g_string_truncate (t, 0);
        num (t, "%.6f", cm (v->energy - l->levels[0].energy));
        g_string_append_printf (s, "%14s ", t->str);
        for (int c = 0; c < (r->dim == 1 ? 3 : 2); c++)
          {
            g_string_truncate (t, 0);
            num (t, "%.6f", r->dim == 1 ? (c == 0 ? v->mean[0] : v->turning[c - 1]) : v->mean[c]);
            g_string_append_printf (s, "%12s ", t->str);
          }
        g_string_truncate (t, 0);
        g_string_append_printf (t, "%.2e", v->edge_weight);
        g_string_append_printf (s, "%11s%s\n", t->str, v->above_scan ? "  above the scan" : "");
        g_string_free (t, TRUE);
      }
    }
  if (r->dim == 1)
    {
      g_string_append_printf (s, "# fundamental (E_1-E_0) %.6f cm^-1, first overtone (E_2-E_0) "
                              "%.6f cm^-1\n", cm (l->fundamental), cm (l->overtone));
      g_string_append_printf (s, "# omega_e %.6f cm^-1, anharmonicity constant omega_e x_e %.6f "
                              "cm^-1 (through E_0, E_1, E_2)\n", cm (l->omega_e),
                              cm (l->omega_e_x_e));
    }
  else
    for (int f = 0; f < 2; f++)
      g_string_append_printf (s, "# coupled fundamental %d: level %" G_GSIZE_FORMAT ", %.6f cm^-1, "
                              "mostly along Q%u (mode %u)\n", f + 1, l->fundamental_level[f],
                              cm (l->fundamentals[f]), l->fundamental_axis[f] + 1,
                              r->modes[l->fundamental_axis[f]]);
  g_string_append (s, "# DVR grid (points per mode, largest level change in cm^-1):");
  for (guint k = 0; k < ref->steps->len; k++)
    {
      const QvDvrStep *st = &g_array_index (ref->steps, QvDvrStep, k);
      if (isnan (st->max_change))
        g_string_append_printf (s, " %" G_GSIZE_FORMAT, st->n[0]);
      else
        g_string_append_printf (s, ", %" G_GSIZE_FORMAT " (%.2g)", st->n[0], cm (st->max_change));
    }
  g_string_append_printf (s, "; %s\n", ref->converged ? "converged to 1e-6 cm^-1" : "NOT converged");
  for (guint k = 0; k < r->warnings->len; k++)
    g_string_append_printf (s, "# warning: %s\n", (const char *) g_ptr_array_index (r->warnings, k));
  for (guint k = 0; k < r->notes->len; k++)
    g_string_append_printf (s, "# note: %s\n", (const char *) g_ptr_array_index (r->notes, k));
  return g_string_free (s, FALSE);
}

static char *
format_csv (const Report *r)
{
  const QvScanLevels *l = r->levels;
  GString *s = g_string_new (NULL);

  if (r->dim == 1)
    g_string_append (s, "v,energy_cm-1,above_ground_cm-1,mean_Q,turning_point_minus,"
                        "turning_point_plus,edge_weight,above_scan\n");
  else
    g_string_append (s, "v,energy_cm-1,above_ground_cm-1,mean_Q1,mean_Q2,edge_weight,above_scan\n");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      char buf[G_ASCII_DTOSTR_BUF_SIZE];
      const double cols[5] = { cm (v->energy), cm (v->energy - l->levels[0].energy), v->mean[0],
                               r->dim == 1 ? v->turning[0] : v->mean[1], v->turning[1] };
      g_string_append_printf (s, "%" G_GSIZE_FORMAT, k);
      for (int c = 0; c < (r->dim == 1 ? 5 : 4); c++)
        {
          g_string_append_c (s, ',');
          if (isfinite (cols[c]))
            g_string_append (s, qv_json_format_double (buf, cols[c]));
        }
      g_string_append_printf (s, ",%s,%s\n", qv_json_format_double (buf, v->edge_weight),
                              v->above_scan ? "true" : "false");
    }
  return g_string_free (s, FALSE);
}

static char *
format_json (const Report *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  QvJsonWriter *w = qv_json_writer_new ();
  double rms, max;

  qv_scan_potential_residual (r->potential, &rms, &max);
  qv_json_begin_object (w, NULL);
  qv_json_begin_object (w, "units");
  qv_json_string (w, "energy", "cm^-1");
  qv_json_string (w, "Q", "u^1/2 A");
  qv_json_end_object (w);
  qv_json_int (w, "dimension", r->dim);
  qv_json_begin_array (w, "modes");
  for (guint d = 0; d < r->dim; d++)
    {
      double lo, hi;
      qv_scan_potential_range (r->potential, d, &lo, &hi);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "mode", r->modes[d]);
      qv_json_number (w, "manifest_wavenumber", r->wavenumbers[d]);
      qv_json_number (w, "Q_min", lo);
      qv_json_number (w, "Q_max", hi);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_int (w, "points", r->n_points);
  qv_json_string (w, "energies", r->source);
  qv_json_begin_object (w, "potential");
  qv_json_string (w, "method", qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_SPLINE
                  ? "spline" : "polynomial");
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    qv_json_int (w, "degree", qv_scan_potential_degree (r->potential));
  qv_json_number (w, "residual_rms", cm (rms));
  qv_json_number (w, "residual_max", cm (max));
  qv_json_end_object (w);
  qv_json_begin_object (w, "minimum");
  qv_json_numbers (w, "Q", l->q_min, r->dim);
  qv_json_bool (w, "inside", l->minimum_inside);
  qv_json_end_object (w);
  qv_json_numbers (w, "harmonic_wavenumbers", l->harmonic, r->dim);
  qv_json_begin_array (w, "levels");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "v", (gint64) k);
      qv_json_number (w, "energy", cm (v->energy));
      qv_json_number (w, "above_ground", cm (v->energy - l->levels[0].energy));
      qv_json_numbers (w, "mean_Q", v->mean, r->dim);
      if (r->dim == 1)
        qv_json_numbers (w, "turning_points", v->turning, 2);
      qv_json_number (w, "edge_weight", v->edge_weight);
      qv_json_bool (w, "above_scan", v->above_scan);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  if (r->dim == 1)
    {
      qv_json_number (w, "fundamental", cm (l->fundamental));
      qv_json_number (w, "overtone", cm (l->overtone));
      qv_json_number (w, "omega_e", cm (l->omega_e));
      qv_json_number (w, "omega_e_x_e", cm (l->omega_e_x_e));
      qv_json_begin_array (w, "minima");
      for (guint k = 0; k < l->minima->len; k++)
        {
          const QvScanMinimum *mn = &g_array_index (l->minima, QvScanMinimum, k);
          qv_json_begin_object (w, NULL);
          qv_json_number (w, "Q", mn->Q[0]);
          qv_json_number (w, "energy", cm (mn->energy));
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
      if (l->minima->len >= 2)
        {
          qv_json_begin_object (w, "double_well");
          qv_json_number (w, "barrier", cm (l->barrier));
          qv_json_number (w, "splitting", cm (l->splitting));
          qv_json_end_object (w);
        }
      else
        qv_json_null (w, "double_well");
    }
  else
    {
      qv_json_begin_array (w, "fundamentals");
      for (int f = 0; f < 2; f++)
        {
          qv_json_begin_object (w, NULL);
          qv_json_int (w, "level", (gint64) l->fundamental_level[f]);
          qv_json_number (w, "wavenumber", cm (l->fundamentals[f]));
          qv_json_int (w, "mostly_mode", r->modes[l->fundamental_axis[f]]);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
    }
  qv_json_begin_object (w, "convergence");
  qv_json_number (w, "tolerance", 1e-6);
  qv_json_bool (w, "converged", ref->converged);
  qv_json_begin_array (w, "steps");
  for (guint k = 0; k < ref->steps->len; k++)
    {
      const QvDvrStep *st = &g_array_index (ref->steps, QvDvrStep, k);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "points", (gint64) st->n[0]);
      qv_json_number (w, "step", st->step[0]);
      qv_json_number (w, "max_change", cm (st->max_change));
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  qv_json_begin_array (w, "warnings");
  for (guint k = 0; k < r->warnings->len; k++)
    qv_json_string (w, NULL, g_ptr_array_index (r->warnings, k));
  qv_json_end_array (w);
  qv_json_begin_array (w, "notes");
  for (guint k = 0; k < r->notes->len; k++)
    qv_json_string (w, NULL, g_ptr_array_index (r->notes, k));
  qv_json_end_array (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

int
qv_cmd_anharmonic (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  char *energies = NULL, *units_arg = NULL, *format_arg = NULL, *output = NULL;
  gint degree = 0, n_levels = 6;
  double geometry_tolerance = DEFAULT_GEOMETRY_TOLERANCE;
  gboolean spline = FALSE, force = FALSE;
  QvEnergyUnit unit = QV_ENERGY_UNIT_EV;
  g_autofree char *manifest_path = NULL, *dir = NULL, *source = NULL, *text = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(GArray) points = NULL;
  g_autoptr(QvScanPotential) potential = NULL;
  g_autoptr(QvScanLevels) levels = NULL;
  g_autoptr(GPtrArray) warnings = g_ptr_array_new_with_free_func (g_free);
  g_autoptr(GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  Report report = { 0 };
  guint dim = 0, modes[2] = { 0, 0 };
  double wavenumbers[2] = { NAN, NAN };
  enum { TEXT, CSV, JSON } format = TEXT;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "energies", 'e', 0, G_OPTION_ARG_FILENAME, &energies,
      "Energies as 'NAME ENERGY' lines (default: energy= of each XYZ file)", "FILE" },
    { "energy-units", 'u', 0, G_OPTION_ARG_STRING, &units_arg,
      "Unit of the energies: hartree, eV, kcal/mol, kJ/mol, cm^-1", "UNIT" },
    { "degree", 'd', 0, G_OPTION_ARG_INT, &degree,
      "Polynomial degree of V(Q) (default from the number of points)", "N" },
    { "spline", 0, 0, G_OPTION_ARG_NONE, &spline,
      "A natural cubic spline through the points instead (bicubic on a grid)", NULL },
    { "levels", 0, 0, G_OPTION_ARG_INT, &n_levels, "Levels to report, from v = 0 (default 6)", "N" },
    { "geometry-tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &geometry_tolerance,
      "Largest distance (A) of an atom from the scan's line (default 1e-4)", "A" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv or json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output",
      "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver anharmonic");
  context = g_option_context_new ("MANIFEST");
  g_option_context_set_summary (context, "Anharmonic vibrational levels on the potential of a "
                                "scan or a two-mode grid.");
  g_option_context_set_description (context, anharmonic_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  if (argc != 2)
    {
      status = usage (argc < 2 ? "anharmonic needs the MANIFEST of a scan (manifest.json or its "
                      "directory)" : "anharmonic takes one MANIFEST, got %d", argc - 1);
      goto out;
    }
  if (format_arg)
    {
      if (g_ascii_strcasecmp (format_arg, "csv") == 0)
        format = CSV;
      else if (g_ascii_strcasecmp (format_arg, "json") == 0)
        format = JSON;
      else if (g_ascii_strcasecmp (format_arg, "text") != 0)
        {
          status = usage ("unknown format '%s'; accepted: text, csv, json", format_arg);
          goto out;
        }
    }
  if (spline && degree)
    {
      status = usage ("give --degree N or --spline, not both");
      goto out;
    }
  if (degree && (degree < 2 || degree > QV_SCAN_MAX_DEGREE))
    {
      status = usage ("--degree must be from 2 to %d, got %d", QV_SCAN_MAX_DEGREE, degree);
      goto out;
    }
  if (n_levels < 3 || n_levels > 200)
    {
      status = usage ("--levels must be from 3 to 200 (the fundamental and overtone need three), "
                      "got %d", n_levels);
      goto out;
    }
  if (!(geometry_tolerance > 0) || !isfinite (geometry_tolerance))
    {
      status = usage ("--geometry-tolerance must be a positive distance in A");
      goto out;
    }
  if (units_arg && !qv_energy_unit_parse (units_arg, &unit, &error))
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  if (energies && units_arg == NULL)
    {
      status = usage ("--energies needs --energy-units (%s): the unit is never guessed",
                      qv_energy_unit_list ());
      goto out;
    }

  /* the manifest and its structures */
  if (g_file_test (argv[1], G_FILE_TEST_IS_DIR))
    manifest_path = g_build_filename (argv[1], "manifest.json", NULL);
  else
    manifest_path = g_strdup (argv[1]);
  dir = g_path_get_dirname (manifest_path);
  manifest = qv_manifest_read_file (manifest_path, &error);
  if (manifest == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  points = collect_points (manifest, manifest_path, &dim, modes, wavenumbers, &error);
  if (points == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }

  /* their energies, in eV */
  if (energies)
    {
      g_autoptr(QvEnergyFile) file = qv_energy_file_read (energies, &error);
      g_autofree const char **names = g_new (const char *, points->len);
      g_autofree double *values = g_new (double, points->len);

      if (file == NULL)
        {
          status = qv_cli_fail ("anharmonic", error);
          goto out;
        }
      for (guint i = 0; i < points->len; i++)
        names[i] = g_array_index (points, Point, i).name;
      if (!qv_energy_file_match (file, names, points->len, values, &error))
        {
          status = qv_cli_fail ("anharmonic", error);
          goto out;
        }
      for (guint i = 0; i < points->len; i++)
        g_array_index (points, Point, i).energy = values[i] * qv_energy_unit_to_ev (unit);
      source = g_strdup_printf ("%s (%s)", energies, qv_energy_unit_name (unit));
    }
  else
    {
      if (!read_xyz_energies (points, dim, dir, qv_energy_unit_to_ev (unit), units_arg != NULL,
                              manifest, geometry_tolerance, &error))
        {
          status = qv_cli_fail ("anharmonic", error);
          goto out;
        }
      source = g_strdup_printf ("energy= of the structure files (%s), positions checked to %g A",
                                units_arg ? qv_energy_unit_name (unit) : "eV", geometry_tolerance);
    }

  /* V(Q) and the levels */
  if (dim == 1)
    {
      g_autofree double *q = g_new (double, points->len), *v = g_new (double, points->len);
      for (guint i = 0; i < points->len; i++)
        {
          q[i] = g_array_index (points, Point, i).Q[0];
          v[i] = g_array_index (points, Point, i).energy;
        }
      potential = qv_scan_potential_new_1d (q, v, points->len, spline ? QV_SCAN_FIT_SPLINE
                                            : QV_SCAN_FIT_POLYNOMIAL, (guint) degree, &error);
    }
  else
    {
      g_autoptr(GArray) ax0 = g_array_new (FALSE, FALSE, sizeof (double));
      g_autoptr(GArray) ax1 = g_array_new (FALSE, FALSE, sizeof (double));
      g_autofree double *v = NULL;
      if (!grid_axes (points, manifest_path, ax0, ax1, &v, &error))
        {
          status = qv_cli_fail ("anharmonic", error);
          goto out;
        }
      potential = qv_scan_potential_new_2d ((const double *) ax0->data, ax0->len,
                                            (const double *) ax1->data, ax1->len, v,
                                            spline ? QV_SCAN_FIT_SPLINE : QV_SCAN_FIT_POLYNOMIAL,
                                            (guint) degree, &error);
    }
  if (potential == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  levels = qv_scan_potential_solve (potential, (gsize) n_levels, 0, 0, &error);
  if (levels == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }

  report.potential = potential;
  report.levels = levels;
  report.dim = dim;
  memcpy (report.modes, modes, sizeof modes);
  memcpy (report.wavenumbers, wavenumbers, sizeof wavenumbers);
  report.n_points = points->len;
  report.source = source;
  report.warnings = warnings;
  report.notes = notes;
  collect_warnings (&report);
  for (guint k = 0; k < warnings->len; k++)
    g_printerr ("quaver: warning: %s\n", (const char *) g_ptr_array_index (warnings, k));
  text = format == JSON ? format_json (&report) : format == CSV ? format_csv (&report)
                                                                : format_text (&report);
  status = qv_cli_emit ("anharmonic", output, text, force);

out:
  g_free (energies); g_free (units_arg); g_free (format_arg); g_free (output);
  return status;
}
