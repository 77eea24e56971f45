#!/usr/bin/python3
# check_schema.py — data/quaver-bundle.schema.json against the bundles.
#
#   check_schema.py SCHEMA TEST_DATA_DIR EXAMPLES_DIR FORMATS_MD
#
# With the python3-jsonschema package (Debian), draft 2020-12:
#  - the schema is itself a valid draft 2020-12 schema;
#  - every good-*.quaver.json in TEST_DATA_DIR and every *.quaver.json under
#    EXAMPLES_DIR validates;
#  - the bad bundles whose fault a schema can express are rejected (the rest
#    depend on the atom count or on files, and only the reader can check
#    them: tests/bundle/test-bundle.c);
#  - every bundle example in docs/formats.md validates and is, as JSON, one
#    of the good-docs-*.quaver.json files that the C test reads.
# SPDX-License-Identifier: GPL-3.0-or-later
import glob
import json
import os
import re
import sys

import jsonschema

# bad-NAME.quaver.json files the schema must reject.
SCHEMA_REJECTS = """
not-object format-missing format-wrong version-2 version-0 version-float
version-string version-missing title-type structure-type structure-missing
structure-key atoms-empty atoms-type atom-type element-z element-bool
element-missing position-count position-type label-type atom-key isotope-type
isotope-and-mass mass-zero mass-negative masses-model cell-shape pbc-no-cell
pbc-type energy-type both neither hessian-type units-missing
layout-auto-inline layout-missing layout-unknown data-and-path no-matrix
hessian-key row-type element-value-type path-absolute path-type modes-empty
modes-type modes-missing-vectors syntax-big-integer
""".split()


def strict_load(path):
    def no_constant(name):
        raise ValueError(f"{path}: {name} is not JSON")
    with open(path, encoding="utf-8") as f:
        return json.load(f, parse_constant=no_constant)


def errors_of(validator, instance):
    return sorted(validator.iter_errors(instance), key=lambda e: list(e.absolute_path))


def describe(error):
    where = "".join(f"[{p}]" if isinstance(p, int) else f".{p}" for p in error.absolute_path)
    return f"{where.lstrip('.') or '(top level)'}: {error.message}"


def main():
    if len(sys.argv) != 5:
        print(__doc__ or "usage: check_schema.py SCHEMA DATA EXAMPLES FORMATS_MD",
              file=sys.stderr)
        return 2
    schema_path, data_dir, examples_dir, formats_md = sys.argv[1:]
    failures = []
    checked = 0

    schema = strict_load(schema_path)
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)

    good = sorted(glob.glob(os.path.join(data_dir, "good-*.quaver.json")))
    examples = sorted(glob.glob(os.path.join(examples_dir, "**", "*.quaver.json"),
                                recursive=True))
    if not good:
        failures.append(f"{data_dir}: no good-*.quaver.json found")
    for path in good + examples:
        for e in errors_of(validator, strict_load(path)):
            failures.append(f"{path}: {describe(e)}")
        checked += 1
    print(f"{len(good)} test bundles and {len(examples)} examples checked")

    for name in SCHEMA_REJECTS:
        path = os.path.join(data_dir, f"bad-{name}.quaver.json")
        if not os.path.exists(path):
            failures.append(f"{path}: missing")
            continue
        if validator.is_valid(strict_load(path)):
            failures.append(f"{path}: accepted by the schema, which should refuse it")
        checked += 1

    # Bundle examples in the documentation.
    with open(formats_md, encoding="utf-8") as f:
        text = f.read()
    docs_files = {os.path.basename(p): strict_load(p)
                  for p in glob.glob(os.path.join(data_dir, "good-docs-*.quaver.json"))}
    matched = set()
    blocks = re.findall(r"```json\n(.*?)```", text, flags=re.S)
    for k, block in enumerate(blocks):
        if '"quaver-bundle"' not in block:
            continue
        try:
            doc = json.loads(block)
        except ValueError as e:
            failures.append(f"{formats_md}: bundle example {k + 1} is not JSON: {e}")
            continue
        for e in errors_of(validator, doc):
            failures.append(f"{formats_md}: bundle example {k + 1}: {describe(e)}")
        same = [name for name, value in docs_files.items() if value == doc]
        if not same:
            failures.append(f"{formats_md}: bundle example {k + 1} (title {doc.get('title')!r})"
                            " matches no good-docs-*.quaver.json in the test data")
        matched.update(same)
        checked += 1
    for name in sorted(set(docs_files) - matched):
        failures.append(f"{formats_md}: does not show {name}")

    for line in failures:
        print("FAIL", line)
    print(f"{checked} checks, {len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
