/* qv-cmd-convert.c — `quaver convert`: any Hessian Quaver reads, rewritten
 * as one NumPy .npy array (1.0, '<f8', C order) for readers that take it in
 * blocks.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-hessian-file.h"
#include "qv-hessian-writer.h"
#include "qv-size.h"
#include "qv-units.h"
#include "qv-xyz.h"

static const char convert_description[] =
  "Reads HESSIAN, a matrix in any form Quaver reads (text: full, lower or upper\n"
  "triangle, numbers separated by spaces or commas, '#' comments; or .npy in\n"
  "either byte order, C or Fortran order), and writes it to OUT as a NumPy\n"
  ".npy file: version 1.0, dtype '<f8', C order, shape (n, n), row i holding\n"
  "H_i1 … H_in. A triangle is written as the symmetric matrix it stands for.\n"
  "\n"
  "It is the serial step before a distributed solve: each process of\n"
  "'mpirun -n P quaver modes … --distributed' reads only its own blocks of the\n"
  "Hessian straight from a .npy file, which a text file cannot offer. Convert\n"
  "a text Hessian once, on one machine, then give the .npy to every run.\n"
  "\n"
  "The values are copied unchanged, bit for bit: .npy has no room for a unit,\n"
  "so keep passing quaver modes the --hessian-units of the original file. With\n"
  "--hessian-units FROM --to-units TO (both or neither) every element is\n"
  "converted from FROM to TO instead, and TO is then the unit to pass.\n"
  "\n"
  "--atoms N or --geometry FILE (XYZ or extended XYZ, the first frame) checks\n"
  "that the Hessian has 3N rows, as quaver modes would; without either, any\n"
  "square size is accepted.\n"
  "\n"
  "Memory: the whole matrix is held, 8n² bytes, and the .npy image written\n"
  "from it as much again (about 16n² bytes in all: 324 MB for n = 4500, 2.3\n"
  "GB for 12000); a size beyond this machine's memory is refused before it is\n"
  "allocated. OUT is written atomically and an existing file only with --force.\n"
  "\n"
  "Examples:\n"
  "  quaver convert big.hess -o big.npy --geometry big.xyz\n"
  "  quaver convert lower.txt -o h.npy --hessian-layout lower --atoms 1500\n"
  "  quaver convert h.txt -o h.npy --hessian-units hartree/bohr^2 --to-units eV/A^2\n"
  "  mpirun -n 64 quaver modes big.xyz --hessian big.npy --hessian-units eV/A^2 "
  "--distributed\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.";


/* The atoms of the first frame of @path, or 0 with @error. */
static gsize
geometry_atoms (const char *path, GError **error)
{
  g_autoptr(GPtrArray) frames = qv_xyz_read_file (path, error);

  if (frames == NULL)
    return 0;
  if (frames->len > 1)
    g_printerr ("quaver: %s has %u frames; using the first\n", path, frames->len);
  return ((const QvStructure *) g_ptr_array_index (frames, 0))->n_atoms;
}

/* The matrix and its .npy image (as large again) at the same time. */
static gboolean
check_memory (gsize n, const char *name, GError **error)
{
  gsize image = 0;
  g_autofree char *what = g_strdup_printf ("a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT
                                           " Hessian and its .npy image", n, n);

  if (qv_size_mul3 (n, n, sizeof (double), &image)
      && qv_size_check_matrix (n, (guint64) image, what, error))
    return TRUE;
  if (error && *error == NULL)
    g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "%s is too large to hold in memory", what);
  g_prefix_error (error, "%s: ", name);
  return FALSE;
}

