/* test-point-group.c — point groups, character tables and the symmetry of
 * normal modes.
 *
 * Every geometry here is a model of our own, invented for the test (not
 * taken from any publication): ammonia-like, benzene-like, methane-like,
 * CO2-like, HCN-like, trans-diazene-like, SF6-like, water-like,
 * ethane-like (staggered), ethylene-like, XeF4-like, a dodecahedral
 * C20-like cage, and low-symmetry clusters. Their Hessians come from a pair potential of our own (invented):
 * V = Σ ½ k_ij (r − 0.8 r_ij)² over all pairs, k_ij = k(Z_i, Z_j) e^(−r_ij),
 * evaluated at the model geometry, where the springs are stretched so that
 * every direction is stiff; the potential depends only on distances and
 * elements, so its Hessian has the geometry's full symmetry.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-character-table.h"
#include "qv-error.h"
#include "qv-point-group.h"
#include "qv-symmetry-modes.h"
#include "qv-test-util.h"

#define PHI 1.6180339887498949

/* --- models ---------------------------------------------------------------- */

typedef struct {
  gsize n;
  guint z[128];
  double p[3 * 128];
} Model;

static void
add_atom (Model *m, guint z, double x, double y, double zz)
{
  m->z[m->n] = z;
  m->p[3 * m->n] = x;
  m->p[3 * m->n + 1] = y;
  m->p[3 * m->n + 2] = zz;
  m->n++;
}

static void
ring (Model *m, guint z, guint n, double r, double height, double offset_deg)
{
  for (guint k = 0; k < n; k++)
    {
      double a = (offset_deg + 360.0 * k / n) * G_PI / 180;
      add_atom (m, z, r * cos (a), r * sin (a), height);
    }
}

static Model
ammonia (void)
{
  Model m = { 0 };
  add_atom (&m, 7, 0, 0, 0.38);
  ring (&m, 1, 3, 0.94, 0, 0);
  return m;
}

static Model
benzene (void)
{
  Model m = { 0 };
  ring (&m, 6, 6, 1.39, 0, 0);
  ring (&m, 1, 6, 2.47, 0, 0);
  return m;
}

static Model
methane (void)
{
  Model m = { 0 };
  double a = 0.63;
  add_atom (&m, 6, 0, 0, 0);
  add_atom (&m, 1, a, a, a);
  add_atom (&m, 1, a, -a, -a);
  add_atom (&m, 1, -a, a, -a);
  add_atom (&m, 1, -a, -a, a);
  return m;
}

static Model
co2 (void)
{
  Model m = { 0 };
  add_atom (&m, 6, 0, 0, 0);
  add_atom (&m, 8, 0, 0, 1.16);
  add_atom (&m, 8, 0, 0, -1.16);
  return m;
}

static Model
hcn (void)
{
  Model m = { 0 };
  add_atom (&m, 1, 0, 0, -1.07);
  add_atom (&m, 6, 0, 0, 0);
  add_atom (&m, 7, 0, 0, 1.16);
  return m;
}

static Model
diazene (void)   /* trans, planar */
{
  Model m = { 0 };
  add_atom (&m, 7, 0.62, 0, 0);
  add_atom (&m, 7, -0.62, 0, 0);
  add_atom (&m, 1, 0.97, 0.95, 0);
  add_atom (&m, 1, -0.97, -0.95, 0);
  return m;
}

static Model
sf6 (void)
{
  Model m = { 0 };
  double r = 1.56;
  add_atom (&m, 16, 0, 0, 0);
  add_atom (&m, 9, r, 0, 0);
  add_atom (&m, 9, -r, 0, 0);
  add_atom (&m, 9, 0, r, 0);
  add_atom (&m, 9, 0, -r, 0);
  add_atom (&m, 9, 0, 0, r);
  add_atom (&m, 9, 0, 0, -r);
  return m;
}

static Model
water (void)
{
  Model m = { 0 };
  add_atom (&m, 8, 0, 0, 0.12);
  add_atom (&m, 1, 0.76, 0, -0.47);
  add_atom (&m, 1, -0.76, 0, -0.47);
  return m;
}

static Model
ethane (void)    /* staggered */
{
  Model m = { 0 };
  add_atom (&m, 6, 0, 0, 0.77);
  add_atom (&m, 6, 0, 0, -0.77);
  ring (&m, 1, 3, 1.02, 1.16, 0);
  ring (&m, 1, 3, 1.02, -1.16, 60);
  return m;
}

static Model
ethylene (void)      /* planar, D2h */
{
  Model m = { 0 };
  add_atom (&m, 6, 0, 0, 0.67);
  add_atom (&m, 6, 0, 0, -0.67);
  add_atom (&m, 1, 0, 0.92, 1.23);
  add_atom (&m, 1, 0, -0.92, 1.23);
  add_atom (&m, 1, 0, 0.92, -1.23);
  add_atom (&m, 1, 0, -0.92, -1.23);
  return m;
}

static Model
square_planar (void) /* XeF4-like, D4h */
{
  Model m = { 0 };
  add_atom (&m, 54, 0, 0, 0);
  ring (&m, 9, 4, 1.95, 0, 0);
  return m;
}

static Model
dodecahedron (void)
{
  Model m = { 0 };
  double s = 1.2;
  for (int i = 0; i < 8; i++)
    add_atom (&m, 6, s * ((i & 1) ? 1 : -1), s * ((i & 2) ? 1 : -1), s * ((i & 4) ? 1 : -1));
  for (int i = 0; i < 4; i++)
    {
      double a = (i & 1) ? 1 : -1, b = (i & 2) ? 1 : -1;
      add_atom (&m, 6, 0, s * a / PHI, s * b * PHI);
      add_atom (&m, 6, s * a / PHI, s * b * PHI, 0);
      add_atom (&m, 6, s * b * PHI, 0, s * a / PHI);
    }
  return m;
}

