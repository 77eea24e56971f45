/* qv-offscreen.c — an OpenGL 3.3 core context with no window (EGL on
 * Mesa's surfaceless platform) and a multisampled framebuffer read back to
 * memory, optionally rendered larger and box-downsampled.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <epoxy/egl.h>
#include <epoxy/gl.h>
#include <string.h>
#include "qv-offscreen.h"
#include "qv-renderer.h"

struct _QvOffscreen {
  EGLDisplay display;
  EGLContext context;
  int width, height;         /* what qv_offscreen_read returns */
  int supersample;
  int draw_width, draw_height;
  int samples;
  GLuint msaa_fbo, msaa_colour, msaa_depth;   /* 0 without MSAA */
  GLuint fbo, colour, depth;                  /* single-sample */
  guint8 *scratch;                            /* draw-size pixels */
  char *renderer_name;
};

static gboolean
has_extension (const char *list, const char *name)
{
  gsize len = strlen (name);

  for (const char *p = list; p && (p = strstr (p, name)); p += len)
    if ((p == list || p[-1] == ' ') && (p[len] == ' ' || p[len] == '\0'))
      return TRUE;
  return FALSE;
}

static void
fail (GError **error, const char *message)
{
  g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_CONTEXT, "offscreen rendering: %s", message);
}

static GLuint
renderbuffer (int samples, GLenum format, int w, int h)
{
  GLuint rb;

  glGenRenderbuffers (1, &rb);
  glBindRenderbuffer (GL_RENDERBUFFER, rb);
  if (samples > 0)
    glRenderbufferStorageMultisample (GL_RENDERBUFFER, samples, format, w, h);
  else
    glRenderbufferStorage (GL_RENDERBUFFER, format, w, h);
  return rb;
}

static gboolean
framebuffer (GLuint *fbo, GLuint colour, GLuint depth)
{
  glGenFramebuffers (1, fbo);
  glBindFramebuffer (GL_FRAMEBUFFER, *fbo);
  glFramebufferRenderbuffer (GL_FRAMEBUFFER, GL_COLOR_ATTACHMENT0, GL_RENDERBUFFER, colour);
  glFramebufferRenderbuffer (GL_FRAMEBUFFER, GL_DEPTH_ATTACHMENT, GL_RENDERBUFFER, depth);
  return glCheckFramebufferStatus (GL_FRAMEBUFFER) == GL_FRAMEBUFFER_COMPLETE;
}

