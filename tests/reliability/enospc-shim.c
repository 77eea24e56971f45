/* enospc-shim.c — a full disk on demand, for tests only (LD_PRELOAD).
 *
 *   QV_ENOSPC_AFTER=N   write() to regular files succeeds for N bytes in
 *                       all (a write that crosses the budget is cut short
 *                       at it), then fails with ENOSPC, as a disk that
 *                       fills up does;
 *   QV_ENOSPC_FSYNC=1   fsync()/fdatasync() fail with ENOSPC (what a file
 *                       system with delayed allocation reports late).
 *
 * Writes to pipes, terminals and sockets (stdout and stderr of a test) are
 * never touched. Without the variables the shim passes everything through.
 * Not installed; built only with the tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _GNU_SOURCE 1
#include <dlfcn.h>
#include <errno.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <unistd.h>

typedef ssize_t (*write_fn) (int, const void *, size_t);
typedef int (*sync_fn) (int);

static long long budget = -2;            /* -2: not read yet; -1: no limit */

static long long
remaining (void)
{
  if (budget == -2)
    {
      const char *v = getenv ("QV_ENOSPC_AFTER");
      budget = (v != NULL && *v != '\0') ? atoll (v) : -1;
    }
  return budget;
}

static int
is_regular (int fd)
{
  struct stat st;
  return fstat (fd, &st) == 0 && S_ISREG (st.st_mode);
}

ssize_t
write (int fd, const void *buf, size_t count)
{
  static write_fn real;
  long long left;

  if (real == NULL)
    real = (write_fn) dlsym (RTLD_NEXT, "write");
  left = remaining ();
  if (left < 0 || count == 0 || !is_regular (fd))
    return real (fd, buf, count);
  if (left == 0)
    {
      errno = ENOSPC;
      return -1;
    }
  if ((long long) count > left)
    count = (size_t) left;
  {
    ssize_t n = real (fd, buf, count);
    if (n > 0)
      budget -= n;
    return n;
  }
}

static int
sync_fails (void)
{
  const char *v = getenv ("QV_ENOSPC_FSYNC");
  return v != NULL && *v == '1';
}

int
fsync (int fd)
{
  static sync_fn real;
  if (real == NULL)
    real = (sync_fn) dlsym (RTLD_NEXT, "fsync");
  if (sync_fails () && is_regular (fd))
    {
      errno = ENOSPC;
      return -1;
    }
  return real (fd);
}

int
fdatasync (int fd)
{
  static sync_fn real;
  if (real == NULL)
    real = (sync_fn) dlsym (RTLD_NEXT, "fdatasync");
  if (sync_fails () && is_regular (fd))
    {
      errno = ENOSPC;
      return -1;
    }
  return real (fd);
}
