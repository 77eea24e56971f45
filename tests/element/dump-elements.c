/* dump-elements.c — print the element and isotope tables as TSV, for
 * check_elements.py to compare with python3-periodictable.
 *
 * Lines:  E <z> <symbol> <name> <A> <isotope mass> <stable 0|1>
 *           <standard weight> <covalent radius>
 *         I <z> <A> <mass> <abundance>
 * Doubles are printed with 17 significant digits (round-trip exact); NAN
 * prints as "nan".
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <stdlib.h>

#include "qv-element.h"

int
main (void)
{
  const QvIsotope *iso;
  gsize n = 0;

  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      const QvElement *e = qv_element_from_z (z);

      if (e == NULL)
        {
          fprintf (stderr, "dump-elements: no element for z = %u\n", z);
          return EXIT_FAILURE;
        }
      printf ("E\t%u\t%s\t%s\t%u\t%.17g\t%d\t%.17g\t%.17g\n", e->z, e->symbol,
              e->name, e->mass_number, e->isotope_mass, e->stable ? 1 : 0,
              e->standard_weight, e->covalent_radius);
    }
  iso = qv_isotope_table (&n);
  for (gsize i = 0; i < n; i++)
    printf ("I\t%u\t%u\t%.17g\t%.17g\n", iso[i].z, iso[i].mass_number,
            iso[i].mass, iso[i].abundance);
  if (fflush (stdout) != 0 || ferror (stdout))
    {
      perror ("dump-elements: stdout");
      return EXIT_FAILURE;
    }
  return EXIT_SUCCESS;
}
