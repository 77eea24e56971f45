#!/usr/bin/python3
"""The bad-input corpus: every row of tests/data/bad/expected.tsv runs the
quaver command on one broken or hostile file and must end with the exit code
and the message the row gives.

Contract (DESIGN.md §5, §7; issue 8): bad input exits 2 with
"quaver: FILE:LINE[:COL]: what was wrong" on stderr; nothing on stdout; no
crash (a signal), no sanitizer report, no hang (each run has a time limit),
and no file written or left behind next to the inputs.

Each run happens in a fresh temporary directory holding a copy of the
committed corpus, so the messages name the files exactly as the table does
(relative paths). Inputs too large or too odd to commit (a 100 MB line,
100 000-deep nesting, a million atoms, a symbolic link out of a bundle's
folder) are written there at test time by the generators below; a table row
uses them by name.

Table format (tab-separated, '#' starts a comment line):
    case  exit  arguments  stderr-substring
arguments are split like a shell would (shlex); leading NAME=VALUE words
are set in the environment (QV_TEST_PHYSICAL_MEMORY plays a small machine,
a test hook of qv-size.h); the substring is matched
after "quaver: " exactly (no patterns), or is "-" for no check (exit-0 rows,
which show the good companions of the bad files are good).

Usage: test_bad_corpus.py [--print]   (--print shows what each row gives)
"""
import os
import shlex
import shutil
import subprocess
import sys
import tempfile

sys.dont_write_bytecode = True

HERE = os.path.dirname(os.path.abspath(__file__))
SOURCE_ROOT = os.environ.get("QV_SOURCE_ROOT") or os.path.abspath(os.path.join(HERE, "..", ".."))
CORPUS = os.path.join(SOURCE_ROOT, "tests", "data", "bad")
TABLE = os.path.join(CORPUS, "expected.tsv")
QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", os.path.join(SOURCE_ROOT, "build")), "src", "cli", "quaver")
TIME_LIMIT = 120          # seconds per row: a hang is a failure, not a wait
SANITIZER_MARKS = ("ERROR: AddressSanitizer", "runtime error:", "ERROR: LeakSanitizer")

HUNDRED_MB = 100 * 1000 * 1000


def gen_xyz_long_line(path):
    # line 4: a y "coordinate" of 100 MB of digits ending in a letter
    with open(path, "w") as f:
        f.write("3\ninvented: a 100 MB line\nO 0.1 -0.2 0.3\nH 0.5 ")
        f.write("9" * HUNDRED_MB)
        f.write("x 1.1\nH -0.6 -0.7 0.5\n")


def gen_hess_long_line(path):
    # a valid 9×9 text Hessian whose row 3 ends in a 100 MB integer
    rows = open(os.path.join(CORPUS, "ok-water.hess")).read().splitlines()
    rows = [r for r in rows if r and not r.startswith("#")]
    with open(path, "w") as f:
        f.write(rows[0] + "\n" + rows[1] + "\n" + " ".join(rows[2].split()[:8]) + " ")
        f.write("7" * HUNDRED_MB)
        f.write("\n" + "\n".join(rows[3:]) + "\n")


def gen_deep_arrays(path):
    with open(path, "w") as f:
        f.write("[" * 100000 + "]" * 100000 + "\n")


def gen_deep_objects(path):
    with open(path, "w") as f:
        f.write('{"a":' * 100000 + "1" + "}" * 100000 + "\n")


def gen_million_atoms(path):
    # 10^6 argon atoms 4 Å apart on a line: it reads (within the XYZ
    # reader's limit of 10^7) but its 3·10^6-row Hessian would need 67 TiB
    with open(path, "w") as f:
        f.write("1000000\ninvented: a million argon atoms on a line\n")
        f.writelines("Ar %d 0 0\n" % (4 * i) for i in range(1000000))


