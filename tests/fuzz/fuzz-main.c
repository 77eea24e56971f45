/* fuzz-main.c — the libFuzzer entry points around qv_fuzz_read.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stddef.h>
#include <stdint.h>
#include "qv-fuzz.h"

int LLVMFuzzerInitialize (int *argc, char ***argv);
int LLVMFuzzerTestOneInput (const uint8_t *data, size_t size);

int
LLVMFuzzerInitialize (int *argc, char ***argv)
{
  qv_fuzz_init ();
  return 0;
}

int
LLVMFuzzerTestOneInput (const uint8_t *data, size_t size)
{
  qv_fuzz_read (data, size);
  return 0;
}
