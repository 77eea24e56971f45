/* qv-element.h — elements 1–118 and the isotopes users substitute.
 * All data lives in one table in qv-element.c.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  guint z;
  const char *symbol;            /* "C", "Cl" */
  const char *name;              /* English name, "carbon" */
  guint mass_number;             /* most abundant isotope; for elements with no
                                    natural isotopic composition, the
                                    longest-lived one */
  double isotope_mass;           /* u, mass of that isotope (NIST, AME2016);
                                    approximate for Z >= 95 */
  gboolean stable;               /* TRUE when the element has a natural
                                    isotopic composition (CIAAW): the 84
                                    elements 1-83 less Tc and Pm, plus Th,
                                    Pa, U (long-lived, not strictly stable).
                                    FALSE when mass_number is the
                                    longest-lived radioactive isotope */
  double standard_weight;        /* u, IUPAC CIAAW conventional/abridged value;
                                    NAN when the element has none */
  double covalent_radius;        /* Å, Cordero et al. 2008; NAN where none */
} QvElement;

typedef struct {
  guint z;
  guint mass_number;
  double mass;                   /* u */
  double abundance;              /* natural abundance as a fraction 0–1;
                                    0 for isotopes absent in nature (3H) */
} QvIsotope;

#define QV_ELEMENT_MAX_Z 118

/* NULL when z is outside 1..118. */
const QvElement *qv_element_from_z (guint z);

/* Case-insensitive ("CL", "cl", "Cl"); NULL when unknown. Only element
 * symbols: "D" and "T" are the readers' business, not this table's. */
const QvElement *qv_element_from_symbol (const char *symbol);

/* The substitution isotope table (every isotope that is the most abundant of
 * its element, plus 2H, 3H, 13C, 15N, 17O, 18O, 33S, 34S, 37Cl, 81Br, …).
 * NULL when (z, mass_number) is not in it. */
const QvIsotope *qv_isotope_lookup (guint z, guint mass_number);

/* The whole isotope table, sorted by z then mass number. */
const QvIsotope *qv_isotope_table (gsize *n_isotopes);

G_END_DECLS