int
qv_cmd_convert (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvHessian) hessian = NULL;
  char *output = NULL, *geometry = NULL, *layout_arg = NULL;
  char *from_arg = NULL, *to_arg = NULL;
  gint64 atoms = 0;
  gboolean force = FALSE;
  QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;
  QvHessianUnit from = 0, to = 0;
  gsize n = 0;
  gsize out_len;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "The .npy file to write (required)", "OUT.npy" },
    { "atoms", 0, 0, G_OPTION_ARG_INT64, &atoms, "Check that HESSIAN has 3N rows", "N" },
    { "geometry", 0, 0, G_OPTION_ARG_FILENAME, &geometry,
      "Check the size against the atoms of this XYZ file", "FILE" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &layout_arg,
      "Text layout: auto (default), full, lower, upper", "LAYOUT" },
    { "hessian-units", 0, 0, G_OPTION_ARG_STRING, &from_arg,
      "With --to-units: the unit of HESSIAN's values", "UNIT" },
    { "to-units", 0, 0, G_OPTION_ARG_STRING, &to_arg,
      "With --hessian-units: convert the values to this unit", "UNIT" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver convert");
  context = g_option_context_new ("HESSIAN");
  g_option_context_set_summary (context, "A Hessian rewritten as a NumPy .npy file (float64, "
                                "C order), for the distributed solve.");
  g_option_context_set_description (context, convert_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("convert", error);
      goto out;
    }
  if (argc != 2)
    {
      status = qv_cli_fail_usage ("convert", argc < 2 ? "convert needs a HESSIAN file" : "convert takes one HESSIAN, got %d",
                      argc - 1);
      goto out;
    }
  if (output == NULL)
    {
      status = qv_cli_fail_usage ("convert", "convert needs -o OUT.npy");
      goto out;
    }
  if (qv_hessian_write_format_for (output) != QV_HESSIAN_WRITE_NPY)
    {
      status = qv_cli_fail_usage ("convert", "%s: convert writes NumPy .npy only; give the output a name ending in .npy",
                      output);
      goto out;
    }
  if (atoms != 0 && geometry != NULL)
    {
      status = qv_cli_fail_usage ("convert", "give --atoms N or --geometry FILE, not both");
      goto out;
    }
  if (atoms < 0 || (guint64) atoms > G_MAXSIZE / 3)
    {
      status = qv_cli_fail_usage ("convert", "--atoms must be a positive whole number, got %" G_GINT64_FORMAT, atoms);
      goto out;
    }
  if ((from_arg != NULL) != (to_arg != NULL))
    {
      status = qv_cli_fail_usage ("convert", "--hessian-units and --to-units go together: give both to convert the "
                      "values, or neither to copy them unchanged");
      goto out;
    }
  if ((layout_arg && !qv_hessian_layout_parse (layout_arg, &layout, &error))
      || (from_arg && !qv_hessian_unit_parse (from_arg, &from, &error))
      || (to_arg && !qv_hessian_unit_parse (to_arg, &to, &error)))
    {
      status = qv_cli_fail ("convert", error);
      goto out;
    }
  if (layout == QV_HESSIAN_LAYOUT_NPY)
    {
      status = qv_cli_fail_usage ("convert", "--hessian-layout takes auto, full, lower or upper (a .npy input is "
                      "recognised by its contents)");
      goto out;
    }
  /* Before the reading, which may take minutes: an output that would be
   * refused anyway. */
  if (!force && g_file_test (output, G_FILE_TEST_EXISTS))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it", output);
      status = qv_cli_fail ("convert", error);
      goto out;
    }

  if (geometry != NULL)
    {
      gsize n_atoms = geometry_atoms (geometry, &error);

      if (n_atoms == 0)
        {
          if (error == NULL)
            g_set_error (&error, QV_ERROR, QV_ERROR_INPUT, "%s: no atoms", geometry);
          status = qv_cli_fail ("convert", error);
          goto out;
        }
      n = 3 * n_atoms;
      if (!check_memory (n, geometry, &error))
        {
          status = qv_cli_fail ("convert", error);
          goto out;
        }
    }
  else if (atoms > 0)
    {
      n = 3 * (gsize) atoms;
      if (!check_memory (n, "--atoms", &error))
        {
          status = qv_cli_fail ("convert", error);
          goto out;
        }
    }

  hessian = qv_hessian_read_file (argv[1], n, layout, &error);
  if (hessian == NULL || (n == 0 && !check_memory (hessian->n, argv[1], &error)))
    {
      status = qv_cli_fail ("convert", error);
      goto out;
    }
  if (from_arg)
    qv_hessian_scale (hessian, qv_hessian_unit_to_ev_a2 (from) / qv_hessian_unit_to_ev_a2 (to));
  if (from_arg && qv_hessian_find_nonfinite (hessian) >= 0)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_INPUT, "%s: a value overflows when converted "
                   "from %s to %s", argv[1], qv_hessian_unit_name (from), qv_hessian_unit_name (to));
      status = qv_cli_fail ("convert", error);
      goto out;
    }
  if (!qv_hessian_write_file (output, hessian, QV_HESSIAN_WRITE_NPY, NULL, force, &error))
    {
      status = qv_cli_fail ("convert", error);
      goto out;
    }
  out_len = hessian->n;
  if (from_arg)
    g_printerr ("quaver: wrote %s: %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " float64, C order, "
                "from %s (%s) (values converted from %s to %s: give quaver modes "
                "--hessian-units %s)\n", output, out_len, out_len, argv[1],
                qv_hessian_layout_name (hessian->layout), qv_hessian_unit_name (from),
                qv_hessian_unit_name (to), qv_hessian_unit_name (to));
  else
    g_printerr ("quaver: wrote %s: %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " float64, C order, "
                "from %s (%s) (values unchanged: give quaver modes the same --hessian-units)\n",
                output, out_len, out_len, argv[1], qv_hessian_layout_name (hessian->layout));

out:
  g_free (output); g_free (geometry); g_free (layout_arg); g_free (from_arg); g_free (to_arg);
  return status;
}
