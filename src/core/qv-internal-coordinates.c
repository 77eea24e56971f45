/* qv-internal-coordinates.c — perception of valence internal coordinates and
 * their Wilson s-vectors (Wilson, Decius & Cross, Molecular Vibrations,
 * 1955, §4-1; the torsion as the gradient of the atan2 dihedral).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-internal-coordinates.h"

#define DASH "\u2013"   /* en dash, as chemists write bonds */

const char *
qv_internal_kind_name (QvInternalKind kind)
{
  switch (kind)
    {
    case QV_INTERNAL_STRETCH: return "stretch";
    case QV_INTERNAL_BEND: return "bend";
    case QV_INTERNAL_LINEAR_BEND: return "linear bend";
    case QV_INTERNAL_TORSION: return "torsion";
    case QV_INTERNAL_OUT_OF_PLANE: return "out-of-plane";
    default: return "unknown";
    }
}

/* ---- small vector helpers ------------------------------------------- */

static void
sub3 (const double *a, const double *b, double *out)
{
  for (int c = 0; c < 3; c++)
    out[c] = a[c] - b[c];
}

static double
dot3 (const double *a, const double *b)
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

static void
cross3 (const double *a, const double *b, double *out)
{
  double t[3] = { a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2],
                  a[0] * b[1] - a[1] * b[0] };
  memcpy (out, t, sizeof t);
}

static double
norm3 (const double *a)
{
  return sqrt (dot3 (a, a));
}

/* Unit vector from atom @from to atom @to, its length into *@r. */
static void
unit_between (const double *x, guint32 from, guint32 to, double *e, double *r)
{
  sub3 (x + 3 * to, x + 3 * from, e);
  *r = norm3 (e);
  for (int c = 0; c < 3; c++)
    e[c] /= *r;
}

static void
add_row (double *row, guint32 atom, const double *v, double f)
{
  for (int c = 0; c < 3; c++)
    row[3 * atom + c] += f * v[c];
}

static double
angle_at (const double *x, guint32 i, guint32 j, guint32 k)
{
  double e1[3], e2[3], r1, r2;

  unit_between (x, j, i, e1, &r1);
  unit_between (x, j, k, e2, &r2);
  return acos (CLAMP (dot3 (e1, e2), -1.0, 1.0));
}

/* ---- values and s-vectors ------------------------------------------- */

static double
eval_stretch (const guint32 *a, const double *x, double *row)
{
  double e[3], r;

  unit_between (x, a[0], a[1], e, &r);
  if (row)
    {
      add_row (row, a[0], e, -1.0);
      add_row (row, a[1], e, 1.0);
    }
  return r;
}

/* WDC §4-1: s_1 = (cos φ e_31 − e_32)/(r_31 sin φ), apex 3. */
static double
eval_bend (const guint32 *a, const double *x, double *row)
{
  double e1[3], e2[3], r1, r2, c, s;

  unit_between (x, a[1], a[0], e1, &r1);
  unit_between (x, a[1], a[2], e2, &r2);
  c = CLAMP (dot3 (e1, e2), -1.0, 1.0);
  s = sqrt (1.0 - c * c);
  if (row && s > 0.0)
    {
      double si[3], sk[3];
      for (int q = 0; q < 3; q++)
        {
          si[q] = (c * e1[q] - e2[q]) / (r1 * s);
          sk[q] = (c * e2[q] - e1[q]) / (r2 * s);
        }
      add_row (row, a[0], si, 1.0);
      add_row (row, a[2], sk, 1.0);
      add_row (row, a[1], si, -1.0);
      add_row (row, a[1], sk, -1.0);
    }
  return acos (c);
}

/* q = (e_ji + e_jk)·u: the derivative of a unit vector e = d/|d| along u is
 * (u − e (e·u))/|d|. At a straight angle q is the bend towards u to first
 * order (WDC §4-1, linear molecules). */