def gen_bundle_symlink(path):
    # a bundle whose Hessian path is a symbolic link below its folder that
    # points outside it (to the committed corpus, outside the run folder)
    folder = os.path.dirname(path)
    os.makedirs(os.path.join(folder, "link-dir"), exist_ok=True)
    os.symlink(os.path.join(CORPUS, "npy-fortran.npy"), os.path.join(folder, "link-dir", "matrix.npy"))
    text = open(os.path.join(CORPUS, "bundle-path-ok.quaver.json")).read()
    with open(path, "w") as f:
        f.write(text.replace('"npy-fortran.npy"', '"link-dir/matrix.npy"'))


GENERATORS = {
    "gen-xyz-long-line.xyz": gen_xyz_long_line,
    "gen-hess-long-line.hess": gen_hess_long_line,
    "gen-deep-arrays.quaver.json": gen_deep_arrays,
    "gen-deep-objects.quaver.json": gen_deep_objects,
    "gen-million-atoms.xyz": gen_million_atoms,
    "gen-bundle-symlink.quaver.json": gen_bundle_symlink,
}


def read_table():
    rows = []
    with open(TABLE, encoding="utf-8") as f:
        for number, line in enumerate(f, 1):
            line = line.rstrip("\n")
            if not line.strip() or line.startswith("#"):
                continue
            cols = line.split("\t")
            if len(cols) != 4:
                sys.exit("%s:%d: expected 4 tab-separated columns, found %d" % (TABLE, number, len(cols)))
            words = shlex.split(cols[2])
            env = {}
            while words and "=" in words[0] and words[0].split("=")[0].isupper():
                key, value = words.pop(0).split("=", 1)
                env[key] = value
            rows.append((number, cols[0], int(cols[1]), words, env, cols[3]))
    return rows


def listing(folder):
    out = set()
    for root, dirs, files in os.walk(folder):
        for name in dirs + files:
            out.add(os.path.relpath(os.path.join(root, name), folder))
    return out


def main():
    show = "--print" in sys.argv[1:]
    rows = read_table()
    failures = []
    env = dict(os.environ, LC_ALL="C.UTF-8")
    seen = set()
    for number, case, code, args, extra_env, want in rows:
        if case in seen:
            failures.append("%s:%d: case %s is listed twice" % (TABLE, number, case))
        seen.add(case)
        with tempfile.TemporaryDirectory(prefix="qv-bad-") as tmp:
            run_dir = os.path.join(tmp, "run")
            shutil.copytree(CORPUS, run_dir, symlinks=True)
            for a in args:
                if a in GENERATORS:
                    GENERATORS[a](os.path.join(run_dir, a))
            before = listing(run_dir)
            try:
                p = subprocess.run([QUAVER] + args, cwd=run_dir, env=dict(env, **extra_env),
                                   stdin=subprocess.DEVNULL,
                                   capture_output=True, timeout=TIME_LIMIT)
            except subprocess.TimeoutExpired:
                failures.append("%s: no answer within %d s (a hang)" % (case, TIME_LIMIT))
                continue
            err = p.stderr.decode("utf-8", "replace")
            out = p.stdout.decode("utf-8", "replace")
            after = listing(run_dir)
        if show:
            print("%s\t%d\t%s" % (case, p.returncode, err.strip().replace("\n", " | ")))
        where = "%s (expected.tsv line %d)" % (case, number)
        if p.returncode < 0:
            failures.append("%s: killed by signal %d; stderr %r" % (where, -p.returncode, err[-2000:]))
            continue
        if any(m in err for m in SANITIZER_MARKS):
            failures.append("%s: sanitizer report: %r" % (where, err[-2000:]))
        if p.returncode != code:
            failures.append("%s: exit %d, expected %d; stderr %r" % (where, p.returncode, code, err.strip()[:500]))
        if after != before:
            failures.append("%s: files appeared or vanished: %s" % (where, sorted(after ^ before)))
        if code != 0:
            if out.strip():
                failures.append("%s: nothing expected on stdout, got %r" % (where, out[:200]))
            if want != "-" and ("quaver: " + want) not in err:
                failures.append("%s: stderr should contain %r; got %r" % (where, "quaver: " + want, err.strip()[:500]))
    for f in failures:
        print("FAIL: " + f, file=sys.stderr)
    print("bad-corpus: %d cases, %d failures" % (len(rows), len(failures)))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
