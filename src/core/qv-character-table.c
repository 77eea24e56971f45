/* qv-character-table.c — reads data/character-tables.txt (embedded at build
 * time as a C string by qv-symmetry-embed.py) and reduces representations.
 * Source of the tables: F. A. Cotton, Chemical Applications of Group
 * Theory, 3rd ed. (Wiley, 1990), Appendix IIA, typed from memory; the direct
 * products (Dnh = Dn × Cs or × Ci, …) follow the book's own construction.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "qv-character-table.h"
#include "qv-error.h"

extern const char qv_character_tables_data[];

typedef struct {
  char *label;
  double *chi;
  char *linear, *quadratic;       /* as written */
  char **lin_items, **quad_items; /* split at top-level commas */
  gboolean ir, raman, rotation;
} Irrep;

struct _QvCharacterTable {
  char *name;
  gsize n_classes;
  char **tokens;
  guint *sizes;
  double *matrices;               /* 9 per class */
  gsize n_irreps;
  Irrep *irreps;
  gsize order;
};

static GPtrArray *tables;         /* QvCharacterTable *, never freed */
static const char **names;

/* --- matrices of the class tokens ---------------------------------------- */

static void
m_rot (const double *u_in, double angle, double *r)
{
  double u[3] = { u_in[0], u_in[1], u_in[2] };
  double n = sqrt (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
  u[0] /= n; u[1] /= n; u[2] /= n;
  double c = cos (angle), s = sin (angle), t = 1 - c, x = u[0], y = u[1], z = u[2];
  double m[9] = { t * x * x + c, t * x * y - s * z, t * x * z + s * y,
                  t * x * y + s * z, t * y * y + c, t * y * z - s * x,
                  t * x * z - s * y, t * y * z + s * x, t * z * z + c };
  memcpy (r, m, sizeof m);
}

static void
m_refl (const double *u_in, double *r)
{
  double u[3] = { u_in[0], u_in[1], u_in[2] };
  double n = sqrt (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      r[3 * i + j] = (i == j) - 2 * u[i] * u[j] / (n * n);
}

static void
m_mul (const double *a, const double *b, double *c)
{
  double t[9];
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      t[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  memcpy (c, t, sizeof t);
}

typedef enum { KIND_AXIAL, KIND_CUBIC, KIND_ICO } Kind;

/* The group's kind, principal order and whether it is a Dnd, from its name. */
static void
name_kind (const char *name, Kind *kind, guint *n, gboolean *dnd)
{
  *kind = KIND_AXIAL;
  *n = 1;
  *dnd = FALSE;
  if (name[0] == 'T' || name[0] == 'O')
    *kind = KIND_CUBIC;
  else if (name[0] == 'I')
    *kind = KIND_ICO;
  else if (g_ascii_isdigit (name[1]))
    {
      char *end;
      *n = (guint) strtoul (name + 1, &end, 10);
      *dnd = name[0] == 'D' && strcmp (end, "d") == 0;
    }
}

static gboolean
token_matrix (const char *tok, Kind kind, guint n, gboolean dnd, double *r)
{
  static const double ex[3] = { 1, 0, 0 }, ey[3] = { 0, 1, 0 }, ez[3] = { 0, 0, 1 };
  const double phi = (1 + sqrt (5.0)) / 2;
  const double d111[3] = { 1, 1, 1 }, d110[3] = { 1, 1, 0 }, d1m10[3] = { 1, -1, 0 };
  const double d5[3] = { 0, 1, phi };

  if (strcmp (tok, "E") == 0)
    m_rot (ez, 0, r);
  else if (strcmp (tok, "i") == 0)
    {
      m_rot (ez, 0, r);
      for (int k = 0; k < 9; k++)
        r[k] = -r[k];
    }
  else if (strcmp (tok, "sh") == 0)
    m_refl (ez, r);
  else if (strcmp (tok, "sv(xz)") == 0 || strcmp (tok, "sv") == 0)
    m_refl (ey, r);
  else if (strcmp (tok, "sv(yz)") == 0)
    m_refl (ex, r);
  else if (strcmp (tok, "C2(z)") == 0)
    m_rot (ez, G_PI, r);
  else if (strcmp (tok, "C2(y)") == 0)
    m_rot (ey, G_PI, r);
  else if (strcmp (tok, "C2(x)") == 0)
    m_rot (ex, G_PI, r);
  else if (strcmp (tok, "C2'") == 0)
    m_rot (kind == KIND_CUBIC ? d110 : ex, G_PI, r);
  else if (strcmp (tok, "C2''") == 0)
    {
      double a = G_PI / n, u[3] = { cos (a), sin (a), 0 };
      m_rot (u, G_PI, r);
    }
  else if (strcmp (tok, "sd") == 0)
    {
      if (kind == KIND_CUBIC)
        m_refl (d1m10, r);
      else
        {
          double a = dnd ? G_PI / (2 * n) : G_PI / n, u[3] = { -sin (a), cos (a), 0 };
          m_refl (u, r);
        }
    }
  else if (tok[0] == 'C' || tok[0] == 'S')
    {
      char *end;
      unsigned long m = strtoul (tok + 1, &end, 10), k = 1;
      if (m < 2 || m > 64)
        return FALSE;
      if (*end == '^')
        k = strtoul (end + 1, &end, 10);
      if (*end != '\0' || k < 1 || k >= m)
        return FALSE;
      const double *u = ez;
      if (tok[0] == 'C' && kind == KIND_CUBIC && m == 3)
        u = d111;
      else if (tok[0] == 'C' && kind == KIND_ICO)
        u = m == 5 ? d5 : m == 3 ? d111 : ez;
      m_rot (u, 2 * G_PI * (double) k / (double) m, r);
      if (tok[0] == 'S')
        {
          double s[9];
          if (k % 2 == 0)
            return FALSE;
          m_refl (u, s);
          m_mul (s, r, r);
        }
    }
  else
    return FALSE;
  return TRUE;
}

/* --- parsing -------------------------------------------------------------- */

static gboolean
parse_error (GError **error, guint line, const char *what)
{
  g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "character-tables.txt:%u: %s", line, what);
  return FALSE;
}

static gboolean
parse_character (const char *s, double *out)
{
  char *end;
  if (strncmp (s, "2cos(", 5) == 0 || strncmp (s, "-2cos(", 6) == 0)
    {
      double sign = s[0] == '-' ? -1 : 1;
      const char *p = s + (s[0] == '-' ? 6 : 5);
      long k = strtol (p, &end, 10);
      if (*end != '/')
        return FALSE;
      long m = strtol (end + 1, &end, 10);
      if (m <= 0 || strcmp (end, ")") != 0)
        return FALSE;
      *out = sign * 2 * cos (2 * G_PI * (double) k / (double) m);
      return TRUE;
    }
  *out = g_ascii_strtod (s, &end);
  return end != s && *end == '\0';
}

/* Splits at commas outside parentheses; trims; drops empties. */
static char **
split_items (const char *s)
{
  GPtrArray *out = g_ptr_array_new ();
  GString *cur = g_string_new (NULL);
  int depth = 0;
  for (const char *p = s;; p++)
    {
      if (*p == '\0' || (*p == ',' && depth == 0))
        {
          char *t = g_strstrip (g_strdup (cur->str));
          if (*t)
            g_ptr_array_add (out, t);
          else
            g_free (t);
          g_string_truncate (cur, 0);
          if (*p == '\0')
            break;
          continue;
        }
      depth += *p == '(';
      depth -= *p == ')';
      g_string_append_c (cur, *p);
    }
  g_string_free (cur, TRUE);
  g_ptr_array_add (out, NULL);
  return (char **) g_ptr_array_free (out, FALSE);
}

static gboolean
item_is_rotation (const char *it)
{
  return it[0] == 'R' || (it[0] == '(' && it[1] == 'R');
}

static gboolean
item_is_linear (const char *it)
{
  /* x, y, z, (x,y), (x,y,z) */
  gboolean letter = FALSE;
  for (const char *p = it; *p; p++)
    {
      if (*p == 'x' || *p == 'y' || *p == 'z')
        {
          if (letter)
            return FALSE;
          letter = TRUE;
        }
      else if (*p == ',' || *p == ')' || *p == '(')
        letter = FALSE;
      else
        return FALSE;
    }
  return TRUE;
}

/* Parity of a function under z → −z: the power of z in its first term. */
static gboolean
item_odd_in_z (const char *it, gboolean rotation)
{
  const char *p = it + (it[0] == '(');
  if (rotation)
    return p[1] != 'z';        /* Rz even, Rx and Ry odd */
  int power = 0;
  for (; *p && *p != ',' && *p != ')' && *p != '+' && *p != '-'; p++)
    if (*p == 'z')
      power += p[1] == '2' ? 2 : 1;
  return power % 2 == 1;
}

static void
irrep_flags (Irrep *ir)
{
  ir->ir = ir->raman = ir->rotation = FALSE;
  for (char **it = ir->lin_items; *it; it++)
    {
      if (item_is_rotation (*it))
        ir->rotation = TRUE;
      else if (item_is_linear (*it))
        ir->ir = TRUE;
    }
  ir->raman = ir->quad_items[0] != NULL;
}

static QvCharacterTable *
find_table (const char *name)
{
  for (guint i = 0; tables && i < tables->len; i++)
    {
      QvCharacterTable *t = tables->pdata[i];
      if (strcmp (t->name, name) == 0)
        return t;
    }
  return NULL;
}

static gboolean
finish_table (QvCharacterTable *t, guint line, GError **error)
{
  gsize order = 0;
  for (gsize c = 0; c < t->n_classes; c++)
    order += t->sizes[c];
  t->order = order;
  /* orthogonality of the rows, Σ_c h_c χ_i χ_j = 0 (i ≠ j) */
  for (gsize i = 0; i < t->n_irreps; i++)
    for (gsize j = 0; j < i; j++)
      {
        double s = 0;
        for (gsize c = 0; c < t->n_classes; c++)
          s += t->sizes[c] * t->irreps[i].chi[c] * t->irreps[j].chi[c];
        if (fabs (s) > 1e-6 * (double) order)
          {
            g_autofree char *m = g_strdup_printf ("table %s: rows %s and %s are not orthogonal",
                                                  t->name, t->irreps[i].label, t->irreps[j].label);
            return parse_error (error, line, m);
          }
      }
  return TRUE;
}

static char *
join_items (char **items)
{
  return g_strjoinv (", ", items);
}

static gboolean
make_product (const char *name, const char *a_name, const char *b_name, guint line, GError **error)
{
  QvCharacterTable *a = find_table (a_name), *b = find_table (b_name);
  if (a == NULL || b == NULL || b->n_classes != 2)
    return parse_error (error, line, "product: the factors must be tables above, the second Ci or Cs");
  gboolean by_i = strcmp (b_name, "Ci") == 0;
  QvCharacterTable *t = g_new0 (QvCharacterTable, 1);
  t->name = g_strdup (name);
  t->n_classes = 2 * a->n_classes;
  t->tokens = g_new0 (char *, t->n_classes + 1);
  t->sizes = g_new (guint, t->n_classes);
  t->matrices = g_new (double, 9 * t->n_classes);
  for (gsize k = 0; k < 2; k++)
    for (gsize c = 0; c < a->n_classes; c++)
      {
        gsize o = k * a->n_classes + c;
        t->tokens[o] = k == 0 ? g_strdup (a->tokens[c])
                     : strcmp (a->tokens[c], "E") == 0 ? g_strdup (b->tokens[1])
                     : g_strdup_printf ("%s*%s", b->tokens[1], a->tokens[c]);
        t->sizes[o] = a->sizes[c];
        m_mul (b->matrices + 9 * k, a->matrices + 9 * c, t->matrices + 9 * o);
      }
  t->n_irreps = 2 * a->n_irreps;
  t->irreps = g_new0 (Irrep, t->n_irreps);
  for (gsize k = 0; k < 2; k++)
    for (gsize i = 0; i < a->n_irreps; i++)
      {
        Irrep *ir = &t->irreps[k * a->n_irreps + i], *ai = &a->irreps[i];
        const char *suffix = b->irreps[k].label + 1;   /* g, u, ', '' */
        ir->label = g_strconcat (ai->label, suffix, NULL);
        ir->chi = g_new (double, t->n_classes);
        for (gsize kk = 0; kk < 2; kk++)
          for (gsize c = 0; c < a->n_classes; c++)
            ir->chi[kk * a->n_classes + c] = ai->chi[c] * b->irreps[k].chi[kk];
        /* each function goes to the row of its parity under i or σh */
        GPtrArray *lin = g_ptr_array_new (), *quad = g_ptr_array_new ();
        for (char **it = ai->lin_items; *it; it++)
          {
            gboolean rot = item_is_rotation (*it);
            gboolean odd = by_i ? !rot : item_odd_in_z (*it, rot);
            if (odd == (k == 1))
              g_ptr_array_add (lin, g_strdup (*it));
          }
        for (char **it = ai->quad_items; *it; it++)
          {
            gboolean odd = by_i ? FALSE : item_odd_in_z (*it, FALSE);
            if (odd == (k == 1))
              g_ptr_array_add (quad, g_strdup (*it));
          }
        g_ptr_array_add (lin, NULL);
        g_ptr_array_add (quad, NULL);
        ir->lin_items = (char **) g_ptr_array_free (lin, FALSE);
        ir->quad_items = (char **) g_ptr_array_free (quad, FALSE);
        ir->linear = join_items (ir->lin_items);
        ir->quadratic = join_items (ir->quad_items);
        irrep_flags (ir);
      }
  g_ptr_array_add (tables, t);
  return finish_table (t, line, error);
}

static gboolean
parse_row (QvCharacterTable *t, QvCharacterTable *sub, const char *text, guint line, GError **error)
{
  g_auto(GStrv) parts = g_strsplit (text, "|", 3);
  Irrep ir = { 0 };
  ir.chi = g_new0 (double, t->n_classes);
  if (sub)
    {
      /* LABEL = H1 + H2 */
      g_auto(GStrv) lhs = g_strsplit (parts[0], "=", 2);
      if (lhs[1] == NULL)
        {
          g_free (ir.chi);
          return parse_error (error, line, "a linear group's row is LABEL = SPECIES + SPECIES | … | …");
        }
      ir.label = g_strstrip (g_strdup (lhs[0]));
      g_auto(GStrv) terms = g_strsplit (lhs[1], "+", -1);
      for (char **p = terms; *p; p++)
        {
          char *w = g_strstrip (*p);
          gsize i;
          for (i = 0; i < sub->n_irreps && strcmp (sub->irreps[i].label, w) != 0; i++)
            ;
          if (i == sub->n_irreps)
            {
              g_free (ir.chi);
              g_free (ir.label);
              return parse_error (error, line, "unknown species of the subgroup");
            }
          for (gsize c = 0; c < t->n_classes; c++)
            ir.chi[c] += sub->irreps[i].chi[c];
        }
    }
  else
    {
      g_auto(GStrv) words = g_strsplit_set (g_strstrip (parts[0]), " \t", -1);
      gsize w = 0, c = 0;
      for (char **p = words; *p; p++)
        {
          if (**p == '\0')
            continue;
          if (w++ == 0)
            ir.label = g_strdup (*p);
          else if (c >= t->n_classes || !parse_character (*p, &ir.chi[c++]))
            {
              g_free (ir.chi);
              g_free (ir.label);
              return parse_error (error, line, "a character is not a number or 2cos(k/n), or too many");
            }
        }
      if (c != t->n_classes)
        {
          g_free (ir.chi);
          g_free (ir.label);
          return parse_error (error, line, "fewer characters than classes");
        }
    }
  ir.lin_items = split_items (parts[0] && parts[1] ? parts[1] : "");
  ir.quad_items = split_items (parts[0] && parts[1] && parts[2] ? parts[2] : "");
  ir.linear = join_items (ir.lin_items);
  ir.quadratic = join_items (ir.quad_items);
  irrep_flags (&ir);
  t->irreps = g_renew (Irrep, t->irreps, t->n_irreps + 1);
  t->irreps[t->n_irreps++] = ir;
  return TRUE;
}

static gboolean
parse_all (GError **error)
{
  g_auto(GStrv) lines = g_strsplit (qv_character_tables_data, "\n", -1);
  QvCharacterTable *t = NULL, *sub = NULL;
  Kind kind = KIND_AXIAL;
  guint n = 1;
  gboolean dnd = FALSE;
  tables = g_ptr_array_new ();
  for (guint ln = 0; lines[ln]; ln++)
    {
      guint line = ln + 1;
      char *s = g_strstrip (lines[ln]);
      if (*s == '\0' || *s == '#')
        continue;
      if (g_str_has_prefix (s, "table "))
        {
          g_auto(GStrv) w = g_strsplit_set (s + 6, " \t", -1);
          if (t)
            return parse_error (error, line, "table inside a table (missing 'end')");
          t = g_new0 (QvCharacterTable, 1);
          t->name = g_strdup (g_strstrip (w[0]));
          sub = NULL;
          for (char **p = w + 1; *p; p++)
            if (strcmp (*p, "subgroup") == 0 && p[1])
              sub = find_table (p[1]);
          if (strstr (s, "subgroup") && sub == NULL)
            return parse_error (error, line, "the subgroup must be a table above");
          name_kind (t->name, &kind, &n, &dnd);
          if (sub)
            {
              t->n_classes = sub->n_classes;
              t->tokens = g_strdupv (sub->tokens);
              t->sizes = g_memdup2 (sub->sizes, sizeof (guint) * sub->n_classes);
              t->matrices = g_memdup2 (sub->matrices, sizeof (double) * 9 * sub->n_classes);
            }
        }
      else if (g_str_has_prefix (s, "classes "))
        {
          if (t == NULL || t->n_classes)
            return parse_error (error, line, "'classes' outside a table or twice");
          g_auto(GStrv) w = g_strsplit_set (s + 8, " \t", -1);
          GPtrArray *toks = g_ptr_array_new ();
          GArray *sizes = g_array_new (FALSE, FALSE, sizeof (guint));
          GArray *mats = g_array_new (FALSE, FALSE, sizeof (double) * 9);
          for (char **p = w; *p; p++)
            {
              if (**p == '\0')
                continue;
              char *end;
              guint count = 1;
              if (g_ascii_isdigit (**p))
                count = (guint) strtoul (*p, &end, 10);
              else
                end = *p;
              double m[9];
              if (!token_matrix (end, kind, n, dnd, m))
                {
                  g_ptr_array_free (toks, TRUE);
                  g_array_free (sizes, TRUE);
                  g_array_free (mats, TRUE);
                  return parse_error (error, line, "unknown class token");
                }
              g_ptr_array_add (toks, g_strdup (end));
              g_array_append_val (sizes, count);
              g_array_append_vals (mats, m, 1);
            }
          t->n_classes = toks->len;
          g_ptr_array_add (toks, NULL);
          t->tokens = (char **) g_ptr_array_free (toks, FALSE);
          t->sizes = (guint *) g_array_free (sizes, FALSE);
          t->matrices = (double *) g_array_free (mats, FALSE);
        }
      else if (strcmp (s, "end") == 0)
        {
          if (t == NULL || t->n_irreps == 0)
            return parse_error (error, line, "'end' without a table with rows");
          g_ptr_array_add (tables, t);
          if (!finish_table (t, line, error))
            return FALSE;
          t = NULL;
        }
      else if (g_str_has_prefix (s, "product "))
        {
          char name[32], a[32], x[4], b[32], eq[4];
          if (t || sscanf (s + 8, "%31s %3s %31s %3s %31s", name, eq, a, x, b) != 5
              || strcmp (eq, "=") != 0 || strcmp (x, "x") != 0)
            return parse_error (error, line, "product NAME = A x Ci (or Cs)");
          if (!make_product (name, a, b, line, error))
            return FALSE;
        }
      else
        {
          if (t == NULL || t->n_classes == 0)
            return parse_error (error, line, "a row outside a table, or before 'classes'");
          if (!parse_row (t, sub, s, line, error))
            return FALSE;
        }
    }
  if (t)
    return parse_error (error, 0, "the last table has no 'end'");
  names = g_new0 (const char *, tables->len + 1);
  for (guint i = 0; i < tables->len; i++)
    names[i] = ((QvCharacterTable *) tables->pdata[i])->name;
  return TRUE;
}

static void
ensure_loaded (void)
{
  static gsize once = 0;
  if (g_once_init_enter (&once))
    {
      g_autoptr(GError) error = NULL;
      if (!parse_all (&error))
        g_error ("built-in character tables: %s", error->message);  /* a build defect */
      g_once_init_leave (&once, 1);
    }
}

const QvCharacterTable *
qv_character_table_lookup (const char *group)
{
  ensure_loaded ();
  return group ? find_table (group) : NULL;
}

const char *const *
qv_character_table_names (void)
{
  ensure_loaded ();
  return names;
}

const char *qv_character_table_name (const QvCharacterTable *t) { return t->name; }
gsize qv_character_table_order (const QvCharacterTable *t) { return t->order; }
gsize qv_character_table_n_classes (const QvCharacterTable *t) { return t->n_classes; }
const char *qv_character_table_class_token (const QvCharacterTable *t, gsize c) { return t->tokens[c]; }
guint qv_character_table_class_size (const QvCharacterTable *t, gsize c) { return t->sizes[c]; }
const double *qv_character_table_class_matrix (const QvCharacterTable *t, gsize c) { return t->matrices + 9 * c; }
gsize qv_character_table_n_irreps (const QvCharacterTable *t) { return t->n_irreps; }
const char *qv_character_table_label (const QvCharacterTable *t, gsize i) { return t->irreps[i].label; }
double qv_character_table_character (const QvCharacterTable *t, gsize i, gsize c) { return t->irreps[i].chi[c]; }
const char *qv_character_table_linear (const QvCharacterTable *t, gsize i) { return t->irreps[i].linear; }
const char *qv_character_table_quadratic (const QvCharacterTable *t, gsize i) { return t->irreps[i].quadratic; }
gboolean qv_character_table_ir_active (const QvCharacterTable *t, gsize i) { return t->irreps[i].ir; }
gboolean qv_character_table_raman_active (const QvCharacterTable *t, gsize i) { return t->irreps[i].raman; }
gboolean qv_character_table_rotation (const QvCharacterTable *t, gsize i) { return t->irreps[i].rotation; }

/* --- classes of a detected group --------------------------------------------- */

static gssize
find_op (const double *ops, gsize order, const double *m)
{
  for (gsize k = 0; k < order; k++)
    {
      gboolean same = TRUE;
      for (int i = 0; i < 9 && same; i++)
        same = fabs (ops[9 * k + i] - m[i]) < 1e-6;
      if (same)
        return (gssize) k;
    }
  return -1;
}

gboolean
qv_character_table_classify (const QvCharacterTable *t, const QvPointGroup *g, gsize *class_of_op,
                             GError **error)
{
  gsize order = g->order;
  g_autofree double *std = g_new (double, 9 * order);
  /* R_std = F R Fᵀ */
  for (gsize k = 0; k < order; k++)
    {
      const double *r = g->operations + 9 * k;
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          {
            double s = 0;
            for (int a = 0; a < 3; a++)
              for (int b = 0; b < 3; b++)
                s += g->frame[i][a] * r[3 * a + b] * g->frame[j][b];
            std[9 * k + 3 * i + j] = s;
          }
    }
  if (t->order != order)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "character table %s has order %" G_GSIZE_FORMAT
                   ", the group %s %" G_GSIZE_FORMAT, t->name, t->order, g->name, order);
      return FALSE;
    }
  for (gsize k = 0; k < order; k++)
    class_of_op[k] = G_MAXSIZE;
  for (gsize c = 0; c < t->n_classes; c++)
    {
      gssize rep = find_op (std, order, t->matrices + 9 * c);
      if (rep < 0)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "group %s has no operation %s of its table",
                       g->name, t->tokens[c]);
          return FALSE;
        }
      guint count = 0;
      for (int inverse = 0; inverse < 2; inverse++)
        {
          double r[9];
          for (int i = 0; i < 3; i++)
            for (int j = 0; j < 3; j++)
              r[3 * i + j] = inverse ? std[9 * rep + 3 * j + i] : std[9 * rep + 3 * i + j];
          for (gsize h = 0; h < order; h++)
            {
              double hr[9], hrh[9], ht[9];
              const double *hm = std + 9 * h;
              for (int i = 0; i < 3; i++)
                for (int j = 0; j < 3; j++)
                  ht[3 * i + j] = hm[3 * j + i];
              m_mul (hm, r, hr);
              m_mul (hr, ht, hrh);
              gssize k = find_op (std, order, hrh);
              if (k < 0)
                {
                  g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "group %s is not closed", g->name);
                  return FALSE;
                }
              if (class_of_op[k] == G_MAXSIZE)
                {
                  class_of_op[k] = c;
                  count++;
                }
              else if (class_of_op[k] != c)
                {
                  g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s: classes %s and %s overlap",
                               t->name, t->tokens[class_of_op[k]], t->tokens[c]);
                  return FALSE;
                }
            }
        }
      if (count != t->sizes[c])
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s: class %s has %u operations, the table says %u",
                       t->name, t->tokens[c], count, t->sizes[c]);
          return FALSE;
        }
    }
  return TRUE;
}

void
qv_character_table_reduce (const QvCharacterTable *t, const QvPointGroup *g, const gsize *class_of_op,
                           const double *chi, double *out)
{
  for (gsize i = 0; i < t->n_irreps; i++)
    {
      double num = 0, den = 0;
      for (gsize k = 0; k < g->order; k++)
        {
          double ci = t->irreps[i].chi[class_of_op[k]];
          num += ci * chi[k];
          den += ci * ci;
        }
      out[i] = den > 0 ? num / den : 0;
    }
}