static double
eval_linear_bend (const guint32 *a, const double *u, const double *x, double *row)
{
  double e1[3], e2[3], r1, r2;

  unit_between (x, a[1], a[0], e1, &r1);
  unit_between (x, a[1], a[2], e2, &r2);
  if (row)
    {
      double d1[3], d2[3], p1 = dot3 (e1, u), p2 = dot3 (e2, u);
      for (int c = 0; c < 3; c++)
        {
          d1[c] = (u[c] - e1[c] * p1) / r1;
          d2[c] = (u[c] - e2[c] * p2) / r2;
        }
      add_row (row, a[0], d1, 1.0);
      add_row (row, a[2], d2, 1.0);
      add_row (row, a[1], d1, -1.0);
      add_row (row, a[1], d2, -1.0);
    }
  return dot3 (e1, u) + dot3 (e2, u);
}

/* φ = atan2(|b2| b1·(b2×b3), (b1×b2)·(b2×b3)), b1 = x_j − x_i, b2 = x_k − x_j,
 * b3 = x_l − x_k (IUPAC sign: positive clockwise looking along j→k). Its
 * gradient: ∂φ/∂x_i = −|b2| n1/|n1|², ∂φ/∂x_l = |b2| n2/|n2|², and the
 * middle atoms from translational invariance and the torque balance
 * (the form given by Bekker and by Blondel & Karplus). */
static double
eval_torsion (const guint32 *a, const double *x, double *row)
{
  double b1[3], b2[3], b3[3], n1[3], n2[3], lb2;

  sub3 (x + 3 * a[1], x + 3 * a[0], b1);
  sub3 (x + 3 * a[2], x + 3 * a[1], b2);
  sub3 (x + 3 * a[3], x + 3 * a[2], b3);
  cross3 (b1, b2, n1);
  cross3 (b2, b3, n2);
  lb2 = norm3 (b2);
  if (row)
    {
      double gi[3], gl[3], gj[3], gk[3];
      double nn1 = dot3 (n1, n1), nn2 = dot3 (n2, n2);
      double f1 = dot3 (b1, b2) / (lb2 * lb2), f3 = dot3 (b3, b2) / (lb2 * lb2);
      if (nn1 > 0.0 && nn2 > 0.0)
        {
          for (int c = 0; c < 3; c++)
            {
              gi[c] = -lb2 / nn1 * n1[c];
              gl[c] = lb2 / nn2 * n2[c];
            }
          for (int c = 0; c < 3; c++)
            {
              gj[c] = (-f1 - 1.0) * gi[c] + f3 * gl[c];
              gk[c] = (-f3 - 1.0) * gl[c] + f1 * gi[c];
            }
          add_row (row, a[0], gi, 1.0);
          add_row (row, a[1], gj, 1.0);
          add_row (row, a[2], gk, 1.0);
          add_row (row, a[3], gl, 1.0);
        }
    }
  return atan2 (lb2 * dot3 (b1, n2), dot3 (n1, n2));
}

/* WDC §4-1, out-of-plane bending: atom 1 out of the plane of 2–4–3, centre
 * 4; sin θ = (e_42 × e_43)·e_41 / sin φ_1, φ_1 the angle 2–4–3.
 *   s_1 = [(e_42×e_43)/(cos θ sin φ_1) − tan θ e_41]/r_41
 *   s_2 = [(e_43×e_41)/(cos θ sin φ_1) − tan θ (e_42 − cos φ_1 e_43)/sin² φ_1]/r_42
 *   s_3 = [(e_41×e_42)/(cos θ sin φ_1) − tan θ (e_43 − cos φ_1 e_42)/sin² φ_1]/r_43
 *   s_4 = −s_1 − s_2 − s_3.
 * Here atoms[] = {1, 4, 2, 3}. */