static Model
c1_cluster (void)
{
  Model m = { 0 };
  add_atom (&m, 6, 0.1, 0.2, 0.0);
  add_atom (&m, 7, 1.4, 0.1, 0.2);
  add_atom (&m, 8, -0.5, 1.3, 0.1);
  add_atom (&m, 9, 0.2, -0.4, 1.4);
  add_atom (&m, 1, -0.9, -0.6, -0.5);
  return m;
}

static Model
cs_molecule (void)   /* planar, three different atoms */
{
  Model m = { 0 };
  add_atom (&m, 8, 0, 0, 0);
  add_atom (&m, 1, 0.96, 0, 0);
  add_atom (&m, 17, -0.5, 1.6, 0);
  return m;
}

static Model
ci_molecule (void)
{
  Model m = { 0 };
  const double a[4][3] = { { 0.7, 0, 0 }, { 1.2, 0.9, 0.3 }, { 1.4, -0.8, 0.6 }, { 1.1, 0.1, -1.0 } };
  const guint z[4] = { 6, 9, 17, 1 };
  for (int i = 0; i < 4; i++)
    {
      add_atom (&m, z[i], a[i][0], a[i][1], a[i][2]);
      add_atom (&m, z[i], -a[i][0], -a[i][1], -a[i][2]);
    }
  return m;
}

static Model
s4_molecule (void)   /* two generic orbits of S4: (x,y,z) → (−y,x,−z) */
{
  Model m = { 0 };
  const double q[2][3] = { { 1.0, 0.3, 0.5 }, { 0.7, -1.1, 0.9 } };
  add_atom (&m, 6, 0, 0, 0);
  for (int o = 0; o < 2; o++)
    {
      double x = q[o][0], y = q[o][1], zz = q[o][2];
      for (int k = 0; k < 4; k++)
        {
          add_atom (&m, o ? 1 : 6, x, y, zz);
          double t = x;
          x = -y; y = t; zz = -zz;
        }
    }
  return m;
}

/* --- helpers ----------------------------------------------------------------- */

/* A random rotation (uniform unit quaternion) and a translation. */
static void
random_motion (GRand *rand, double r[9], double t[3])
{
  double q[4], n = 0;
  for (int i = 0; i < 4; i++)
    {
      q[i] = g_rand_double_range (rand, -1, 1);
      n += q[i] * q[i];
    }
  n = sqrt (n);
  for (int i = 0; i < 4; i++)
    q[i] /= n;
  double w = q[0], x = q[1], y = q[2], z = q[3];
  double m[9] = { 1 - 2 * (y * y + z * z), 2 * (x * y - w * z), 2 * (x * z + w * y),
                  2 * (x * y + w * z), 1 - 2 * (x * x + z * z), 2 * (y * z - w * x),
                  2 * (x * z - w * y), 2 * (y * z + w * x), 1 - 2 * (x * x + y * y) };
  memcpy (r, m, sizeof m);
  for (int i = 0; i < 3; i++)
    t[i] = g_rand_double_range (rand, -5, 5);
}

static QvStructure *
place (const Model *m, guint32 seed, double noise)
{
  g_autoptr(GRand) rand = g_rand_new_with_seed (seed);
  double r[9], t[3];
  random_motion (rand, r, t);
  g_autofree double *p = g_new (double, 3 * m->n);
  for (gsize a = 0; a < m->n; a++)
    for (int i = 0; i < 3; i++)
      p[3 * a + i] = r[3 * i] * m->p[3 * a] + r[3 * i + 1] * m->p[3 * a + 1] + r[3 * i + 2] * m->p[3 * a + 2]
                     + t[i] + (noise > 0 ? g_rand_double_range (rand, -noise, noise) : 0);
  return qvt_structure (m->n, m->z, p);
}

/* The invented pair potential's Hessian (see the file header). */
static QvHessian *
pair_hessian (const QvStructure *s)
{
  gsize n = s->n_atoms, dim = 3 * n;
  QvHessian *h = qv_hessian_new (dim, TRUE, NULL);
  for (gsize i = 0; i < n; i++)
    for (gsize j = i + 1; j < n; j++)
      {
        double u[3], r = 0;
        for (int c = 0; c < 3; c++)
          {
            u[c] = s->atoms[j].position[c] - s->atoms[i].position[c];
            r += u[c] * u[c];
          }
        r = sqrt (r);
        for (int c = 0; c < 3; c++)
          u[c] /= r;
        double k = (10.0 + 0.37 * (s->atoms[i].z + s->atoms[j].z)
                    + 0.11 * s->atoms[i].z * s->atoms[j].z) * exp (-r);
        double f2 = k, f1r = k * 0.2;   /* f'' and f'/r with r0 = 0.8 r */
        for (int a = 0; a < 3; a++)
          for (int b = 0; b < 3; b++)
            {
              double v = f2 * u[a] * u[b] + f1r * ((a == b) - u[a] * u[b]);
              h->data[(3 * i + a) + (3 * i + b) * dim] += v;
              h->data[(3 * j + a) + (3 * j + b) * dim] += v;
              h->data[(3 * i + a) + (3 * j + b) * dim] -= v;
              h->data[(3 * j + a) + (3 * i + b) * dim] -= v;
            }
      }
  return h;
}

