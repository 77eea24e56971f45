#!/usr/bin/python3
"""No lost work: the writers under a full disk.

A small LD_PRELOAD library (enospc-shim.c, built only for the tests) makes
write() to regular files fail with ENOSPC after a byte budget
(QV_ENOSPC_AFTER) or fsync() fail (QV_ENOSPC_FSYNC=1). Under it, each
command that writes — modes -o, displace, ensemble, picture — must:
  - exit 3 with a message naming the file and the reason on stderr;
  - leave no partial file and no temporary (hidden) file behind;
  - leave the outputs written before the failure complete and byte for byte
    as a run without the shim writes them, and an earlier output that the
    run was replacing (--force) untouched.
Without --force an existing output is refused (exit 3) and kept.
The contract is DESIGN.md §5/§7 and issue 8 ("No lost work"); the reference
for "complete" is the same command run without the shim.

Usage: test_no_lost_work.py SHIM.so
"""
import filecmp
import hashlib
import os
import shutil
import subprocess
import sys
import tempfile

sys.dont_write_bytecode = True
QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "build"), "src", "cli", "quaver")
SHIM = os.path.abspath(sys.argv[1])
failures = []
checks = 0


def ok(cond, msg):
    global checks
    checks += 1
    if not cond:
        failures.append(msg)
        print("FAIL: " + msg, file=sys.stderr, flush=True)
    return cond


def run(args, cwd, shim=None):
    """Runs quaver in @cwd; @shim: None (no preload) or a dict of the shim's
    variables (an empty dict preloads it without a limit)."""
    env = dict(os.environ, LC_ALL="C.UTF-8")
    for k in ("QV_ENOSPC_AFTER", "QV_ENOSPC_FSYNC"):
        env.pop(k, None)
    if shim is not None:
        env["LD_PRELOAD"] = SHIM
        env.update({k: str(v) for k, v in shim.items()})
        if os.environ.get("QV_SANITIZED") == "1":
            # the shim comes before the ASan runtime in the library list
            env["ASAN_OPTIONS"] = (os.environ.get("ASAN_OPTIONS", "") + ":verify_asan_link_order=0").lstrip(":")
    # a guard against a hang; under memcheck (tests/tools/run-valgrind.sh)
    # a GIF of the demo takes minutes, so the guard grows as meson's does
    limit = 120 * (30 if os.environ.get("QV_VALGRIND_QUAVER") else 1)
    p = subprocess.run([QUAVER] + args, cwd=cwd, env=env, capture_output=True, timeout=limit)
    p.err = p.stderr.decode("utf-8", "replace")
    ok(p.returncode >= 0, "%s: killed by signal %d" % (" ".join(args), -p.returncode))
    ok("Sanitizer" not in p.err and "runtime error:" not in p.err,
       "%s: sanitizer report %r" % (" ".join(args), p.err[-1500:]))
    return p


def tree(folder):
    """{relative path: sha256} of every file below @folder."""
    out = {}
    for root, dirs, files in os.walk(folder):
        for name in files:
            path = os.path.join(root, name)
            with open(path, "rb") as f:
                out[os.path.relpath(path, folder)] = hashlib.sha256(f.read()).hexdigest()
    return out


def hidden(folder):
    return sorted(p for p in tree(folder) if os.path.basename(p).startswith("."))


def expect_write_failure(label, p, path_word):
    ok(p.returncode == 3, "%s: exit %d, expected 3; stderr %r" % (label, p.returncode, p.err.strip()))
    ok("quaver: " in p.err and path_word in p.err and "No space left on device" in p.err,
       "%s: the message should name %s and the full disk; got %r" % (label, path_word, p.err.strip()))


