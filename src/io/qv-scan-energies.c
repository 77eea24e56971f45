/* qv-scan-energies.c — a displace scan's manifest with the energies that
 * came back for its structures (moved here from quaver anharmonic so that
 * the app reads scans the same way).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-io-error.h"
#include "qv-scan-energies.h"
#include "qv-xyz.h"

static void
point_clear (gpointer data)
{
  QvScanPoint *p = data;
  g_free (p->name);
  g_free (p->file);
}

static GArray *
collect_points (const QvManifest *m, const char *path, guint *dim, guint modes[2],
                double wavenumbers[2], GError **error)
{
  g_autoptr(GArray) points = g_array_new (FALSE, TRUE, sizeof (QvScanPoint));
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
          QvScanPoint p = { 0 };
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
      QvScanPoint *p = &g_array_index (points, QvScanPoint, i);
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
        mean[d] += g_array_index (points, QvScanPoint, i).Q[d] / (double) np;
    for (guint i = 0; i < np; i++)
      {
        const QvScanPoint *p = &g_array_index (points, QvScanPoint, i);
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
        const QvScanPoint *p = &g_array_index (points, QvScanPoint, i);
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
        const QvScanPoint *p = &g_array_index (points, QvScanPoint, worst_i);
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
        span[d] = MAX (span[d], fabs (g_array_index (points, QvScanPoint, i).Q[d]));
      for (guint i = 0; i < points->len; i++)
        {
          const double q = g_array_index (points, QvScanPoint, i).Q[d];
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
      const QvScanPoint *p = &g_array_index (points, QvScanPoint, i);
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

void
qv_scan_energies_options_init (QvScanEnergiesOptions *options)
{
  memset (options, 0, sizeof *options);
  options->unit = QV_ENERGY_UNIT_EV;
  options->geometry_tolerance = QV_SCAN_GEOMETRY_TOLERANCE;
}

void
qv_scan_energies_free (QvScanEnergies *scan)
{
  if (scan == NULL)
    return;
  g_free (scan->manifest_path);
  g_clear_pointer (&scan->manifest, qv_manifest_free);
  g_clear_pointer (&scan->points, g_array_unref);
  g_free (scan->source);
  g_free (scan);
}

static char *
manifest_file (const char *manifest)
{
  if (g_file_test (manifest, G_FILE_TEST_IS_DIR))
    return g_build_filename (manifest, "manifest.json", NULL);
  return g_strdup (manifest);
}

QvScanEnergies *
qv_scan_energies_read (const char *manifest, const QvScanEnergiesOptions *options,
                       GError **error)
{
  g_autoptr(QvScanEnergies) scan = g_new0 (QvScanEnergies, 1);
  g_autofree char *dir = NULL;
  QvScanEnergiesOptions defaults;

  if (options == NULL)
    {
      qv_scan_energies_options_init (&defaults);
      options = &defaults;
    }
  scan->wavenumbers[0] = scan->wavenumbers[1] = NAN;
  scan->manifest_path = manifest_file (manifest);
  dir = g_path_get_dirname (scan->manifest_path);
  scan->manifest = qv_manifest_read_file (scan->manifest_path, error);
  if (scan->manifest == NULL)
    return NULL;
  scan->points = collect_points (scan->manifest, scan->manifest_path, &scan->dim, scan->modes,
                                 scan->wavenumbers, error);
  if (scan->points == NULL)
    return NULL;

  /* their energies, in eV */
  if (options->energies)
    {
      g_autoptr(QvEnergyFile) file = qv_energy_file_read (options->energies, error);
      g_autofree const char **names = g_new (const char *, scan->points->len);
      g_autofree double *values = g_new (double, scan->points->len);

      if (file == NULL)
        return NULL;
      for (guint i = 0; i < scan->points->len; i++)
        names[i] = g_array_index (scan->points, QvScanPoint, i).name;
      if (!qv_energy_file_match (file, names, scan->points->len, values, error))
        return NULL;
      for (guint i = 0; i < scan->points->len; i++)
        g_array_index (scan->points, QvScanPoint, i).energy
          = values[i] * qv_energy_unit_to_ev (options->unit);
      scan->source = g_strdup_printf ("%s (%s)", options->energies,
                                      qv_energy_unit_name (options->unit));
    }
  else
    {
      if (!read_xyz_energies (scan->points, scan->dim, dir, qv_energy_unit_to_ev (options->unit),
                              options->unit_given, scan->manifest, options->geometry_tolerance,
                              error))
        return NULL;
      scan->source = g_strdup_printf ("energy= of the structure files (%s), positions checked to "
                                      "%g A", options->unit_given
                                      ? qv_energy_unit_name (options->unit) : "eV",
                                      options->geometry_tolerance);
    }
  return g_steal_pointer (&scan);
}

gboolean
qv_scan_energies_have_xyz_energies (const char *manifest)
{
  g_autofree char *path = manifest_file (manifest);
  g_autofree char *dir = g_path_get_dirname (path);
  g_autoptr(QvManifest) m = qv_manifest_read_file (path, NULL);
  g_autoptr(GArray) points = NULL;
  guint dim = 0, modes[2];
  double wavenumbers[2];

  if (m == NULL)
    return FALSE;
  points = collect_points (m, path, &dim, modes, wavenumbers, NULL);
  if (points == NULL)
    return FALSE;
  for (guint f = 0; f < m->files->len; f++)
    {
      const QvManifestFile *file = g_ptr_array_index (m->files, f);
      g_autofree char *fpath = g_build_filename (dir, file->name, NULL);
      g_autoptr(GPtrArray) frames = qv_xyz_read_file (fpath, NULL);
      if (frames == NULL)
        return FALSE;
      for (guint k = 0; k < frames->len; k++)
        if (!((const QvStructure *) g_ptr_array_index (frames, k))->has_energy)
          return FALSE;
    }
  return TRUE;
}

QvScanPotential *
qv_scan_energies_potential (const QvScanEnergies *scan, QvScanFit fit, guint degree,
                            GError **error)
{
  GArray *points = scan->points;
  if (scan->dim == 1)
    {
      g_autofree double *q = g_new (double, points->len), *v = g_new (double, points->len);
      for (guint i = 0; i < points->len; i++)
        {
          q[i] = g_array_index (points, QvScanPoint, i).Q[0];
          v[i] = g_array_index (points, QvScanPoint, i).energy;
        }
      return qv_scan_potential_new_1d (q, v, points->len, fit, degree, error);
    }
  else
    {
      g_autoptr(GArray) ax0 = g_array_new (FALSE, FALSE, sizeof (double));
      g_autoptr(GArray) ax1 = g_array_new (FALSE, FALSE, sizeof (double));
      g_autofree double *v = NULL;
      if (!grid_axes (points, scan->manifest_path, ax0, ax1, &v, error))
        return NULL;
      return qv_scan_potential_new_2d ((const double *) ax0->data, ax0->len,
                                       (const double *) ax1->data, ax1->len, v, fit, degree,
                                       error);
    }
}