static double
eval_out_of_plane (const guint32 *a, const double *x, double *row)
{
  double e41[3], e42[3], e43[3], r41, r42, r43, c23[3], cphi, sphi, st, th, ct, tt;

  unit_between (x, a[1], a[0], e41, &r41);
  unit_between (x, a[1], a[2], e42, &r42);
  unit_between (x, a[1], a[3], e43, &r43);
  cross3 (e42, e43, c23);
  cphi = CLAMP (dot3 (e42, e43), -1.0, 1.0);
  sphi = sqrt (1.0 - cphi * cphi);
  if (!(sphi > 0.0))
    return 0.0;
  st = CLAMP (dot3 (c23, e41) / sphi, -1.0, 1.0);
  th = asin (st);
  ct = cos (th);
  tt = tan (th);
  if (row && ct > 0.0)
    {
      double c31[3], c12[3], s1[3], s2[3], s3[3];
      cross3 (e43, e41, c31);
      cross3 (e41, e42, c12);
      for (int c = 0; c < 3; c++)
        {
          s1[c] = (c23[c] / (ct * sphi) - tt * e41[c]) / r41;
          s2[c] = (c31[c] / (ct * sphi) - tt / (sphi * sphi) * (e42[c] - cphi * e43[c])) / r42;
          s3[c] = (c12[c] / (ct * sphi) - tt / (sphi * sphi) * (e43[c] - cphi * e42[c])) / r43;
        }
      add_row (row, a[0], s1, 1.0);
      add_row (row, a[2], s2, 1.0);
      add_row (row, a[3], s3, 1.0);
      add_row (row, a[1], s1, -1.0);
      add_row (row, a[1], s2, -1.0);
      add_row (row, a[1], s3, -1.0);
    }
  return th;
}

double
qv_internal_coordinate_evaluate (const QvInternalCoordinate *c, const double *positions,
                                 gsize n_atoms, double *row)
{
  if (row)
    memset (row, 0, 3 * n_atoms * sizeof *row);
  switch (c->kind)
    {
    case QV_INTERNAL_STRETCH: return eval_stretch (c->atoms, positions, row);
    case QV_INTERNAL_BEND: return eval_bend (c->atoms, positions, row);
    case QV_INTERNAL_LINEAR_BEND: return eval_linear_bend (c->atoms, c->direction, positions, row);
    case QV_INTERNAL_TORSION: return eval_torsion (c->atoms, positions, row);
    case QV_INTERNAL_OUT_OF_PLANE: return eval_out_of_plane (c->atoms, positions, row);
    default: return NAN;
    }
}

/* ---- names and families --------------------------------------------- */

static const char *
symbol_of (const QvStructure *s, guint32 atom)
{
  const QvElement *e = qv_element_from_z (s->atoms[atom].z);
  return e ? e->symbol : "X";
}

/* Order of the two elements of a bond: carbon first, hydrogen last, the
 * rest alphabetically between ("C–H", "O–H", "C–O"; common practice). */
static int
stretch_rank_cmp (const char *a, const char *b)
{
  int ra = strcmp (a, "C") == 0 ? 0 : strcmp (a, "H") == 0 ? 2 : 1;
  int rb = strcmp (b, "C") == 0 ? 0 : strcmp (b, "H") == 0 ? 2 : 1;
  return ra != rb ? ra - rb : strcmp (a, b);
}

/* Order of the ends of a chain (bends, torsions): hydrogen first, then
 * carbon, the rest alphabetically ("H–C–H", "H–C–C–O"). */
static int
chain_rank_cmp (const char *a, const char *b)
{
  int ra = strcmp (a, "H") == 0 ? 0 : strcmp (a, "C") == 0 ? 1 : 2;
  int rb = strcmp (b, "H") == 0 ? 0 : strcmp (b, "C") == 0 ? 1 : 2;
  return ra != rb ? ra - rb : strcmp (a, b);
}

static char *
atom_name (const QvStructure *s, guint32 atom)
{
  return g_strdup_printf ("%s%u", symbol_of (s, atom), atom + 1);
}

static char *
chain_name (const QvStructure *s, const guint32 *atoms, guint n)
{
  GString *str = g_string_new (NULL);

  for (guint i = 0; i < n; i++)
    {
      g_autofree char *a = atom_name (s, atoms[i]);
      if (i)
        g_string_append (str, DASH);
      g_string_append (str, a);
    }
  return g_string_free (str, FALSE);
}

/* The element chain read in whichever direction puts the smaller end first
 * (chain_rank_cmp element by element), so a torsion and its reverse share
 * a family. */