with tempfile.TemporaryDirectory(prefix="qv-nlw-") as tmp:
    # --- the shim itself: preloaded without a limit, output is unchanged ---
    ref = os.path.join(tmp, "ref")
    os.mkdir(ref)
    p = run(["modes", "--demo", "-o", "table.txt"], ref)
    ok(p.returncode == 0, "modes -o without the shim: exit %d %r" % (p.returncode, p.err))
    same = os.path.join(tmp, "same")
    os.mkdir(same)
    p = run(["modes", "--demo", "-o", "table.txt"], same, shim={})
    ok(p.returncode == 0 and filecmp.cmp(os.path.join(ref, "table.txt"), os.path.join(same, "table.txt"), shallow=False),
       "the shim without a budget must pass writes through unchanged (exit %d)" % p.returncode)
    table_size = os.path.getsize(os.path.join(ref, "table.txt"))
    ok(table_size > 200, "the demo table is more than 200 bytes (%d), so a budget of 100 cuts it" % table_size)

    # --- one file: modes -o ----------------------------------------------
    for label, shim in (("no space at all", {"QV_ENOSPC_AFTER": 0}),
                        ("space for 100 bytes", {"QV_ENOSPC_AFTER": 100}),
                        ("fsync fails", {"QV_ENOSPC_FSYNC": 1})):
        d = os.path.join(tmp, "modes-" + str(len(os.listdir(tmp))))
        os.mkdir(d)
        p = run(["modes", "--demo", "-o", "table.txt"], d, shim)
        expect_write_failure("modes -o, " + label, p, "table.txt")
        ok(tree(d) == {}, "modes -o, %s: nothing may be left behind, found %s" % (label, sorted(tree(d))))
        # an earlier output being replaced with --force stays as it was
        earlier = os.path.join(d, "table.txt")
        with open(earlier, "w") as f:
            f.write("an earlier table the user wants to keep\n")
        before = tree(d)
        p = run(["modes", "--demo", "-o", "table.txt", "--force"], d, shim)
        expect_write_failure("modes -o --force, " + label, p, "table.txt")
        ok(tree(d) == before, "modes -o --force, %s: the earlier table.txt must be untouched" % label)

    # without --force an existing file is refused and kept (no shim needed)
    d = os.path.join(tmp, "exists")
    os.mkdir(d)
    with open(os.path.join(d, "table.txt"), "w") as f:
        f.write("keep me\n")
    p = run(["modes", "--demo", "-o", "table.txt"], d)
    ok(p.returncode == 3 and "exists; pass --force" in p.err, "modes -o over a file: exit %d %r" % (p.returncode, p.err))
    ok(open(os.path.join(d, "table.txt")).read() == "keep me\n", "modes -o over a file: kept")

    # standard output on a full device (/dev/full: every write is ENOSPC;
    # stdio's own writes cannot be reached by the shim)
    if os.path.exists("/dev/full"):
        for args in (["modes", "--demo"], ["modes", "--demo", "-f", "json"], ["table", "--demo"]):
            with open("/dev/full", "w") as full:
                env = dict(os.environ, LC_ALL="C.UTF-8")
                p = subprocess.run([QUAVER] + args, stdout=full, stderr=subprocess.PIPE, env=env, timeout=120)
            err = p.stderr.decode("utf-8", "replace")
            ok(p.returncode == 3 and "cannot write to standard output: No space left on device" in err,
               "%s > /dev/full: exit %d, expected 3 and the reason; stderr %r" % (" ".join(args), p.returncode, err))

    # --- several files: displace and ensemble into a directory -------------
    exports = [("displace", ["displace", "--demo", "--mode", "2", "--scan", "5", "-o", "out"]),
               ("ensemble", ["ensemble", "--demo", "-T", "300", "-n", "6", "--seed", "7", "-o", "out"])]
    for name, args in exports:
        clean = os.path.join(tmp, name + "-clean")
        os.mkdir(clean)
        p = run(args, clean)
        ok(p.returncode == 0, "%s without the shim: exit %d %r" % (name, p.returncode, p.err))
        files = tree(os.path.join(clean, "out"))
        ok(len(files) >= 3, "%s writes several files (%d)" % (name, len(files)))
        sizes = sorted(os.path.getsize(os.path.join(clean, "out", f)) for f in files)
        # a budget that lets some files through and stops one in the middle
        for label, budget in (("no space", 0), ("mid-export", sizes[0] + sizes[1] // 2),
                              ("at the manifest", sum(sizes) - 10)):
            d = os.path.join(tmp, "%s-%s" % (name, budget))
            os.mkdir(d)
            p = run(args, d, {"QV_ENOSPC_AFTER": budget})
            expect_write_failure("%s, %s" % (name, label), p, "out")
            got = tree(os.path.join(d, "out")) if os.path.isdir(os.path.join(d, "out")) else {}
            ok(hidden(os.path.join(d, "out")) == [] if got else True,
               "%s, %s: temporary files left: %s" % (name, label, hidden(os.path.join(d, "out"))))
            for f, digest in got.items():
                ok(files.get(f) == digest, "%s, %s: %s is partial or differs from a clean run" % (name, label, f))
            ok(len(got) < len(files), "%s, %s: the export cannot have completed (%d of %d files)"
               % (name, label, len(got), len(files)))
            ok("manifest.json" not in got, "%s, %s: no manifest for an export that failed" % (name, label))
        # replacing an earlier export (--force) under a full disk: the earlier
        # files are all still there and unchanged
        d = os.path.join(tmp, name + "-again")
        shutil.copytree(clean, d)
        before = tree(d)
        p = run(args + ["--force"], d, {"QV_ENOSPC_AFTER": 0})
        expect_write_failure("%s --force over an earlier export" % name, p, "out")
        ok(tree(d) == before, "%s --force over an earlier export: it must be untouched" % name)

    # --- pictures (builds with the renderer) -------------------------------
    probe = run(["picture", "--help"], tmp)
    if probe.returncode == 0:
        for fmt in ("png", "svg", "gif"):
            clean = os.path.join(tmp, "picture-" + fmt)
            os.mkdir(clean)
            args = ["picture", "--demo", "--mode", "2", "-o", "mode." + fmt]
            p = run(args, clean)
            ok(p.returncode == 0, "picture %s without the shim: exit %d %r" % (fmt, p.returncode, p.err))
            size = os.path.getsize(os.path.join(clean, "mode." + fmt)) if p.returncode == 0 else 0
            for budget in (0, size // 2):
                d = os.path.join(tmp, "picture-%s-%d" % (fmt, budget))
                os.mkdir(d)
                p = run(args, d, {"QV_ENOSPC_AFTER": budget})
                expect_write_failure("picture %s, budget %d" % (fmt, budget), p, "mode." + fmt)
                ok(tree(d) == {}, "picture %s, budget %d: left %s" % (fmt, budget, sorted(tree(d))))
            before = tree(clean)
            p = run(args + ["--force"], clean, {"QV_ENOSPC_FSYNC": 1})
            expect_write_failure("picture %s --force, fsync fails" % fmt, p, "mode." + fmt)
            ok(tree(clean) == before, "picture %s --force: the earlier picture must be untouched" % fmt)
    else:
        print("picture: not in this build (no renderer); its rows are skipped")

print("no-lost-work: %d checks, %d failures" % (checks, len(failures)))
sys.exit(1 if failures else 0)
