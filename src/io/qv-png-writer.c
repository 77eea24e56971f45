/* qv-png-writer.c — PNG encoding with libpng into memory.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <png.h>
#include <setjmp.h>
#include <string.h>
#include "qv-error.h"
#include "qv-png-writer.h"

typedef struct {
  GByteArray *bytes;
  char message[256];
} Sink;

static void
sink_write (png_structp png, png_bytep data, png_size_t length)
{
  Sink *sink = png_get_io_ptr (png);
  g_byte_array_append (sink->bytes, data, (guint) length);
}

static void
sink_flush (png_structp png)
{
  (void) png;
}

static void
on_error (png_structp png, png_const_charp message)
{
  Sink *sink = png_get_error_ptr (png);
  g_strlcpy (sink->message, message, sizeof sink->message);
  png_longjmp (png, 1);
}

static void
on_warning (png_structp png, png_const_charp message)
{
  (void) png;
  (void) message;
}

static gboolean
key_ok (const char *key)
{
  const gsize n = strlen (key);

  if (n < 1 || n > 79 || key[0] == ' ' || key[n - 1] == ' ')
    return FALSE;
  for (const char *p = key; *p; p++)
    if ((guchar) *p < 32 || (guchar) *p > 126)
      return FALSE;
  return TRUE;
}

/* Everything libpng may longjmp out of, with only parameters live across
 * the setjmp (so nothing can be clobbered). */
static gboolean
write_png (png_structp png, png_infop info, Sink *sink, const guint8 *rgba, int width,
           int height, gboolean opaque, png_text *chunks, int n_text, guint8 *row)
{
  if (setjmp (png_jmpbuf (png)))
    return FALSE;
  png_set_write_fn (png, sink, sink_write, sink_flush);
  png_set_IHDR (png, info, (png_uint_32) width, (png_uint_32) height, 8,
                opaque ? PNG_COLOR_TYPE_RGB : PNG_COLOR_TYPE_RGB_ALPHA,
                PNG_INTERLACE_NONE, PNG_COMPRESSION_TYPE_DEFAULT, PNG_FILTER_TYPE_DEFAULT);
  /* the renderer's colours are sRGB-encoded */
  png_set_sRGB_gAMA_and_cHRM (png, info, PNG_sRGB_INTENT_PERCEPTUAL);
  if (n_text)
    png_set_text (png, info, chunks, n_text);
  /* the default level: fast enough for large frames, and flat-background
   * pictures compress well at it */
  png_set_compression_level (png, 6);
  png_write_info (png, info);
  for (int y = 0; y < height; y++)
    {
      const guint8 *src = rgba + (gsize) y * (gsize) width * 4;
      if (opaque)
        {
          for (int x = 0; x < width; x++)
            memcpy (row + 3 * x, src + 4 * x, 3);
          png_write_row (png, row);
        }
      else
        png_write_row (png, (png_const_bytep) src);
    }
  png_write_end (png, info);
  return TRUE;
}

guint8 *
qv_png_encode (const guint8 *rgba, int width, int height, gboolean opaque,
               const char *const *text, gsize *length, GError **error)
{
  Sink sink = { NULL, "" };
  png_structp png = NULL;
  png_infop info = NULL;
  g_autofree png_text *chunks = NULL;
  g_autofree guint8 *row = NULL;
  gsize n_text = 0;
  gboolean ok = FALSE;

  *length = 0;
  if (width < 1 || height < 1 || width > QV_PNG_MAX_SIDE || height > QV_PNG_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a picture must be 1 to %d pixels wide and high, not %d x %d",
                   QV_PNG_MAX_SIDE, width, height);
      return NULL;
    }
  for (const char *const *t = text; t && t[0]; t += 2)
    {
      if (t[1] == NULL || !key_ok (t[0]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "PNG text key '%s' is not 1-79 printable "
                       "Latin-1 characters, or has no value", t[0]);
          return NULL;
        }
      n_text++;
    }
  chunks = g_new0 (png_text, n_text + 1);
  for (gsize i = 0; i < n_text; i++)
    {
      chunks[i].compression = PNG_ITXT_COMPRESSION_NONE;
      chunks[i].key = (png_charp) text[2 * i];
      chunks[i].text = (png_charp) text[2 * i + 1];
    }
  row = g_malloc ((gsize) width * 3);

  sink.bytes = g_byte_array_new ();
  png = png_create_write_struct (PNG_LIBPNG_VER_STRING, &sink, on_error, on_warning);
  info = png ? png_create_info_struct (png) : NULL;
  if (info == NULL)
    g_strlcpy (sink.message, "out of memory", sizeof sink.message);
  else
    ok = write_png (png, info, &sink, rgba, width, height, opaque, chunks, (int) n_text, row);
  png_destroy_write_struct (png ? &png : NULL, info ? &info : NULL);
  if (!ok)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "could not encode the PNG: %s", sink.message);
      g_byte_array_free (sink.bytes, TRUE);
      return NULL;
    }
  *length = sink.bytes->len;
  return g_byte_array_free (sink.bytes, FALSE);
}