static char *
chain_family (const QvStructure *s, const guint32 *atoms, guint n, const char *what)
{
  const char *fw[4], *bw[4];
  const char **use = fw;
  GString *str = g_string_new (NULL);

  for (guint i = 0; i < n; i++)
    {
      fw[i] = symbol_of (s, atoms[i]);
      bw[i] = symbol_of (s, atoms[n - 1 - i]);
    }
  for (guint i = 0; i < n; i++)
    {
      int c = chain_rank_cmp (fw[i], bw[i]);
      if (c != 0)
        {
          use = c < 0 ? fw : bw;
          break;
        }
    }
  for (guint i = 0; i < n; i++)
    {
      if (i)
        g_string_append (str, DASH);
      g_string_append (str, use[i]);
    }
  g_string_append_printf (str, " %s", what);
  return g_string_free (str, FALSE);
}

/* ---- perception ------------------------------------------------------ */

typedef struct {
  const QvStructure *s;
  double *x;
  GArray *coords;       /* QvInternalCoordinate */
  GPtrArray *notes;
  GArray **nbr;         /* per atom: guint32 neighbours, ascending */
  gsize n_linear, n_skipped;   /* near-linear angles, bonds without torsions */
} Builder;

/* Notes of one kind listed one by one up to this many, then counted. */
#define MAX_NOTES 5

static QvInternalCoordinate *
push (Builder *b, QvInternalKind kind, const guint32 *atoms, guint n)
{
  QvInternalCoordinate c = { 0 };

  c.kind = kind;
  c.n_atoms = n;
  memcpy (c.atoms, atoms, n * sizeof *atoms);
  g_array_append_val (b->coords, c);
  return &g_array_index (b->coords, QvInternalCoordinate, b->coords->len - 1);
}

static guint32
nbr_at (Builder *b, guint32 atom, guint i)
{
  return g_array_index (b->nbr[atom], guint32, i);
}

static void
add_stretches (Builder *b, const QvBond *bonds, gsize n_bonds)
{
  for (gsize i = 0; i < n_bonds; i++)
    {
      guint32 a[2] = { bonds[i].a, bonds[i].b };
      const char *sa = symbol_of (b->s, a[0]), *sb = symbol_of (b->s, a[1]);
      QvInternalCoordinate *c = push (b, QV_INTERNAL_STRETCH, a, 2);
      if (stretch_rank_cmp (sa, sb) > 0)
        {
          const char *t = sa;
          sa = sb;
          sb = t;
        }
      c->name = chain_name (b->s, a, 2);
      c->family = g_strdup_printf ("%s" DASH "%s stretch", sa, sb);
    }
}

/* Two unit vectors u, w ⟂ the axis i→k: u from the Cartesian axis least
 * aligned with it, w = axis × u. */
static void
linear_directions (const double *x, guint32 i, guint32 k, double *u, double *w)
{
  double axis[3], r, e[3] = { 0, 0, 0 };
  int best = 0;

  unit_between (x, i, k, axis, &r);
  for (int c = 1; c < 3; c++)
    if (fabs (axis[c]) < fabs (axis[best]))
      best = c;
  e[best] = 1.0;
  for (int c = 0; c < 3; c++)
    u[c] = e[c] - axis[c] * axis[best];
  r = norm3 (u);
  for (int c = 0; c < 3; c++)
    u[c] /= r;
  cross3 (axis, u, w);
}

static void
add_bends (Builder *b)
{
  for (guint32 j = 0; j < b->s->n_atoms; j++)
    {
      guint n = b->nbr[j]->len;
      for (guint p = 0; p < n; p++)
        for (guint r = p + 1; r < n; r++)
          {
            guint32 a[3] = { nbr_at (b, j, p), j, nbr_at (b, j, r) };
            double deg = angle_at (b->x, a[0], a[1], a[2]) * 180.0 / G_PI;
            g_autofree char *chain = chain_name (b->s, a, 3);
            if (deg <= QV_INTERNAL_LINEAR_ANGLE)
              {
                QvInternalCoordinate *c = push (b, QV_INTERNAL_BEND, a, 3);
                c->name = g_steal_pointer (&chain);
                c->family = chain_family (b->s, a, 3, "bend");
              }
            else
              {
                double u[3], w[3];
                linear_directions (b->x, a[0], a[2], u, w);
                for (int t = 0; t < 2; t++)
                  {
                    QvInternalCoordinate *c = push (b, QV_INTERNAL_LINEAR_BEND, a, 3);
                    memcpy (c->direction, t ? w : u, sizeof u);
                    c->name = g_strdup_printf ("%s linear bend %c", chain, t ? 'b' : 'a');
                    c->family = chain_family (b->s, a, 3, "linear bend");
                  }
                if (b->n_linear++ < MAX_NOTES)
                  g_ptr_array_add (b->notes,
                                   g_strdup_printf ("angle %s is %.1f\u00b0, near-linear: described by "
                                                    "two perpendicular linear bends, and no torsion "
                                                    "runs through it", chain, deg));
              }
          }
    }
}

