/* qv-shader.c — GLSL programs from the render GResource, with compiler
 * logs that name the shader file.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gio/gio.h>
#include <string.h>
#include "qv-render-resources.h"
#include "qv-renderer.h"
#include "qv-renderer-private.h"

#define SHADER_PREFIX "/org/quaverlab/Quaver/render/shaders/"

G_DEFINE_QUARK (qv-render-error-quark, qv_render_error)

/* Mesa writes "S:L(C): error: …" and others "ERROR: S:L: …", S being the
 * source-string number (set with #line): both become "name:L:C: …". */
static char *
readable_log (const char *log, const char *const *names, guint n_names)
{
  GString *out = g_string_new (NULL);
  g_auto(GStrv) lines = g_strsplit (log, "\n", -1);

  for (guint i = 0; lines[i]; i++)
    {
      const char *l = lines[i];
      char *end;
      guint64 src, line, col = 0;
      const char *prefix = "";

      if (*l == '\0')
        continue;
      if (g_str_has_prefix (l, "ERROR: "))
        {
          prefix = "error: ";
          l += 7;
        }
      src = g_ascii_strtoull (l, &end, 10);
      if (end != l && *end == ':' && src < n_names)
        {
          const char *p = end + 1;
          line = g_ascii_strtoull (p, &end, 10);
          if (end != p)
            {
              if (*end == '(')
                {
                  col = g_ascii_strtoull (end + 1, &end, 10);
                  if (*end == ')')
                    end++;
                }
              if (*end == ':')
                end++;
              while (*end == ' ')
                end++;
              if (col)
                g_string_append_printf (out, "%s:%" G_GUINT64_FORMAT ":%" G_GUINT64_FORMAT ": %s%s\n",
                                        names[src], line, col, prefix, end);
              else
                g_string_append_printf (out, "%s:%" G_GUINT64_FORMAT ": %s%s\n",
                                        names[src], line, prefix, end);
              continue;
            }
        }
      g_string_append_printf (out, "%s: %s\n", names[n_names - 1], lines[i]);
    }
  if (out->len && out->str[out->len - 1] == '\n')
    g_string_truncate (out, out->len - 1);
  return g_string_free (out, FALSE);
}

/* @names[k] is the file that source string k came from. */
static GLuint
compile (GLenum type, const char *const *sources, const char *const *names, guint n,
         GError **error)
{
  GLuint shader = glCreateShader (type);
  GLint ok = 0;

  glShaderSource (shader, (GLsizei) n, (const GLchar *const *) sources, NULL);
  glCompileShader (shader);
  glGetShaderiv (shader, GL_COMPILE_STATUS, &ok);
  if (!ok)
    {
      GLint len = 0;
      g_autofree char *log = NULL, *text = NULL;

      glGetShaderiv (shader, GL_INFO_LOG_LENGTH, &len);
      log = g_malloc0 (MAX (len, 1) + 1);
      glGetShaderInfoLog (shader, MAX (len, 1), NULL, log);
      text = readable_log (log, names, n);
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER,
                   "%s does not compile:\n%s", names[n - 1], text);
      glDeleteShader (shader);
      return 0;
    }
  return shader;
}

static GLuint
link_program (GLuint vs, GLuint fs, const char *vert_name, const char *frag_name, GError **error)
{
  GLuint program = glCreateProgram ();
  GLint ok = 0;

  glAttachShader (program, vs);
  glAttachShader (program, fs);
  glLinkProgram (program);
  glDeleteShader (vs);
  glDeleteShader (fs);
  glGetProgramiv (program, GL_LINK_STATUS, &ok);
  if (!ok)
    {
      GLint len = 0;
      g_autofree char *log = NULL;

      glGetProgramiv (program, GL_INFO_LOG_LENGTH, &len);
      log = g_malloc0 (MAX (len, 1) + 1);
      glGetProgramInfoLog (program, MAX (len, 1), NULL, log);
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER,
                   "%s and %s do not link:\n%s", vert_name, frag_name, g_strstrip (log));
      glDeleteProgram (program);
      return 0;
    }
  return program;
}