static void
check_group_sets (const Model *m, const char *name, guint sigma, gsize order, gsize n_sets)
{
  for (guint32 seed = 1; seed <= 3; seed++)
    {
      g_autoptr(QvStructure) s = place (m, seed, 0);
      g_autoptr(GError) error = NULL;
      g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, &error);
      assert_non_null (g);
      if (strcmp (g->name, name) != 0)
        fail_msg ("seed %u: found %s, expected %s", seed, g->name, name);
      assert_int_equal (g->symmetry_number, sigma);
      assert_int_equal (g->order, order);
      assert_true (g->max_deviation < 1e-6);
      for (int i = 0; i < 9; i++)        /* operation 0 is the identity */
        assert_true (fabs (qv_point_group_operation (g, 0)[i] - (i % 4 == 0)) < 1e-12);
      /* every operation is orthogonal and carries the atoms onto their images */
      for (gsize k = 0; k < g->order; k++)
        {
          const double *r = qv_point_group_operation (g, k);
          const gsize *perm = qv_point_group_permutation (g, k);
          for (int i = 0; i < 3; i++)
            for (int j = 0; j < 3; j++)
              {
                double d = r[3 * i] * r[3 * j] + r[3 * i + 1] * r[3 * j + 1] + r[3 * i + 2] * r[3 * j + 2];
                assert_true (fabs (d - (i == j)) < 1e-9);
              }
          for (gsize a = 0; a < s->n_atoms; a++)
            {
              double d2 = 0;
              for (int i = 0; i < 3; i++)
                {
                  double img = g->center[i];
                  for (int j = 0; j < 3; j++)
                    img += r[3 * i + j] * (s->atoms[a].position[j] - g->center[j]);
                  d2 += pow (img - s->atoms[perm[a]].position[i], 2);
                }
              assert_true (sqrt (d2) < 1e-6);
              assert_int_equal (s->atoms[perm[a]].z, s->atoms[a].z);
            }
        }
      /* sets of equivalent atoms (counted by hand for each model) */
      g_autofree gsize *sets = g_new (gsize, s->n_atoms);
      assert_int_equal (qv_point_group_equivalent_atoms (g, sets), n_sets);
      for (gsize a = 0; a < s->n_atoms; a++)
        for (gsize b = 0; b < a; b++)
          if (sets[a] == sets[b])
            assert_int_equal (s->atoms[a].z, s->atoms[b].z);
      /* the table's classes partition the operations */
      const QvCharacterTable *t = qv_character_table_lookup (g->name);
      assert_non_null (t);
      g_autofree gsize *classes = g_new (gsize, g->order);
      if (!qv_character_table_classify (t, g, classes, &error))
        fail_msg ("%s: %s", name, error->message);
    }
}

/* The number of sets of equivalent atoms, by hand: NH3 2, C6H6 2, CH4 2,
 * CO2 2, HCN 3, N2H2 2, SF6 2, H2O 2, C2H6 2, C20 1, the C1 cluster 5,
 * HOCl 3, the Ci molecule 4, the S4 one 3. */
static gsize
expected_sets (const char *name)
{
  static const struct { const char *g; gsize n; } t[] = {
    { "C3v", 2 }, { "D6h", 2 }, { "Td", 2 }, { "Dinfh", 2 }, { "Cinfv", 3 }, { "C2h", 2 },
    { "Oh", 2 }, { "C2v", 2 }, { "D3d", 2 }, { "Ih", 1 }, { "C1", 5 }, { "Cs", 3 }, { "Ci", 4 },
    { "S4", 3 }, { "D2h", 2 }, { "D4h", 2 },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (t); i++)
    if (strcmp (t[i].g, name) == 0)
      return t[i].n;
  return 0;
}

static void
check_group (const Model *m, const char *name, guint sigma, gsize order)
{
  check_group_sets (m, name, sigma, order, expected_sets (name));
}

/* Counts species over the vibrational modes: @expect is "2A1 2E" (a
 * multiplicity of sets, as the reduction gives it). */
static void
check_modes (const Model *m, const char *expect, const char *ir, const char *raman)
{
  g_autoptr(QvStructure) s = place (m, 7, 0);
  g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, NULL);
  assert_non_null (g);
  g_autoptr(QvHessian) h = pair_hessian (s);
  QvSolveOptions opt;
  qv_solve_options_init (&opt);
  g_autoptr(QvModeSet) modes = qvt_solve_checked (s, h, &opt);
  g_autoptr(QvSymmetryReport) rep = qv_symmetry_report_new (g, modes);
  gsize first = modes->n_modes - modes->n_vibrations;
  g_autoptr(GHashTable) count = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  for (gsize k = first; k < modes->n_modes;)
    {
      const QvModeSymmetry *ms = &rep->modes[k];
      if (!ms->defined)
        fail_msg ("%s: mode %zu has no species", g->name, k + 1);
      assert_int_equal (ms->first, k);
      g_auto(GStrv) parts = g_strsplit (ms->label, " + ", -1);
      for (char **p = parts; *p; p++)
        {
          char *lab = *p;
          guint mult = 1;
          if (g_ascii_isdigit (*lab))
            mult = (guint) g_ascii_strtoull (lab, &lab, 10);
          gpointer old = g_hash_table_lookup (count, lab);
          g_hash_table_insert (count, g_strdup (lab), GUINT_TO_POINTER (GPOINTER_TO_UINT (old) + mult));
        }
      /* activity of the set against the species named by the caller */
      gboolean want_ir = FALSE, want_raman = FALSE;
      for (char **p = parts; *p; p++)
        {
          char *lab = *p;
          while (g_ascii_isdigit (*lab))
            lab++;
          g_auto(GStrv) irs = g_strsplit (ir, " ", -1), rams = g_strsplit (raman, " ", -1);
          want_ir |= g_strv_contains ((const char *const *) irs, lab);
          want_raman |= g_strv_contains ((const char *const *) rams, lab);
        }
      if (ms->ir_active != want_ir || ms->raman_active != want_raman)
        fail_msg ("%s %s: IR %d Raman %d, expected %d %d", g->name, ms->label,
                  ms->ir_active, ms->raman_active, want_ir, want_raman);
      k += ms->size;
    }
  g_auto(GStrv) terms = g_strsplit (expect, " ", -1);
  guint n_terms = 0;
  for (char **p = terms; *p; p++, n_terms++)
    {
      char *lab = *p;
      guint mult = 1;
      if (g_ascii_isdigit (*lab))
        mult = (guint) g_ascii_strtoull (lab, &lab, 10);
      guint got = GPOINTER_TO_UINT (g_hash_table_lookup (count, lab));
      if (got != mult)
        fail_msg ("%s: %u × %s, expected %u (of %s)", g->name, got, lab, mult, expect);
    }
  assert_int_equal (g_hash_table_size (count), n_terms);
  /* the rigid-body set (the zero modes) holds Γ_trans + Γ_rot */
  assert_true (rep->modes[0].defined);
}