static void
add_torsions (Builder *b, const QvBond *bonds, gsize n_bonds)
{
  for (gsize t = 0; t < n_bonds; t++)
    {
      guint32 j = bonds[t].a, k = bonds[t].b;
      gboolean skipped = FALSE;
      for (guint p = 0; p < b->nbr[j]->len; p++)
        for (guint r = 0; r < b->nbr[k]->len; r++)
          {
            guint32 i = nbr_at (b, j, p), l = nbr_at (b, k, r);
            guint32 a[4] = { i, j, k, l };
            if (i == k || l == j || i == l)
              continue;
            if (angle_at (b->x, i, j, k) * 180.0 / G_PI > QV_INTERNAL_LINEAR_ANGLE
                || angle_at (b->x, j, k, l) * 180.0 / G_PI > QV_INTERNAL_LINEAR_ANGLE)
              {
                skipped = TRUE;
                continue;
              }
            QvInternalCoordinate *c = push (b, QV_INTERNAL_TORSION, a, 4);
            c->name = chain_name (b->s, a, 4);
            c->family = chain_family (b->s, a, 4, "torsion");
          }
      if (skipped && b->n_skipped++ < MAX_NOTES)
        {
          guint32 a[2] = { j, k };
          g_autofree char *bond = chain_name (b->s, a, 2);
          g_ptr_array_add (b->notes,
                           g_strdup_printf ("torsions about %s through a near-linear angle "
                                            "(> %.0f\u00b0) are left out", bond,
                                            QV_INTERNAL_LINEAR_ANGLE));
        }
    }
}

static void
add_out_of_plane (Builder *b)
{
  for (guint32 j = 0; j < b->s->n_atoms; j++)
    {
      guint32 n[3];
      double sum = 0.0;
      int start = -1;
      if (b->nbr[j]->len != 3)
        continue;
      for (int p = 0; p < 3; p++)
        n[p] = nbr_at (b, j, (guint) p);
      for (int p = 0; p < 3; p++)
        sum += angle_at (b->x, n[p], j, n[(p + 1) % 3]) * 180.0 / G_PI;
      if (sum < QV_INTERNAL_PLANAR_SUM)
        continue;
      /* The out atom is the first neighbour whose other two do not make a
         near-linear angle (the s-vectors divide by sin φ_1). */
      for (int p = 0; p < 3 && start < 0; p++)
        if (angle_at (b->x, n[(p + 1) % 3], j, n[(p + 2) % 3]) * 180.0 / G_PI
            <= QV_INTERNAL_LINEAR_ANGLE)
          start = p;
      if (start < 0)
        continue;
      {
        guint32 i = n[(start + 1) % 3], k = n[(start + 2) % 3];
        guint32 a[4] = { n[start], j, MIN (i, k), MAX (i, k) };
        guint32 plane[3] = { a[2], a[1], a[3] };
        g_autofree char *out = atom_name (b->s, a[0]);
        g_autofree char *pl = chain_name (b->s, plane, 3);
        QvInternalCoordinate *c = push (b, QV_INTERNAL_OUT_OF_PLANE, a, 4);
        c->name = g_strdup_printf ("%s out of %s", out, pl);
        c->family = g_strdup_printf ("out-of-plane at %s", symbol_of (b->s, j));
      }
    }
}