static GLuint
program_from_strings (const char *const *vsrc, const char *const *vnames,
                      const char *const *fsrc, const char *const *fnames, guint n,
                      GError **error)
{
  GLuint vs, fs;

  vs = compile (GL_VERTEX_SHADER, vsrc, vnames, n, error);
  if (vs == 0)
    return 0;
  fs = compile (GL_FRAGMENT_SHADER, fsrc, fnames, n, error);
  if (fs == 0)
    {
      glDeleteShader (vs);
      return 0;
    }
  return link_program (vs, fs, vnames[n - 1], fnames[n - 1], error);
}

GLuint
qv_shader_program_from_source (const char *vert_name, const char *vert_source,
                               const char *frag_name, const char *frag_source,
                               GError **error)
{
  return program_from_strings (&vert_source, &vert_name, &frag_source, &frag_name, 1, error);
}

static char *
load_text (const char *file, GError **error)
{
  g_autofree char *path = g_strconcat (SHADER_PREFIX, file, NULL);
  g_autoptr(GBytes) bytes = g_resource_lookup_data (qv_render_get_resource (), path,
                                                    G_RESOURCE_LOOKUP_FLAGS_NONE, error);
  gsize size;
  const char *data;

  if (bytes == NULL)
    return NULL;
  data = g_bytes_get_data (bytes, &size);
  return g_strndup (data, size);
}

/* Source strings: 0 the #version line of the file, 1 common.glsl, 2 the
 * rest of the file (after any #extension lines, which go with #version);
 * #line keeps both files' own line numbers. */
static gboolean
split_sources (const char *file, const char *common, const char *defines, char *parts[3],
               GError **error)
{
  g_autofree char *text = load_text (file, error);
  char *nl;
  int line = 2;

  if (text == NULL)
    return FALSE;
  if (!g_str_has_prefix (text, "#version") || (nl = strchr (text, '\n')) == NULL)
    {
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER,
                   "%s:1: must start with a #version line", file);
      return FALSE;
    }
  /* #extension lines right after #version stay before common.glsl. */
  while (g_str_has_prefix (nl + 1, "#extension") && strchr (nl + 1, '\n'))
    {
      nl = strchr (nl + 1, '\n');
      line++;
    }
  parts[0] = g_strdup_printf ("%.*s%s", (int) (nl - text + 1), text, defines ? defines : "");
  parts[1] = g_strconcat ("#line 1 1\n", common, "\n", NULL);
  parts[2] = g_strdup_printf ("#line %d 2\n%s", line, nl + 1);
  return TRUE;
}

GLuint
qv_shader_program_load (const char *name, GError **error)
{
  return qv_shader_program_load_defines (name, NULL, error);
}

GLuint
qv_shader_program_load_defines (const char *name, const char *defines, GError **error)
{
  g_autofree char *common = load_text ("common.glsl", error);
  g_autofree char *vfile = g_strconcat (name, ".vert", NULL);
  g_autofree char *ffile = g_strconcat (name, ".frag", NULL);
  /* Lets common.glsl hold fragment-only functions. */
  g_autofree char *fdefines = g_strconcat (defines ? defines : "", "#define QV_FRAGMENT 1\n", NULL);
  char *vparts[3] = { NULL }, *fparts[3] = { NULL };
  const char *vnames[3], *fnames[3];
  GLuint program = 0;

  if (common == NULL)
    return 0;
  vnames[0] = vnames[2] = vfile;
  fnames[0] = fnames[2] = ffile;
  vnames[1] = fnames[1] = "common.glsl";
  if (split_sources (vfile, common, defines, vparts, error)
      && split_sources (ffile, common, fdefines, fparts, error))
    program = program_from_strings ((const char *const *) vparts, vnames,
                                    (const char *const *) fparts, fnames, 3, error);
  for (int k = 0; k < 3; k++)
    {
      g_free (vparts[k]);
      g_free (fparts[k]);
    }
  return program;
}