/* --- groups -------------------------------------------------------------------- */

/* σ = the order of the rotational subgroup (common practice for rotational
 * partition functions: e.g. NH3 3, CH4 12, C6H6 12, SF6 24, CO2 2, H2O 2). */
static void test_c3v (void **state) { (void) state; Model m = ammonia (); check_group (&m, "C3v", 3, 6); }
static void test_d6h (void **state) { (void) state; Model m = benzene (); check_group (&m, "D6h", 12, 24); }
static void test_td (void **state) { (void) state; Model m = methane (); check_group (&m, "Td", 12, 24); }
static void test_dinfh (void **state) { (void) state; Model m = co2 (); check_group (&m, "Dinfh", 2, 8); }
static void test_cinfv (void **state) { (void) state; Model m = hcn (); check_group (&m, "Cinfv", 1, 4); }
static void test_c2h (void **state) { (void) state; Model m = diazene (); check_group (&m, "C2h", 2, 4); }
static void test_oh (void **state) { (void) state; Model m = sf6 (); check_group (&m, "Oh", 24, 48); }
static void test_c2v (void **state) { (void) state; Model m = water (); check_group (&m, "C2v", 2, 4); }
static void test_d3d (void **state) { (void) state; Model m = ethane (); check_group (&m, "D3d", 6, 12); }
static void test_d2h (void **state) { (void) state; Model m = ethylene (); check_group (&m, "D2h", 4, 8); }
static void test_d4h (void **state) { (void) state; Model m = square_planar (); check_group (&m, "D4h", 8, 16); }
static void test_ih (void **state) { (void) state; Model m = dodecahedron (); check_group (&m, "Ih", 60, 120); }
static void test_c1 (void **state) { (void) state; Model m = c1_cluster (); check_group (&m, "C1", 1, 1); }
static void test_cs (void **state) { (void) state; Model m = cs_molecule (); check_group (&m, "Cs", 1, 2); }
static void test_ci (void **state) { (void) state; Model m = ci_molecule (); check_group (&m, "Ci", 1, 2); }
static void test_s4 (void **state) { (void) state; Model m = s4_molecule (); check_group (&m, "S4", 2, 4); }

/* Noise below the tolerance keeps the group; well above it breaks it. */
static void
test_noise (void **state)
{
  (void) state;
  Model models[] = { ammonia (), benzene (), methane (), sf6 (), dodecahedron () };
  const char *names[] = { "C3v", "D6h", "Td", "Oh", "Ih" };
  for (gsize i = 0; i < G_N_ELEMENTS (models); i++)
    {
      g_autoptr(QvStructure) quiet = place (&models[i], 11, 0.2 * QV_SYMMETRY_DEFAULT_TOLERANCE);
      g_autoptr(QvPointGroup) g = qv_point_group_detect (quiet, 0, NULL);
      assert_non_null (g);
      if (strcmp (g->name, names[i]) != 0)
        fail_msg ("noise 0.2 tol: %s, expected %s", g->name, names[i]);
      assert_true (g->max_deviation < QV_SYMMETRY_DEFAULT_TOLERANCE * 3);

      /* symmetrising the noisy geometry makes the group exact */
      qv_point_group_symmetrize_structure (g, quiet);
      g_autoptr(QvPointGroup) exact = qv_point_group_detect (quiet, 1e-6, NULL);
      assert_non_null (exact);
      assert_string_equal (exact->name, names[i]);

      g_autoptr(QvStructure) loud = place (&models[i], 11, 10 * QV_SYMMETRY_DEFAULT_TOLERANCE);
      g_autoptr(QvPointGroup) b = qv_point_group_detect (loud, 0, NULL);
      assert_non_null (b);
      if (strcmp (b->name, names[i]) == 0)
        fail_msg ("noise 10 tol still %s", b->name);
      assert_true (b->order < g->order);
    }
}