QvInternalCoordinates *
qv_internal_coordinates_new (const QvStructure *structure, double tolerance, GError **error)
{
  QvInternalCoordinates *ic;
  Builder b = { 0 };
  g_autofree QvBond *bonds = NULL;
  gsize n_bonds = 0, n = structure->n_atoms;

  if (n == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the structure has no atoms");
      return NULL;
    }
  if (!(tolerance >= 0.0 && tolerance < 10.0))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "bond tolerance %g is out of range; use a fraction such as %.2f",
                   tolerance, QV_BONDS_DEFAULT_TOLERANCE);
      return NULL;
    }
  b.s = structure;
  b.x = g_new (double, 3 * n);
  for (gsize a = 0; a < n; a++)
    memcpy (b.x + 3 * a, structure->atoms[a].position, 3 * sizeof (double));
  bonds = qv_bonds_perceive (structure, tolerance, &n_bonds);
  b.coords = g_array_new (FALSE, TRUE, sizeof (QvInternalCoordinate));
  b.notes = g_ptr_array_new ();
  b.nbr = g_new (GArray *, n);
  for (gsize a = 0; a < n; a++)
    b.nbr[a] = g_array_new (FALSE, FALSE, sizeof (guint32));
  for (gsize i = 0; i < n_bonds; i++)
    {
      g_array_append_val (b.nbr[bonds[i].a], bonds[i].b);
      g_array_append_val (b.nbr[bonds[i].b], bonds[i].a);
    }
  /* Bonds come sorted by (a, b), so each list is ascending. */
  if (qv_structure_is_periodic (structure))
    g_ptr_array_add (b.notes, g_strdup ("the structure is periodic: bonds across the cell "
                                        "boundary are not seen, so coordinates through "
                                        "them are missing"));

  add_stretches (&b, bonds, n_bonds);
  add_bends (&b);
  add_torsions (&b, bonds, n_bonds);
  add_out_of_plane (&b);
  if (b.n_linear > MAX_NOTES)
    g_ptr_array_add (b.notes, g_strdup_printf ("and %zu more near-linear angles, each as two "
                                               "linear bends", b.n_linear - MAX_NOTES));
  if (b.n_skipped > MAX_NOTES)
    g_ptr_array_add (b.notes, g_strdup_printf ("and torsions about %zu more bonds through "
                                               "near-linear angles are left out",
                                               b.n_skipped - MAX_NOTES));
  g_ptr_array_add (b.notes, NULL);

  ic = g_new0 (QvInternalCoordinates, 1);
  ic->n_atoms = n;
  ic->n_coordinates = b.coords->len;
  ic->coordinates = (QvInternalCoordinate *) g_array_free (b.coords, FALSE);
  ic->notes = (char **) g_ptr_array_free (b.notes, FALSE);
  ic->b_matrix = g_new0 (double, MAX (ic->n_coordinates, 1) * 3 * n);
  for (gsize i = 0; i < ic->n_coordinates; i++)
    ic->coordinates[i].value = qv_internal_coordinate_evaluate (&ic->coordinates[i], b.x, n,
                                                                ic->b_matrix + i * 3 * n);
  for (gsize a = 0; a < n; a++)
    g_array_free (b.nbr[a], TRUE);
  g_free (b.nbr);
  g_free (b.x);
  return ic;
}

void
qv_internal_coordinates_free (QvInternalCoordinates *ic)
{
  if (ic == NULL)
    return;
  for (gsize i = 0; i < ic->n_coordinates; i++)
    {
      g_free (ic->coordinates[i].name);
      g_free (ic->coordinates[i].family);
    }
  g_free (ic->coordinates);
  g_free (ic->b_matrix);
  g_strfreev (ic->notes);
  g_free (ic);
}

const double *
qv_internal_coordinates_b_row (const QvInternalCoordinates *ic, gsize i)
{
  g_return_val_if_fail (i < ic->n_coordinates, NULL);
  return ic->b_matrix + i * 3 * ic->n_atoms;
}

gsize
qv_internal_coordinates_count (const QvInternalCoordinates *ic, QvInternalKind kind)
{
  gsize count = 0;

  for (gsize i = 0; i < ic->n_coordinates; i++)
    count += ic->coordinates[i].kind == kind;
  return count;
}