QvOffscreen *
qv_offscreen_new (int width, int height, int samples, int supersample, GError **error)
{
  static const EGLint context_attribs[] = {
    EGL_CONTEXT_MAJOR_VERSION, 3,
    EGL_CONTEXT_MINOR_VERSION, 3,
    EGL_CONTEXT_OPENGL_PROFILE_MASK, EGL_CONTEXT_OPENGL_CORE_PROFILE_BIT,
    EGL_NONE,
  };
  g_autofree QvOffscreen *o = NULL;
  const char *client;
  EGLint major = 0, minor = 0, n_configs = 0, max_size = 0;
  EGLConfig config = NULL;
  GLint max_samples = 0;

  if (width < 1 || height < 1 || width > 16384 || height > 16384)
    {
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_FRAMEBUFFER,
                   "offscreen rendering: %d × %d pixels is not a picture size (1–16384)",
                   width, height);
      return NULL;
    }
  supersample = CLAMP (supersample, 1, 4);
  if (!epoxy_has_egl ())
    {
      fail (error, "no EGL library (libEGL) could be loaded");
      return NULL;
    }
  client = eglQueryString (EGL_NO_DISPLAY, EGL_EXTENSIONS);
  if (client == NULL || !has_extension (client, "EGL_EXT_platform_base")
      || !has_extension (client, "EGL_MESA_platform_surfaceless"))
    {
      fail (error, "EGL has no surfaceless platform (EGL_MESA_platform_surfaceless); "
                   "Mesa's EGL provides it");
      return NULL;
    }
  o = g_new0 (QvOffscreen, 1);
  o->display = eglGetPlatformDisplayEXT (EGL_PLATFORM_SURFACELESS_MESA, EGL_DEFAULT_DISPLAY, NULL);
  if (o->display == EGL_NO_DISPLAY || !eglInitialize (o->display, &major, &minor))
    {
      fail (error, "the surfaceless EGL display does not initialise");
      return NULL;
    }
  if (!eglBindAPI (EGL_OPENGL_API))
    {
      fail (error, "EGL cannot bind desktop OpenGL");
      return NULL;
    }
  if (!has_extension (eglQueryString (o->display, EGL_EXTENSIONS), "EGL_KHR_no_config_context"))
    {
      static const EGLint config_attribs[] = {
        EGL_RENDERABLE_TYPE, EGL_OPENGL_BIT, EGL_NONE,
      };
      if (!eglChooseConfig (o->display, config_attribs, &config, 1, &n_configs) || n_configs < 1)
        {
          fail (error, "EGL offers no configuration for desktop OpenGL");
          return NULL;
        }
    }
  o->context = eglCreateContext (o->display, config ? config : EGL_NO_CONFIG_KHR,
                                 EGL_NO_CONTEXT, context_attribs);
  if (o->context == EGL_NO_CONTEXT)
    {
      fail (error, "no OpenGL 3.3 core context (EGL could not create one)");
      return NULL;
    }
  if (!eglMakeCurrent (o->display, EGL_NO_SURFACE, EGL_NO_SURFACE, o->context))
    {
      eglDestroyContext (o->display, o->context);
      fail (error, "the OpenGL context cannot be made current without a surface");
      return NULL;
    }
  o->renderer_name = g_strdup ((const char *) glGetString (GL_RENDERER));

  o->width = width;
  o->height = height;
  o->supersample = supersample;
  o->draw_width = width * supersample;
  o->draw_height = height * supersample;
  glGetIntegerv (GL_MAX_RENDERBUFFER_SIZE, &max_size);
  if (o->draw_width > max_size || o->draw_height > max_size)
    {
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_FRAMEBUFFER,
                   "offscreen rendering: %d × %d pixels (× %d supersampling) is more than "
                   "this OpenGL allows (%d)", width, height, supersample, max_size);
      eglMakeCurrent (o->display, EGL_NO_SURFACE, EGL_NO_SURFACE, EGL_NO_CONTEXT);
      eglDestroyContext (o->display, o->context);
      g_free (o->renderer_name);
      return NULL;
    }
  glGetIntegerv (GL_MAX_SAMPLES, &max_samples);
  o->samples = samples <= 0 ? 0 : MIN (samples <= 2 ? 2 : 4, max_samples);
  if (o->samples > 0)
    {
      o->msaa_colour = renderbuffer (o->samples, GL_RGBA8, o->draw_width, o->draw_height);
      o->msaa_depth = renderbuffer (o->samples, GL_DEPTH_COMPONENT24, o->draw_width, o->draw_height);
    }
  o->colour = renderbuffer (0, GL_RGBA8, o->draw_width, o->draw_height);
  o->depth = renderbuffer (0, GL_DEPTH_COMPONENT24, o->draw_width, o->draw_height);
  if ((o->samples > 0 && !framebuffer (&o->msaa_fbo, o->msaa_colour, o->msaa_depth))
      || !framebuffer (&o->fbo, o->colour, o->depth))
    {
      g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_FRAMEBUFFER,
                   "offscreen rendering: the framebuffer is incomplete (%d samples)", o->samples);
      qv_offscreen_free (g_steal_pointer (&o));
      return NULL;
    }
  o->scratch = g_malloc ((gsize) o->draw_width * o->draw_height * 4);
  return g_steal_pointer (&o);
}

