/* qv-manifest.h — manifest.json, the record of an export: what command and
 * options made it, the SHA-256 of every input, and for every file written
 * the structures in it with their mode(s) and amplitudes (docs/formats.md,
 * "Manifest").
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

#define QV_MANIFEST_FORMAT "quaver-manifest"
#define QV_MANIFEST_VERSION 1
/* Deepest JSON nesting the reader accepts (checked before parsing). */
#define QV_MANIFEST_MAX_DEPTH 32
/* The reader refuses larger manifests (bytes). */
#define QV_MANIFEST_MAX_BYTES ((gsize) 1 << 30)

typedef enum {
  QV_MANIFEST_NUMBER,
  QV_MANIFEST_INTEGER,
  QV_MANIFEST_STRING,
  QV_MANIFEST_BOOLEAN,
} QvManifestType;

/* A free key/value field: options, parameters (temperature, seed…), and
 * per-structure extras (sample index, atom and axis of a stencil step…). */
typedef struct {
  char *key;
  QvManifestType type;
  double number;
  gint64 integer;
  char *string;
  gboolean boolean;
} QvManifestField;

/* One mode's amplitude in all units. Undefined values are NAN (q and the
 * turning-point multiple of an imaginary mode). */
typedef struct {
  guint mode;                  /* 1-based, as in `quaver modes` */
  double wavenumber;           /* cm⁻¹, negative = imaginary */
  double q;                    /* dimensionless q = Q·√(ω/ħ) */
  double Q;                    /* mass-weighted, u^½ Å */
  double max_displacement;     /* Å of the atom that moves most, signed as Q */
  guint max_atom;              /* 1-based */
  gint level;                  /* v of the turning point, -1 when none */
  double turning_multiple;     /* Q / Q_tp(v) */
} QvManifestAmplitude;

typedef struct {
  guint index;                 /* 0-based frame in its file */
  GArray *amplitudes;          /* QvManifestAmplitude, one per displaced mode
                                  (none for the reference structure) */
  GPtrArray *fields;           /* QvManifestField* */
} QvManifestFrame;

typedef struct {
  char *name;                  /* relative to the manifest's folder */
  char *format;                /* "xyz", "extxyz", … */
  char *sha256;                /* of the bytes written, lower-case hex */
  GPtrArray *frames;           /* QvManifestFrame* */
} QvManifestFile;

typedef struct {
  char *role;                  /* "geometry", "hessian", "bundle", "demo" */
  char *path;                  /* as the user gave it */
  char *sha256;
} QvManifestInput;

typedef struct {
  int version;                 /* QV_MANIFEST_VERSION when built here */
  char *generator;             /* "quaver 0.1.0" */
  char *command;               /* "displace" */
  GPtrArray *arguments;        /* char*, the command line after the command */
  GPtrArray *options;          /* QvManifestField*, the parsed options */
  GPtrArray *inputs;           /* QvManifestInput* */
  gsize n_atoms;
  char *formula;               /* may be NULL */
  gboolean periodic;
  GPtrArray *parameters;       /* QvManifestField* (temperature, seed, …) */
  GPtrArray *notes;            /* char*, what the user should know */
  GPtrArray *files;            /* QvManifestFile* */
} QvManifest;

QvManifest *qv_manifest_new (const char *command);
void qv_manifest_free (QvManifest *manifest);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvManifest, qv_manifest_free)

/* SHA-256 of @data as lower-case hex (newly allocated). */
char *qv_manifest_sha256 (const void *data, gsize length);

void qv_manifest_add_argument (QvManifest *manifest, const char *argument);
void qv_manifest_add_note (QvManifest *manifest, const char *note);
/* An input from its bytes (the demo's resource, or a file already read). */
void qv_manifest_add_input_data (QvManifest *manifest, const char *role,
                                 const char *path, const void *data, gsize length);
/* An input from a file, hashed as it is read; QV_ERROR_INPUT when it cannot
 * be read. */
gboolean qv_manifest_add_input_file (QvManifest *manifest, const char *role,
                                     const char *path, GError **error);

/* Free fields in @fields (manifest->options, ->parameters, a frame's
 * ->fields); a key set again replaces its value. */
void qv_manifest_set_number (GPtrArray *fields, const char *key, double value);
void qv_manifest_set_integer (GPtrArray *fields, const char *key, gint64 value);
void qv_manifest_set_string (GPtrArray *fields, const char *key, const char *value);
void qv_manifest_set_boolean (GPtrArray *fields, const char *key, gboolean value);
/* NULL when absent. */
const QvManifestField *qv_manifest_get (const GPtrArray *fields, const char *key);
/* A number field: the reader gives integer literals (300) as
 * QV_MANIFEST_INTEGER, so this takes both. FALSE when absent or not a
 * number. */
gboolean qv_manifest_get_number (const GPtrArray *fields, const char *key, double *value);

/* A file written with @contents (hashed here); owned by @manifest. */
QvManifestFile *qv_manifest_add_file (QvManifest *manifest, const char *name,
                                      const char *format, const void *contents,
                                      gsize length);
/* The next frame of @file (index = number of frames before it). */
QvManifestFrame *qv_manifest_file_add_frame (QvManifestFile *file);
void qv_manifest_frame_add_amplitude (QvManifestFrame *frame,
                                      const QvManifestAmplitude *amplitude);

/* The document (UTF-8, final newline), newly allocated. */
char *qv_manifest_to_json (const QvManifest *manifest);

/* Strict reader: unknown top-level or entry keys, wrong types, a missing
 * required member, another format or a newer version are errors
 * (QV_ERROR_INPUT) with "NAME:LINE:COL: …"; @name is what messages call the
 * file. */
QvManifest *qv_manifest_read_data (const char *data, gsize length, const char *name,
                                   GError **error);
QvManifest *qv_manifest_read_file (const char *path, GError **error);

G_END_DECLS
