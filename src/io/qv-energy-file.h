/* qv-energy-file.h — energies brought back from an electronic-structure code
 * for the structures of an export: a text file of "NAME ENERGY" lines
 * (whitespace or a comma between them, '#' starts a comment), in a unit the
 * user states (docs/formats.md, "Energy file").
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  QV_ENERGY_UNIT_HARTREE,
  QV_ENERGY_UNIT_EV,
  QV_ENERGY_UNIT_KCAL_MOL,
  QV_ENERGY_UNIT_KJ_MOL,
  QV_ENERGY_UNIT_CM1,
  QV_ENERGY_UNIT_COUNT
} QvEnergyUnit;

/* "hartree" (also "Eh", "au"), "eV", "kcal/mol", "kJ/mol", "cm^-1" (also
 * "cm-1"), case-insensitive. QV_ERROR_USAGE with the accepted list
 * otherwise. */
gboolean qv_energy_unit_parse (const char *text, QvEnergyUnit *unit, GError **error);
const char *qv_energy_unit_name (QvEnergyUnit unit);
/* Factor f with value_in_unit · f = value in eV (CODATA 2018). */
double qv_energy_unit_to_ev (QvEnergyUnit unit);
const char *qv_energy_unit_list (void);

/* At most this many bytes are read. */
#define QV_ENERGY_FILE_MAX_BYTES ((gsize) 256 << 20)

typedef struct {
  char *name;
  double value;            /* as written, in the file's unit */
  gsize line;              /* 1-based */
} QvEnergyEntry;

typedef struct {
  char *path;              /* what messages call the file */
  GPtrArray *entries;      /* QvEnergyEntry*, in file order */
  GHashTable *by_name;     /* name → QvEnergyEntry* (borrowed) */
} QvEnergyFile;

void qv_energy_file_free (QvEnergyFile *file);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvEnergyFile, qv_energy_file_free)

/* QV_ERROR_INPUT "NAME:LINE:COL: …" for a line that is not NAME ENERGY, an
 * energy that is not a number or not finite, a name given twice (with the
 * line of the first), or a file with no entries. */
QvEnergyFile *qv_energy_file_read_data (const char *data, gsize length, const char *name,
                                        GError **error);
QvEnergyFile *qv_energy_file_read (const char *path, GError **error);

/* The energies of @names (@n of them) in file order of @names, into
 * @values (the file's unit). A name matches an entry of the same text, or
 * the entry is the name without its last extension ("mode7-scan-03" for
 * "mode7-scan-03.xyz"). Every name without an entry and every entry that is
 * none of @names is an error (QV_ERROR_INPUT), all of them named in one
 * message (up to 10, then a count), entries with their line. */
gboolean qv_energy_file_match (const QvEnergyFile *file, const char *const *names, gsize n,
                               double *values, GError **error);

G_END_DECLS
