/* qv-scalapack-private.h — the ScaLAPACK and BLACS routines the distributed
 * solver calls. ScaLAPACK ships no C header; these are the routines'
 * documented Fortran interfaces (LP64: INTEGER is int), with gfortran's
 * hidden lengths of CHARACTER arguments passed explicitly. pdtran and
 * pdgemr2d are written in C inside ScaLAPACK and take none.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <stddef.h>

void Cblacs_pinfo (int *rank, int *size);
void Cblacs_get (int context, int what, int *value);
void Cblacs_gridinit (int *context, const char *order, int rows, int cols);
void Cblacs_gridinfo (int context, int *rows, int *cols, int *row, int *col);
void Cblacs_gridexit (int context);

void descinit_ (int *desc, const int *m, const int *n, const int *mb, const int *nb,
                const int *irsrc, const int *icsrc, const int *ictxt, const int *lld, int *info);

void pdtran_ (const int *m, const int *n, const double *alpha, const double *a, const int *ia,
              const int *ja, const int *desca, const double *beta, double *c, const int *ic,
              const int *jc, const int *descc);

void pdgemr2d_ (const int *m, const int *n, const double *a, const int *ia, const int *ja,
                const int *desca, double *b, const int *ib, const int *jb, const int *descb,
                const int *ictxt);

void pdsyevd_ (const char *jobz, const char *uplo, const int *n, double *a, const int *ia,
               const int *ja, const int *desca, double *w, double *z, const int *iz,
               const int *jz, const int *descz, double *work, const int *lwork, int *iwork,
               const int *liwork, int *info, size_t jobz_len, size_t uplo_len);

void pdsyevr_ (const char *jobz, const char *range, const char *uplo, const int *n, double *a,
               const int *ia, const int *ja, const int *desca, const double *vl,
               const double *vu, const int *il, const int *iu, int *m, int *nz, double *w,
               double *z, const int *iz, const int *jz, const int *descz, double *work,
               const int *lwork, int *iwork, const int *liwork, int *info, size_t jobz_len,
               size_t range_len, size_t uplo_len);
