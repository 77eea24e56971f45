/* quaver.c — entry point. Headless commands are dispatched here, before
 * anything graphical exists (no display or D-Bus needed on cluster nodes).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <locale.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-cli-distributed.h"
#include "qv-config.h"
#ifdef QV_HAVE_GUI
#include "qv-gui.h"
#endif

typedef struct {
  const char *name;
  int (*run) (int argc, char **argv);
  const char *summary;
} Command;

static const Command commands[] = {
  { "modes", qv_cmd_modes, "solve the normal modes and print the mode table" },
  { "table", qv_cmd_table, "a mode table of chosen columns (text, CSV, Markdown, LaTeX, JSON)" },
  { "displace", qv_cmd_displace, "structures displaced along modes, with a manifest" },
  { "ensemble", qv_cmd_ensemble, "thermally sampled structures with velocities (Wigner)" },
  { "stencil", qv_cmd_stencil, "displaced structures for a Hessian from forces" },
  { "collect", qv_cmd_collect, "assemble the Hessian from a stencil's forces" },
  { "bands", qv_cmd_bands, "phonon dispersion along a path from a supercell Hessian" },
  { "dos", qv_cmd_dos, "phonon density of states (total, per element) on a q mesh" },
  { "thermo", qv_cmd_thermo, "thermal properties, U tensors, sound velocities of a crystal" },
  { "frozen-phonon", qv_cmd_frozen, "a supercell displaced along one lattice mode at a commensurate q" },
  { "spectrum", qv_cmd_spectrum, "IR and Raman intensities and the broadened spectrum (CSV, JSON, PNG, SVG)" },
  { "compare", qv_cmd_compare, "overlap and best matching of two mode sets; Duschinsky J and K" },
  { "convert", qv_cmd_convert, "a Hessian rewritten as NumPy .npy (float64, C order) for --distributed" },
  { "anharmonic", qv_cmd_anharmonic, "anharmonic levels on the energies of a scan or two-mode grid (sinc DVR)" },
#ifdef QV_HAVE_RENDER
  { "picture", qv_cmd_picture, "a picture (PNG, SVG) or animation (GIF, XYZ) of a mode" },
#endif
};

static void
print_usage (FILE *out)
{
  fprintf (out,
           "Usage: quaver COMMAND [OPTION…] [FILE…]\n"
#ifdef QV_HAVE_GUI
           "       quaver [FILE…]       open the desktop app (with FILE, or a welcome page)\n"
           "       quaver --demo        open the desktop app on the built-in demo\n"
#else
           "       quaver FILE          open FILE in the desktop app (not in this build)\n"
#endif
           "\n"
           "Normal modes from a geometry and its Hessian: frequencies, reduced masses,\n"
           "turning points, rigid-body diagnostics.\n"
           "\n"
           "Commands:\n");
  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    fprintf (out, "  %-13s  %s\n", commands[i].name, commands[i].summary);
  fprintf (out,
           "\n"
           "Run 'quaver COMMAND --help' for a command's options and examples.\n"
           "Try: quaver modes --demo\n"
           "\n"
           "Results are harmonic approximations; validate them before you rely on them.\n");
}

int
main (int argc, char **argv)
{
  /* Messages follow the user's locale; numbers are always read and
   * written with the C conventions (g_ascii_* everywhere). */
  setlocale (LC_ALL, "");
  setlocale (LC_NUMERIC, "C");

#ifdef QV_HAVE_GUI
  if (argc < 2)
    return qv_gui_run (argc, argv);
#endif
  if (argc < 2)
    {
      print_usage (stderr);
      fprintf (stderr, "\nquaver: the desktop app is not part of this build yet; "
                       "use a command such as 'quaver modes --demo'\n");
      return QV_EXIT_USAGE;
    }
  if (strcmp (argv[1], "--help") == 0 || strcmp (argv[1], "-h") == 0 || strcmp (argv[1], "help") == 0)
    {
      if (argc > 2 && strcmp (argv[1], "help") == 0)
        for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
          if (strcmp (argv[2], commands[i].name) == 0)
            {
              char *args[] = { argv[2], (char *) "--help", NULL };
              return commands[i].run (2, args);
            }
      print_usage (stdout);
      return QV_EXIT_OK;
    }
  if (strcmp (argv[1], "--version") == 0)
    {
      printf ("quaver %s\n", QV_VERSION);
      return QV_EXIT_OK;
    }
  for (gsize i = 0; i < G_N_ELEMENTS (commands); i++)
    if (strcmp (argv[1], commands[i].name) == 0)
      {
        /* Under mpirun every rank runs the command; MPI starts before the
         * options are parsed so that only rank 0 speaks. */
        if (qv_cli_distributed_requested (argc, argv))
          {
            g_autoptr(GError) error = NULL;

            if (!qv_cli_distributed_begin (&argc, &argv, &error))
              return qv_cli_fail (commands[i].name, error);
            return qv_cli_distributed_end (commands[i].run (argc - 1, argv + 1));
          }
        return commands[i].run (argc - 1, argv + 1);
      }

#ifdef QV_HAVE_GUI
  /* Not a command: the app, with files and --demo only. Anything else is
   * refused here, before a display or a bus is touched. */
  for (int i = 1; i < argc; i++)
    if (argv[i][0] == '-' && strcmp (argv[i], "--demo") != 0)
      {
        fprintf (stderr, "quaver: unknown option '%s'\nTry 'quaver --help'.\n", argv[i]);
        return QV_EXIT_USAGE;
      }
    else if (argv[i][0] != '-' && !g_file_test (argv[i], G_FILE_TEST_EXISTS))
      {
        fprintf (stderr, "quaver: '%s' is neither a command nor a file\nTry 'quaver --help'.\n", argv[i]);
        return QV_EXIT_USAGE;
      }
  return qv_gui_run (argc, argv);
#endif
  if (argv[1][0] == '-')
    fprintf (stderr, "quaver: unknown option '%s'\n", argv[1]);
  else if (g_file_test (argv[1], G_FILE_TEST_EXISTS))
    fprintf (stderr, "quaver: the desktop app is not part of this build yet; "
                     "to see the modes of %s run 'quaver modes %s'\n", argv[1], argv[1]);
  else
    fprintf (stderr, "quaver: '%s' is neither a command nor a file\n", argv[1]);
  fprintf (stderr, "Try 'quaver --help'.\n");
  return QV_EXIT_USAGE;
}