static void
test_bad_input (void **state)
{
  (void) state;
  Model m = ammonia ();
  g_autoptr(QvStructure) s = place (&m, 1, 0);
  g_autoptr(GError) error = NULL;
  assert_null (qv_point_group_detect (s, -1, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  s->atoms[2].position[1] = NAN;
  assert_null (qv_point_group_detect (s, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "atom 3"));
  g_clear_error (&error);
  /* one atom: no molecular point group, said so */
  const guint z1 = 18;
  const double p1[3] = { 1, 2, 3 };
  g_autoptr(QvStructure) one = qvt_structure (1, &z1, p1);
  assert_null (qv_point_group_detect (one, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "single atom"));
}

/* --- tables against the groups' own matrices ------------------------------------- */

static void
mat_mul (const double *a, const double *b, double *c)
{
  double t[9];
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      t[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  memcpy (c, t, sizeof t);
}

static double
det3 (const double *r)
{
  return r[0] * (r[4] * r[8] - r[5] * r[7]) - r[1] * (r[3] * r[8] - r[5] * r[6])
         + r[2] * (r[3] * r[7] - r[4] * r[6]);
}

/* Each table: rows orthogonal and complete; the species of x, y, z (trace
 * of R), of the rotations (det R · trace R) and of the quadratic functions
 * (the symmetric square, (χ(g)² + χ(g²))/2; Cotton §4.3, from memory) are
 * exactly the rows whose function columns name them. */
static void
test_tables (void **state)
{
  (void) state;
  const char *const *names = qv_character_table_names ();
  guint n_tables = 0;
  for (const char *const *p = names; *p; p++, n_tables++)
    {
      const QvCharacterTable *t = qv_character_table_lookup (*p);
      gsize nc = qv_character_table_n_classes (t), order = qv_character_table_order (t);
      double vec[64], ax[64], sq[64], sum_dim = 0;
      gsize total = 0;
      for (gsize c = 0; c < nc; c++)
        {
          const double *r = qv_character_table_class_matrix (t, c);
          double r2[9];
          mat_mul (r, r, r2);
          double tr = r[0] + r[4] + r[8];
          vec[c] = tr;
          ax[c] = det3 (r) * tr;
          sq[c] = 0.5 * (tr * tr + (r2[0] + r2[4] + r2[8]));
          total += qv_character_table_class_size (t, c);
        }
      assert_int_equal (total, order);
      for (gsize i = 0; i < qv_character_table_n_irreps (t); i++)
        {
          double norm = 0, nv = 0, na = 0, ns = 0;
          for (gsize c = 0; c < nc; c++)
            {
              double chi = qv_character_table_character (t, i, c), h = qv_character_table_class_size (t, c);
              norm += h * chi * chi;
              nv += h * chi * vec[c];
              na += h * chi * ax[c];
              ns += h * chi * sq[c];
            }
          double chi_e = qv_character_table_character (t, i, 0);
          sum_dim += chi_e * chi_e * (double) order / norm;
          gboolean v = nv / norm > 0.5, a = na / norm > 0.5, s = ns / norm > 0.5;
          /* a linear table is checked in its subgroup, where the quadratic
           * functions of Delta (x²−y², xy) also fall on Sigma species */
          if (strncmp (*p, "Cinf", 4) == 0 || strncmp (*p, "Dinf", 4) == 0)
            s = qv_character_table_raman_active (t, i);
          if (v != qv_character_table_ir_active (t, i) || a != qv_character_table_rotation (t, i)
              || s != qv_character_table_raman_active (t, i))
            fail_msg ("%s %s: x,y,z %d (table %d), R %d (%d), quadratic %d (%d)", *p,
                      qv_character_table_label (t, i), v, qv_character_table_ir_active (t, i), a,
                      qv_character_table_rotation (t, i), s, qv_character_table_raman_active (t, i));
        }
      /* Σ dim² = |G| counting a real pair row as two; linear tables are truncated */
      if (strncmp (*p, "Cinf", 4) != 0 && strncmp (*p, "Dinf", 4) != 0)
        assert_true (fabs (sum_dim - (double) order) < 1e-6);
    }
  assert_true (n_tables >= 50);
}

/* Every tabulated group is found from two generic orbits of its own
 * operations (the closure of the table's class matrices), and its
 * operations fall into the table's classes. */
static void
test_every_table_detected (void **state)
{
  (void) state;
  const char *const *names = qv_character_table_names ();
  const double seeds[4][3] = { { 0.93, 0.37, 0.55 }, { -0.41, 1.27, -0.83 }, { 1.61, -0.29, 1.13 },
                               { 0.21, -0.77, -1.49 } };
  for (const char *const *p = names; *p; p++)
    {
      if (strncmp (*p, "Cinf", 4) == 0 || strncmp (*p, "Dinf", 4) == 0)
        continue;
      const QvCharacterTable *t = qv_character_table_lookup (*p);
      GArray *ops = g_array_new (FALSE, FALSE, sizeof (double) * 9);
      double e[9] = { 1, 0, 0, 0, 1, 0, 0, 0, 1 };
      g_array_append_vals (ops, e, 1);
      for (guint i = 0; i < ops->len; i++)
        for (gsize c = 0; c < qv_character_table_n_classes (t); c++)
          {
            double m[9];
            mat_mul (qv_character_table_class_matrix (t, c), (double *) ops->data + 9 * i, m);
            gboolean found = FALSE;
            for (guint j = 0; j < ops->len && !found; j++)
              {
                double d = 0;
                for (int q = 0; q < 9; q++)
                  d = MAX (d, fabs (m[q] - ((double *) ops->data)[9 * j + q]));
                found = d < 1e-9;
              }
            if (!found)
              g_array_append_vals (ops, m, 1);
          }
      assert_int_equal (ops->len, qv_character_table_order (t));
      guint n_orbits = ops->len >= 60 ? 2 : ops->len <= 2 ? 4 : 3;
      Model *m = g_new0 (Model, 1);
      GArray *z = g_array_new (FALSE, FALSE, sizeof (guint));
      GArray *pos = g_array_new (FALSE, FALSE, sizeof (double));
      for (guint o = 0; o < n_orbits; o++)
        for (guint k = 0; k < ops->len; k++)
          {
            const double *r = (double *) ops->data + 9 * k;
            guint zz = 6 + o;
            g_array_append_val (z, zz);
            for (int i = 0; i < 3; i++)
              {
                double v = r[3 * i] * seeds[o][0] + r[3 * i + 1] * seeds[o][1] + r[3 * i + 2] * seeds[o][2];
                g_array_append_val (pos, v);
              }
          }
      g_autoptr(QvStructure) s0 = qvt_structure (z->len, (guint *) z->data, (double *) pos->data);
      /* a random rotation and translation of the whole */
      g_autoptr(GRand) rand = g_rand_new_with_seed (5);
      double r[9], tr[3];
      random_motion (rand, r, tr);
      for (gsize a = 0; a < s0->n_atoms; a++)
        {
          double q[3];
          for (int i = 0; i < 3; i++)
            q[i] = r[3 * i] * s0->atoms[a].position[0] + r[3 * i + 1] * s0->atoms[a].position[1]
                   + r[3 * i + 2] * s0->atoms[a].position[2] + tr[i];
          memcpy (s0->atoms[a].position, q, sizeof q);
        }
      g_autoptr(GError) error = NULL;
      g_autoptr(QvPointGroup) g = qv_point_group_detect (s0, 0, &error);
      if (g == NULL)
        fail_msg ("%s: %s", *p, error->message);
      if (strcmp (g->name, *p) != 0)
        fail_msg ("generic orbits of %s: found %s", *p, g->name);
      g_autofree gsize *classes = g_new (gsize, g->order);
      if (!qv_character_table_classify (t, g, classes, &error))
        fail_msg ("%s: %s", *p, error->message);
      g_array_free (ops, TRUE);
      g_array_free (z, TRUE);
      g_array_free (pos, TRUE);
      g_free (m);
    }
}

/* --- modes per species ------------------------------------------------------------ */

/* NH3-like, C3v (E 2C3 3σv): unshifted atoms 4, 1, 2; χ per atom 3, 0, 1;
 * Γ3N = (12, 0, 2) = 3A1 + A2 + 4E. Γtrans = A1 + E (z; x,y),
 * Γrot = A2 + E → Γvib = 2A1 + 2E. Cotton's C3v table: A1 (z; x²+y², z²)
 * and E ((x,y); (x²−y²,xy)) are IR and Raman active. */
static void
test_modes_c3v (void **state)
{
  (void) state;
  Model m = ammonia ();
  check_modes (&m, "2A1 2E", "A1 E", "A1 E");
}

/* CH4-like, Td (E 8C3 3C2 6S4 6σd): unshifted 5, 2, 1, 1, 3; χ per atom
 * 3, 0, −1, −1, 1; Γ3N = (15, 0, −1, −1, 3) = A1 + E + T1 + 3T2.
 * Γtrans = T2, Γrot = T1 → Γvib = A1 + E + 2T2. IR: T2 (x,y,z); Raman:
 * A1, E, T2. */
static void
test_modes_td (void **state)
{
  (void) state;
  Model m = methane ();
  check_modes (&m, "A1 E 2T2", "T2", "A1 E T2");
}

/* C6H6-like, D6h with C2' through atoms (x through C1 and H1), σv ⊃ C2',
 * σd ⊃ C2'' (Cotton's headings E 2C6 2C3 C2 3C2' 3C2'' i 2S3 2S6 σh 3σd 3σv).
 * Unshifted: E 12, C2' 4, σh 12, σv 4, all others 0; χ per atom 3, −1, 1, 1.
 * Γ3N = (36, 0, 0, 0, −4, 0, 0, 0, 0, 12, 0, 4); n_i = (36χE − 12χC2'
 * + 12χσh + 12χσv)/24 gives 2A1g + 2A2g + 2B2g + 2E1g + 4E2g + 2A2u + 2B1u
 * + 2B2u + 4E1u + 2E2u (36). Γtrans = A2u + E1u, Γrot = A2g + E1g →
 * Γvib = 2A1g + A2g + 2B2g + E1g + 4E2g + A2u + 2B1u + 2B2u + 3E1u + 2E2u.
 * IR: A2u, E1u; Raman: A1g, E1g, E2g (mutual exclusion). */
static void
test_modes_d6h (void **state)
{
  (void) state;
  Model m = benzene ();
  check_modes (&m, "2A1g A2g 2B2g E1g 4E2g A2u 2B1u 2B2u 3E1u 2E2u", "A2u E1u", "A1g E1g E2g");
}

/* CO2-like, through D2h (z the molecular axis): unshifted E 3, C2(z) 3,
 * C2(y) 1, C2(x) 1, i 1, σ(xy) 1, σ(xz) 3, σ(yz) 3; Γ3N = (9, −3, −1, −1,
 * −3, 1, 3, 3) = Ag + B2g + B3g + 2B1u + 2B2u + 2B3u = Σg+ + Πg + 2Σu+ +
 * 2Πu. Γtrans = Σu+ + Πu, Γrot = Πg → Γvib = Σg+ + Σu+ + Πu. IR: Σu+
 * (z), Πu (x,y); Raman: Σg+. */
static void
test_modes_dinfh (void **state)
{
  (void) state;
  Model m = co2 ();
  check_modes (&m, "Sigma_g+ Sigma_u+ Pi_u", "Sigma_u+ Pi_u", "Sigma_g+");
}

/* HCN-like, C∞v through C2v: Γvib = 2Σ+ + Π, all IR and Raman active. */
static void
test_modes_cinfv (void **state)
{
  (void) state;
  Model m = hcn ();
  check_modes (&m, "2Sigma+ Pi", "Sigma+ Pi", "Sigma+ Pi");
}

/* trans-HNNH-like, C2h (E C2 i σh), planar in σh: unshifted 4, 0, 0, 4;
 * χ per atom 3, −1, −3, 1; Γ3N = (12, 0, 0, 4) = 4Ag + 2Bg + 2Au + 4Bu.
 * Γtrans = Au + 2Bu, Γrot = Ag + 2Bg → Γvib = 3Ag + Au + 2Bu. IR: Au, Bu;
 * Raman: Ag, Bg. */
static void
test_modes_c2h (void **state)
{
  (void) state;
  Model m = diazene ();
  check_modes (&m, "3Ag Au 2Bu", "Au Bu", "Ag Bg");
}

/* SF6-like, Oh (E 8C3 3C2 6C4 6C2' i 8S6 3σh 6S4 6σd): unshifted 7, 1, 3,
 * 3, 1, 1, 1, 5, 1, 3; χ per atom 3, 0, −1, 1, −1, −3, 0, 1, −1, 1;
 * Γ3N = (21, 0, −3, 3, −1, −3, 0, 5, −1, 3) = A1g + Eg + T1g + T2g + 3T1u
 * + T2u. Γtrans = T1u, Γrot = T1g → Γvib = A1g + Eg + T2g + 2T1u + T2u.
 * IR: T1u; Raman: A1g, Eg, T2g; T2u silent. */
static void
test_modes_oh (void **state)
{
  (void) state;
  Model m = sf6 ();
  check_modes (&m, "A1g Eg T2g 2T1u T2u", "T1u", "A1g Eg T2g");
}

/* H2O-like, C2v in the yz plane (Mulliken's convention, x normal to the
 * molecular plane; from memory): unshifted E 3, C2 1, σv(xz) 1, σv'(yz) 3;
 * χ per atom 3, −1, 1, 1; Γ3N = (9, −1, 1, 3): n_A1 = (9−1+1+3)/4 = 3,
 * n_A2 = (9−1−1−3)/4 = 1, n_B1 = (9+1+1−3)/4 = 2, n_B2 = (9+1−1+3)/4 = 3.
 * Γtrans = A1 + B1 + B2, Γrot = A2 + B1 + B2 → Γvib = 2A1 + B2; all IR and
 * Raman active. */
static void
test_modes_c2v (void **state)
{
  (void) state;
  Model m = water ();
  check_modes (&m, "2A1 B2", "A1 B2", "A1 B2");
}

/* Staggered C2H6-like, D3d (E 2C3 3C2' i 2S6 3σd): unshifted 8, 2, 0, 0,
 * 0, 4; χ per atom 3, 0, −1, −3, 0, 1; Γ3N = (24, 0, 0, 0, 0, 4):
 * n_i = 2χE + χσd → 3A1g + A2g + 4Eg + A1u + 3A2u + 4Eu. Γtrans = A2u + Eu,
 * Γrot = A2g + Eg → Γvib = 3A1g + 3Eg + A1u + 2A2u + 3Eu. IR: A2u, Eu;
 * Raman: A1g, Eg. */
static void
test_modes_d3d (void **state)
{
  (void) state;
  Model m = ethane ();
  check_modes (&m, "3A1g 3Eg A1u 2A2u 3Eu", "A2u Eu", "A1g Eg");
}

/* C2H4-like, D2h with Mulliken's axes (x normal to the plane, z along C=C;
 * from memory): E C2(z) C2(y) C2(x) i σ(xy) σ(xz) σ(yz); unshifted 6, 2,
 * 0, 0, 0, 0, 2, 6; χ per atom 3, −1, −1, −1, −3, 1, 1, 1; Γ3N = (18, −2,
 * 0, 0, 0, 0, 2, 6): n_i = (18χE − 2χC2(z) + 2χσ(xz) + 6χσ(yz))/8 →
 * 3Ag + B1g + 2B2g + 3B3g + Au + 3B1u + 3B2u + 2B3u. Γtrans = B1u + B2u +
 * B3u, Γrot = B1g + B2g + B3g → Γvib = 3Ag + B2g + 2B3g + Au + 2B1u +
 * 2B2u + B3u. IR: B1u, B2u, B3u; Raman: Ag, B1g, B2g, B3g; Au silent. */
static void
test_modes_d2h (void **state)
{
  (void) state;
  Model m = ethylene ();
  check_modes (&m, "3Ag B2g 2B3g Au 2B1u 2B2u B3u", "B1u B2u B3u", "Ag B1g B2g B3g");
}

/* XeF4-like, D4h with C2' through the F atoms (x and y), σv ⊃ C2' (product
 * classes E 2C4 C2 2C2' 2C2'' i 2S4 σh 2σv 2σd): unshifted 5, 1, 1, 3, 1,
 * 1, 1, 5, 3, 1; χ per atom 3, 1, −1, −1, −1, −3, −1, 1, 1, 1; Γ3N = (15,
 * 1, −1, −3, −1, −3, −1, 5, 3, 1): g species n = (12χE + 4χC2)/16, u species
 * n = (18χE + 4χC4 − 6χC2 − 12χC2' − 4χC2'')/16 → A1g + A2g + B1g + B2g + Eg
 * + 2A2u + B2u + 3Eu. Γtrans = A2u + Eu, Γrot = A2g + Eg → Γvib = A1g + B1g
 * + B2g + A2u + B2u + 2Eu. IR: A2u, Eu; Raman: A1g, B1g, B2g; B2u silent. */
static void
test_modes_d4h (void **state)
{
  (void) state;
  Model m = square_planar ();
  check_modes (&m, "A1g B1g B2g A2u B2u 2Eu", "A2u Eu", "A1g B1g B2g");
}

/* A Hessian with its symmetry broken (a random symmetric perturbation of
 * 1 % of its largest element) loses species; averaged over the group it
 * gets them back, the same as the exact one. */
static void
test_symmetrize_hessian (void **state)
{
  (void) state;
  Model m = methane ();
  g_autoptr(QvStructure) s = place (&m, 3, 0);
  g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, NULL);
  g_autoptr(QvHessian) h = pair_hessian (s);
  g_autoptr(GRand) rand = g_rand_new_with_seed (9);
  double big = 0;
  for (gsize i = 0; i < h->n * h->n; i++)
    big = MAX (big, fabs (h->data[i]));
  for (gsize i = 0; i < h->n; i++)
    for (gsize j = 0; j <= i; j++)
      {
        double d = 0.01 * big * g_rand_double_range (rand, -1, 1);
        h->data[i + j * h->n] += d;
        if (i != j)
          h->data[j + i * h->n] += d;
      }
  QvSolveOptions opt;
  qv_solve_options_init (&opt);
  g_autoptr(QvModeSet) broken = qvt_solve_checked (s, h, &opt);
  g_autoptr(QvSymmetryReport) rb = qv_symmetry_report_new (g, broken);
  gsize unknown = 0;
  for (gsize k = 0; k < rb->n_modes; k++)
    unknown += !rb->modes[k].defined;
  assert_true (unknown > 0);
  assert_non_null (rb->warnings[0]);

  double change = qv_point_group_symmetrize_hessian (g, h);
  assert_true (change > 1e-4 && change < 0.05);
  g_autoptr(QvModeSet) fixed = qvt_solve_checked (s, h, &opt);
  g_autoptr(QvSymmetryReport) rf = qv_symmetry_report_new (g, fixed);
  for (gsize k = 0; k < rf->n_modes; k++)
    assert_true (rf->modes[k].defined);
  /* averaging twice changes nothing more */
  assert_true (qv_point_group_symmetrize_hessian (g, h) < 1e-12);
}

/* Aligned E bases of NH3: each vector is an eigenvector of the σv chosen
 * (character ±1 on it alone), and the set's label is unchanged. */
static void
test_align (void **state)
{
  (void) state;
  Model m = ammonia ();
  g_autoptr(QvStructure) s = place (&m, 4, 0);
  g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, NULL);
  g_autoptr(QvHessian) h = pair_hessian (s);
  QvSolveOptions opt;
  qv_solve_options_init (&opt);
  g_autoptr(QvModeSet) modes = qvt_solve_checked (s, h, &opt);
  g_autoptr(QvSymmetryReport) rep = qv_symmetry_report_new (g, modes);
  gsize n = qv_symmetry_align_degenerate (rep, modes);
  assert_true (n >= 2);
  const QvCharacterTable *t = qv_character_table_lookup ("C3v");
  g_autofree gsize *classes = g_new (gsize, g->order);
  assert_true (qv_character_table_classify (t, g, classes, NULL));
  g_autofree double *chi = g_new (double, g->order);
  for (gsize k = modes->n_modes - modes->n_vibrations; k < modes->n_modes; k++)
    {
      if (rep->modes[k].size != 2)
        continue;
      qv_symmetry_mode_characters (g, modes, k, 1, chi);
      for (gsize q = 0; q < g->order; q++)
        if (classes[q] == 2)   /* the σv of the first class member */
          {
            assert_true (fabs (fabs (chi[q]) - 1) < 1e-8 || fabs (chi[q] + 0.5) < 1e-8);
            break;
          }
    }
  g_autoptr(QvSymmetryReport) again = qv_symmetry_report_new (g, modes);
  for (gsize k = 0; k < modes->n_modes; k++)
    assert_string_equal (again->modes[k].label, rep->modes[k].label);
}

/* Aligned CH4 sets: every T2 vector is an eigenvector (character ±1 on it
 * alone) of the three C2 operations, each E vector of a σd; the vectors
 * stay orthonormal and the species unchanged. */
static void
test_align_td (void **state)
{
  (void) state;
  Model m = methane ();
  g_autoptr(QvStructure) s = place (&m, 8, 0);
  g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, NULL);
  g_autoptr(QvHessian) h = pair_hessian (s);
  QvSolveOptions opt;
  qv_solve_options_init (&opt);
  g_autoptr(QvModeSet) modes = qvt_solve_checked (s, h, &opt);
  g_autoptr(QvSymmetryReport) rep = qv_symmetry_report_new (g, modes);
  assert_int_equal (qv_symmetry_align_degenerate (rep, modes), 3);   /* E, 2 T2 */
  const QvCharacterTable *t = qv_character_table_lookup ("Td");
  g_autofree gsize *classes = g_new (gsize, g->order);
  assert_true (qv_character_table_classify (t, g, classes, NULL));
  g_autofree double *chi = g_new (double, g->order);
  gsize dim = 3 * s->n_atoms;
  for (gsize k = 0; k < modes->n_modes; k++)
    {
      const QvModeSymmetry *ms = &rep->modes[k];
      qv_symmetry_mode_characters (g, modes, k, 1, chi);
      gsize n_sharp = 0, n_c2 = 0;
      for (gsize q = 0; q < g->order; q++)
        {
          const char *tok = qv_character_table_class_token (t, classes[q]);
          gboolean sharp = fabs (fabs (chi[q]) - 1) < 1e-8;
          if (strcmp (ms->label, "T2") == 0 && strcmp (tok, "C2") == 0)
            {
              n_c2++;
              assert_true (sharp);
            }
          if (strcmp (ms->label, "E") == 0 && strcmp (tok, "sd") == 0)
            n_sharp += sharp;
        }
      if (strcmp (ms->label, "T2") == 0)
        assert_int_equal (n_c2, 3);
      if (strcmp (ms->label, "E") == 0)
        assert_true (n_sharp >= 2);
      for (gsize j = 0; j <= k; j++)
        {
          double d = 0;
          for (gsize q = 0; q < dim; q++)
            d += qv_mode_set_vector (modes, k)[q] * qv_mode_set_vector (modes, j)[q];
          assert_true (fabs (d - (j == k)) < 1e-10);
        }
    }
  g_autoptr(QvSymmetryReport) again = qv_symmetry_report_new (g, modes);
  for (gsize k = 0; k < modes->n_modes; k++)
    assert_string_equal (again->modes[k].label, rep->modes[k].label);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_c3v),
    cmocka_unit_test (test_d6h),
    cmocka_unit_test (test_td),
    cmocka_unit_test (test_dinfh),
    cmocka_unit_test (test_cinfv),
    cmocka_unit_test (test_c2h),
    cmocka_unit_test (test_oh),
    cmocka_unit_test (test_c2v),
    cmocka_unit_test (test_d3d),
    cmocka_unit_test (test_d2h),
    cmocka_unit_test (test_d4h),
    cmocka_unit_test (test_ih),
    cmocka_unit_test (test_c1),
    cmocka_unit_test (test_cs),
    cmocka_unit_test (test_ci),
    cmocka_unit_test (test_s4),
    cmocka_unit_test (test_noise),
    cmocka_unit_test (test_bad_input),
    cmocka_unit_test (test_tables),
    cmocka_unit_test (test_every_table_detected),
    cmocka_unit_test (test_modes_c3v),
    cmocka_unit_test (test_modes_td),
    cmocka_unit_test (test_modes_d6h),
    cmocka_unit_test (test_modes_dinfh),
    cmocka_unit_test (test_modes_cinfv),
    cmocka_unit_test (test_modes_c2h),
    cmocka_unit_test (test_modes_oh),
    cmocka_unit_test (test_modes_c2v),
    cmocka_unit_test (test_modes_d3d),
    cmocka_unit_test (test_modes_d2h),
    cmocka_unit_test (test_modes_d4h),
    cmocka_unit_test (test_symmetrize_hessian),
    cmocka_unit_test (test_align),
    cmocka_unit_test (test_align_td),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