void
qv_offscreen_free (QvOffscreen *offscreen)
{
  GLuint rbs[4];

  if (offscreen == NULL)
    return;
  qv_offscreen_make_current (offscreen);
  rbs[0] = offscreen->msaa_colour;
  rbs[1] = offscreen->msaa_depth;
  rbs[2] = offscreen->colour;
  rbs[3] = offscreen->depth;
  glDeleteRenderbuffers (4, rbs);
  if (offscreen->msaa_fbo)
    glDeleteFramebuffers (1, &offscreen->msaa_fbo);
  if (offscreen->fbo)
    glDeleteFramebuffers (1, &offscreen->fbo);
  eglMakeCurrent (offscreen->display, EGL_NO_SURFACE, EGL_NO_SURFACE, EGL_NO_CONTEXT);
  eglDestroyContext (offscreen->display, offscreen->context);
  /* The display is shared by every context of the process: not
   * terminated here. */
  g_free (offscreen->scratch);
  g_free (offscreen->renderer_name);
  g_free (offscreen);
}

void
qv_offscreen_make_current (QvOffscreen *offscreen)
{
  eglMakeCurrent (offscreen->display, EGL_NO_SURFACE, EGL_NO_SURFACE, offscreen->context);
}

void
qv_offscreen_begin (QvOffscreen *offscreen, int *draw_width, int *draw_height)
{
  glBindFramebuffer (GL_FRAMEBUFFER, offscreen->samples > 0 ? offscreen->msaa_fbo : offscreen->fbo);
  glViewport (0, 0, offscreen->draw_width, offscreen->draw_height);
  if (draw_width)
    *draw_width = offscreen->draw_width;
  if (draw_height)
    *draw_height = offscreen->draw_height;
}

void
qv_offscreen_read (QvOffscreen *offscreen, guint8 *rgba)
{
  const int s = offscreen->supersample, dw = offscreen->draw_width, dh = offscreen->draw_height;
  const guint8 *src;

  if (offscreen->samples > 0)
    {
      glBindFramebuffer (GL_READ_FRAMEBUFFER, offscreen->msaa_fbo);
      glBindFramebuffer (GL_DRAW_FRAMEBUFFER, offscreen->fbo);
      glBlitFramebuffer (0, 0, dw, dh, 0, 0, dw, dh, GL_COLOR_BUFFER_BIT, GL_NEAREST);
    }
  glBindFramebuffer (GL_READ_FRAMEBUFFER, offscreen->fbo);
  glPixelStorei (GL_PACK_ALIGNMENT, 1);
  glReadPixels (0, 0, dw, dh, GL_RGBA, GL_UNSIGNED_BYTE, offscreen->scratch);
  src = offscreen->scratch;
  /* GL's first row is the bottom one; box-filter s × s blocks. The
   * framebuffer holds premultiplied colour (the renderer's transparent
   * background: a resolved edge sample is coverage × colour over 0; on an
   * opaque background alpha is 1 and the two agree): sum it, then divide
   * by the summed alpha for straight alpha, so that edges against
   * transparency keep their colour instead of darkening. */
  for (int y = 0; y < offscreen->height; y++)
    {
      guint8 *row = rgba + (gsize) y * offscreen->width * 4;
      for (int x = 0; x < offscreen->width; x++)
        {
          guint sum[4] = { 0, 0, 0, 0 };
          for (int j = 0; j < s; j++)
            {
              const guint8 *p = src + ((gsize) (dh - 1 - (y * s + j)) * dw + (gsize) x * s) * 4;
              for (int i = 0; i < s; i++, p += 4)
                {
                  sum[0] += p[0];
                  sum[1] += p[1];
                  sum[2] += p[2];
                  sum[3] += p[3];
                }
            }
          for (int k = 0; k < 3; k++)
            row[4 * x + k] = sum[3] ? (guint8) MIN ((sum[k] * 255 + sum[3] / 2) / sum[3], 255) : 0;
          row[4 * x + 3] = (guint8) ((sum[3] + (guint) (s * s) / 2) / (guint) (s * s));
        }
    }
  glBindFramebuffer (GL_FRAMEBUFFER, offscreen->samples > 0 ? offscreen->msaa_fbo : offscreen->fbo);
}

const char *
qv_offscreen_renderer_name (QvOffscreen *offscreen)
{
  return offscreen->renderer_name;
}
