/* test-style.c — the element style table and the colour ramp (no GL).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include "qv-style.h"
#include "qv-style-private.h"

static void
test_table (void **state)
{
  const QvElementStyle *h = qv_style_element (1), *c = qv_style_element (6);
  const QvElementStyle *n = qv_style_element (7), *o = qv_style_element (8);
  const QvElementStyle *s = qv_style_element (16);

  /* Every element, each once (a malformed line would be missing). */
  assert_int_equal (qv_style_table_size (), 118);
  for (guint z = 1; z <= 118; z++)
    assert_true (qv_style_element (z)->radius > 0.1f && qv_style_element (z)->radius < 1.5f);
  /* The trade's usual hues (common practice): H white, C dark grey,
   * N blue, O red, S yellow. */
  assert_true (MIN (h->rgb[0], MIN (h->rgb[1], h->rgb[2])) > 0.9f);
  assert_true (MAX (c->rgb[0], MAX (c->rgb[1], c->rgb[2])) < 0.45f);
  assert_true (fabsf (c->rgb[0] - c->rgb[2]) < 0.1f);
  assert_true (n->rgb[2] > n->rgb[0] + 0.3f && n->rgb[2] > n->rgb[1] + 0.2f);
  assert_true (o->rgb[0] > o->rgb[1] + 0.4f && o->rgb[0] > o->rgb[2] + 0.4f);
  assert_true (s->rgb[0] > 0.8f && s->rgb[1] > 0.7f && s->rgb[2] < 0.4f);
  /* Hydrogen drawn smaller than carbon. */
  assert_true (h->radius < c->radius);
  /* Unknown elements get a neutral grey, not garbage. */
  assert_true (qv_style_element (0)->radius > 0.0f);
  assert_true (qv_style_element (500)->radius > 0.0f);
}

/* OKLab (Ottosson 2020): white is L = 1, a = b = 0 and black L = 0; the
 * round trip returns the colour (from the post's published matrices). */
static void
test_oklab (void **state)
{
  const double white[3] = { 1, 1, 1 }, black[3] = { 0, 0, 0 }, x[3] = { 0.2, 0.6, 0.9 };
  double lab[3], back[3];

  qv_style_srgb_to_oklab (white, lab);
  assert_true (fabs (lab[0] - 1.0) < 1e-4 && fabs (lab[1]) < 1e-4 && fabs (lab[2]) < 1e-4);
  qv_style_srgb_to_oklab (black, lab);
  assert_true (fabs (lab[0]) < 1e-9);
  qv_style_srgb_to_oklab (x, lab);
  assert_true (qv_style_oklab_to_srgb (lab, back));
  for (int k = 0; k < 3; k++)
    assert_true (fabs (back[k] - x[k]) < 1e-6);
}

/* The participation ramp: lightness in OKLab falls in equal steps, and
 * chroma grows (low participation calm, high saturated). */
static void
test_ramp (void **state)
{
  double L[11], C[11];

  for (int i = 0; i <= 10; i++)
    {
      float rgb[3];
      double d[3], lab[3];
      qv_style_ramp (i / 10.0, rgb);
      for (int k = 0; k < 3; k++)
        d[k] = rgb[k];
      qv_style_srgb_to_oklab (d, lab);
      L[i] = lab[0];
      C[i] = hypot (lab[1], lab[2]);
    }
  for (int i = 1; i <= 10; i++)
    {
      /* 8-bit-free float colours: steps equal to 1e-3 of L. */
      assert_true (fabs ((L[i - 1] - L[i]) - (L[0] - L[10]) / 10.0) < 1e-3);
      assert_true (C[i] > C[i - 1]);
    }
  assert_true (L[0] - L[10] > 0.3);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_table),
    cmocka_unit_test (test_oklab),
    cmocka_unit_test (test_ramp),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
