#!/usr/bin/python3
# compare.py — benchmark (not a test): Quaver against NumPy on one system.
# SPDX-License-Identifier: GPL-3.0-or-later
#
# 1. bench-solve --write makes the benchmark system (invented: a dense
#    spring network of N atoms, see bench-solve.c) as DIR/bench-N.xyz and
#    DIR/bench-N.npy; this script writes the same matrix as full text with
#    numpy.savetxt(fmt='%.16e').
# 2. NumPy side, built here independently of Quaver, as DESIGN §2 says:
#    symmetrize, K = M^-1/2 H M^-1/2 with most-abundant-isotope masses from
#    periodictable, rigid-body space (3 translations, 3 rotations about the
#    centre of mass, mass weighted, orthonormalised by SVD with a rank
#    tolerance), K'' = K - V W^T - W V^T + sigma V V^T with
#    W = K V - 1/2 V (V^T K V), sigma = 1.05 x a Gershgorin bound. Then
#    numpy.linalg.eigh(K''), best of R, construction not timed.
# 3. Quaver side: bench-solve (qv_solve alone), the `quaver modes` command
#    end to end (read .npy + solve + JSON output, peak RSS by
#    /usr/bin/time -v), bench-read (qv_hessian_read_file on the text and the
#    .npy) against numpy.loadtxt. The measurements run in R rounds (default
#    3), each round every side once, so that load from elsewhere on the
#    machine hits both sides alike; the best round of each figure counts
#    (the largest peak RSS).
# 4. Prints the figures, the ratios and PASS/MISS against the targets of the
#    issue. Always exits 0 when it could measure: targets are reported, never
#    asserted (DESIGN §7).
#
# OPENBLAS_NUM_THREADS is set to the same value for every side: the number of
# CPUs this process may use (2 on the reference machine), unless --threads.

import argparse
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import time

MIB = 1024.0 * 1024.0

# Targets of the issue.
TARGET_FULL_VS_EIGH = 1.10       # qv full solve time <= 1.10 x numpy eigh
TARGET_LOWEST_SPEEDUP = 2.0      # full / --lowest 20 >= 2
TARGET_TEXT_VS_LOADTXT = 3.0     # loadtxt / quaver text read >= 3
TARGET_MEM_FULL = (3.2, 64.0)    # peak RSS <= 3.2 x matrix + 64 MiB
TARGET_MEM_LOWEST = (1.5, 64.0)  # peak RSS <= 1.5 x matrix + 64 MiB


def parse_args():
    p = argparse.ArgumentParser(description='Quaver against NumPy: the benchmark report')
    p.add_argument('--atoms', type=int, default=1000)
    p.add_argument('--repeat', type=int, default=3, help='runs of each timing; best counts')
    p.add_argument('--lowest', type=int, default=20)
    p.add_argument('--threads', type=int, default=None,
                   help='OPENBLAS_NUM_THREADS for every side (default: CPUs available)')
    p.add_argument('--quaver', default=os.environ.get('QUAVER'))
    p.add_argument('--bench-solve', required=True)
    p.add_argument('--bench-read', required=True)
    p.add_argument('--wait-quiet', type=float, default=0.0, metavar='SECONDS',
                   help='before each round wait up to SECONDS for the CPUs to be idle '
                        '(>= 90%% over 3 s); for measuring on a shared machine')
    p.add_argument('--workdir', default=None,
                   help='keep the generated files here (reused when present); '
                        'default: a temporary directory, removed afterwards')
    return p.parse_args()


ARGS = parse_args()
THREADS = ARGS.threads or len(os.sched_getaffinity(0))
# Before numpy is imported, so that its OpenBLAS sees it too.
os.environ['OPENBLAS_NUM_THREADS'] = str(THREADS)
os.environ.pop('MALLOC_PERTURB_', None)   # meson sets it for tests; it touches memory
os.environ['LC_ALL'] = 'C.UTF-8'

import numpy as np            # noqa: E402
import periodictable          # noqa: E402


def log(*a):
    print(*a, flush=True)


def run(cmd, **kw):
    return subprocess.run(cmd, check=True, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                          text=True, **kw)


def json_lines(text):
    return [json.loads(line[5:]) for line in text.splitlines() if line.startswith('JSON ')]


def best_of(fn, repeat):
    times = []
    result = None
    for _ in range(repeat):
        t0 = time.perf_counter()
        result = fn()
        times.append(time.perf_counter() - t0)
    return min(times), max(times), result


# ---------------------------------------------------------------- the system

def make_system(workdir, atoms):
    stem = os.path.join(workdir, 'bench-%d' % atoms)
    xyz, npy, txt = stem + '.xyz', stem + '.npy', stem + '.txt'
    # (Re)made when missing or older than the bench-solve that makes them.
    if not (os.path.exists(xyz) and os.path.exists(npy)) or \
            os.path.getmtime(npy) < os.path.getmtime(ARGS.bench_solve):
        run([ARGS.bench_solve, '--atoms', str(atoms), '--write', workdir])
    if not os.path.exists(txt) or os.path.getmtime(txt) < os.path.getmtime(npy):
        t0 = time.perf_counter()
        np.savetxt(txt + '.part', np.load(npy), fmt='%.16e')
        os.replace(txt + '.part', txt)
        log('wrote %s with numpy.savetxt in %.1f s' % (txt, time.perf_counter() - t0))
    return xyz, npy, txt


def read_xyz(path):
    with open(path) as f:
        lines = f.read().splitlines()
    n = int(lines[0])
    symbols, pos = [], np.empty((n, 3))
    for a, line in enumerate(lines[2:2 + n]):
        f = line.split()
        symbols.append(f[0])
        pos[a] = [float(x) for x in f[1:4]]
    return symbols, pos


def isotopic_mass(symbol):
    """Mass of the most abundant isotope, from periodictable (Debian)."""
    el = getattr(periodictable, symbol)
    best = max((el[i] for i in el.isotopes), key=lambda iso: iso.abundance)
    return best.mass


# ---------------------------------------------------------------- NumPy side

def numpy_projected(H, symbols, pos):
    """K'' of DESIGN §2, built with NumPy only."""
    masses = np.array([isotopic_mass(s) for s in symbols])
    n = H.shape[0]
    H = 0.5 * (H + H.T)
    s = np.repeat(1.0 / np.sqrt(masses), 3)
    K = H * s[:, None] * s[None, :]
    # Rigid-body space: translations sqrt(m) e_c, rotations sqrt(m) (e_b x r).
    com = (masses[:, None] * pos).sum(0) / masses.sum()
    r = pos - com
    sm = np.sqrt(masses)
    cols = []
    for c in range(3):
        t = np.zeros((len(masses), 3))
        t[:, c] = sm
        cols.append(t.ravel())
    for b in range(3):
        e = np.zeros(3)
        e[b] = 1.0
        cols.append((np.cross(e, r) * sm[:, None]).ravel())
    A = np.array(cols).T
    U, sv, _ = np.linalg.svd(A, full_matrices=False)
    V = U[:, sv > 1e-6 * sv[0]]
    KV = K @ V
    W = KV - 0.5 * V @ (V.T @ KV)
    sigma = 1.05 * np.abs(K).sum(axis=1).max()
    Kpp = K - V @ W.T - W @ V.T + sigma * (V @ V.T)
    return np.ascontiguousarray(Kpp), V.shape[1], n


# ---------------------------------------------------------------- Quaver side

def peak_rss_run(cmd):
    """Wall time (s), peak RSS (MiB) and stderr of one run of cmd."""
    if os.access('/usr/bin/time', os.X_OK):
        t0 = time.perf_counter()
        p = subprocess.run(['/usr/bin/time', '-v'] + cmd, stdout=subprocess.PIPE,
                           stderr=subprocess.PIPE, text=True)
        wall = time.perf_counter() - t0
        m = re.search(r'Maximum resident set size \(kbytes\): (\d+)', p.stderr)
        rss = int(m.group(1)) / 1024.0 if m else float('nan')
        how = '/usr/bin/time -v'
    else:
        # A fresh Python parent per run, so RUSAGE_CHILDREN holds this run only.
        helper = ('import resource,subprocess,sys,time\n'
                  't=time.perf_counter();r=subprocess.run(sys.argv[1:]).returncode\n'
                  'print(time.perf_counter()-t, resource.getrusage(resource.RUSAGE_CHILDREN)'
                  '.ru_maxrss, r, file=sys.stderr)\nsys.exit(r)')
        p = subprocess.run([sys.executable, '-c', helper] + cmd, stdout=subprocess.PIPE,
                           stderr=subprocess.PIPE, text=True)
        last = p.stderr.strip().splitlines()[-1].split()
        wall, rss = float(last[0]), int(last[1]) / 1024.0
        how = 'getrusage(RUSAGE_CHILDREN)'
    if p.returncode != 0:
        raise RuntimeError('%s failed (exit %d):\n%s' % (' '.join(cmd), p.returncode, p.stderr))
    return wall, rss, how


def cpu_jiffies():
    """(busy, total) jiffies of all CPUs from /proc/stat."""
    with open('/proc/stat') as f:
        v = [int(x) for x in f.readline().split()[1:]]
    idle = v[3] + v[4]
    return sum(v[:8]) - idle, sum(v[:8])


class OthersMeter:
    """Share of the machine's CPU time used by other processes between start()
    and stop(): system-wide busy time from /proc/stat minus this process and
    its waited-for children (os.times)."""

    def start(self):
        self.j0, self.t0 = cpu_jiffies(), os.times()
        return self

    def stop(self):
        j1, t1 = cpu_jiffies(), os.times()
        hz = os.sysconf('SC_CLK_TCK')
        busy = (j1[0] - self.j0[0]) / hz
        total = (j1[1] - self.j0[1]) / hz
        own = sum(t1[:4]) - sum(self.t0[:4])
        self.share = max(0.0, busy - own) / total if total > 0 else 0.0


def wait_quiet(limit):
    deadline = time.monotonic() + limit
    while time.monotonic() < deadline:
        b0 = cpu_jiffies()
        time.sleep(3)
        b1 = cpu_jiffies()
        if b1[1] > b0[1] and (b1[0] - b0[0]) / (b1[1] - b0[1]) < 0.10:
            return True
    return False


def verdict(ok):
    return 'PASS' if ok else 'MISS'


def main():
    if not ARGS.quaver or not os.access(ARGS.quaver, os.X_OK):
        log('compare.py: no quaver executable (--quaver or $QUAVER)')
        return 1
    own_dir = ARGS.workdir is None
    workdir = tempfile.mkdtemp(prefix='quaver-compare-') if own_dir else ARGS.workdir
    os.makedirs(workdir, exist_ok=True)
    R = ARGS.repeat
    try:
        return measure(workdir, R)
    finally:
        if own_dir:
            shutil.rmtree(workdir, ignore_errors=True)


def measure(workdir, R):
    load_start = os.getloadavg()[0]
    xyz, npy, txt = make_system(workdir, ARGS.atoms)
    H = np.load(npy)
    n = H.shape[0]
    matrix_mib = n * n * 8 / MIB
    log('system: %d atoms, %dx%d Hessian (%.2f MiB), OPENBLAS_NUM_THREADS=%d, %d rounds, '
        'load average %.2f' % (ARGS.atoms, n, n, matrix_mib, THREADS, R, load_start))
    symbols, pos = read_xyz(xyz)
    Kpp, rank, _ = numpy_projected(H, symbols, pos)

    out_json = os.path.join(workdir, 'modes.json')
    base = [ARGS.quaver, 'modes', xyz, '--hessian', npy, '--hessian-units', 'eV/A^2',
            '--format', 'json', '--output', out_json, '--force']
    lowest_cmd = base + ['--lowest', str(ARGS.lowest)]

    # Rounds: every side once per round, so that load from elsewhere on the
    # machine hits both sides alike; the best of the rounds counts.
    eigh_t, bs_runs, full_cli, low_cli, read_runs, loadtxt_t = [], [], [], [], [], []
    doc_full = doc_low = None
    others = []
    for rnd in range(R):
        quiet = wait_quiet(ARGS.wait_quiet) if ARGS.wait_quiet > 0 else None
        meter = OthersMeter().start()
        t0 = time.perf_counter()
        w_np, _ = np.linalg.eigh(Kpp)
        eigh_t.append(time.perf_counter() - t0)
        del _

        out = run([ARGS.bench_solve, '--atoms', str(ARGS.atoms), '--repeat', '1',
                   '--lowest', str(ARGS.lowest), '--lapack-stages', '--json']).stdout
        if rnd == 0:
            log(out.rstrip())
        bs_runs.append(json_lines(out)[0])

        full_cli.append(peak_rss_run(base))
        if doc_full is None:
            with open(out_json) as f:
                doc_full = json.load(f)
        low_cli.append(peak_rss_run(lowest_cmd))
        if doc_low is None:
            with open(out_json) as f:
                doc_low = json.load(f)

        out = run([ARGS.bench_read, '--repeat', '1', '--json', txt, npy]).stdout
        if rnd == 0:
            log(out.rstrip())
        read_runs.append(json_lines(out))
        t0 = time.perf_counter()
        A = np.loadtxt(txt)
        loadtxt_t.append(time.perf_counter() - t0)
        loadtxt_same = bool(np.array_equal(A, H))
        del A
        meter.stop()
        others.append(meter.share)
        bsr = bs_runs[-1]
        log('round %d: eigh %.3f s | qv_solve all %.3f s, lowest %.3f s, dsyevd %.3f s | '
            'quaver modes all %.3f s %.1f MiB, lowest %.3f s %.1f MiB | read text %.3f s, '
            'loadtxt %.3f s | other processes used %.0f%% of the CPUs%s'
            % (rnd + 1, eigh_t[-1], bsr['full']['best_s'], bsr['lowest']['best_s'],
               bsr['dsyevd_s'], full_cli[-1][0], full_cli[-1][1], low_cli[-1][0],
               low_cli[-1][1], read_runs[-1][0]['best_s'], loadtxt_t[-1], 100 * meter.share,
               '' if quiet is None else ' (started quiet)' if quiet else
               ' (started without a quiet moment)'))
    w_np = w_np[:n - rank]
    del Kpp

    t_eigh = min(eigh_t)
    full = min(b['full']['best_s'] for b in bs_runs)
    low = min(b['lowest']['best_s'] for b in bs_runs)
    t_dsyevd = min(b['dsyevd_s'] for b in bs_runs)
    prep = min(b['symmetrize_s'] + b['mass_weight_s'] + b['rigid_body_s'] + b['projection_s']
               for b in bs_runs)
    full_wall = min(r[0] for r in full_cli)
    full_rss = max(r[1] for r in full_cli)
    low_wall = min(r[0] for r in low_cli)
    low_rss = max(r[1] for r in low_cli)
    rss_how = full_cli[0][2]
    t_read_txt = min(r[0]['best_s'] for r in read_runs)
    t_read_npy = min(r[1]['best_s'] for r in read_runs)
    txt_npy_diff = read_runs[0][1]['max_diff_from_first']
    t_loadtxt = min(loadtxt_t)
    t_npload, _, _ = best_of(lambda: np.load(npy), R)

    # Diagnostics, one run each: the output format's share of the peak, and
    # the command from the text file.
    csv_wall, csv_rss, _ = peak_rss_run(base[:-5] + ['--format', 'csv', '--output', out_json,
                                                     '--force'])
    txt_wall, txt_rss, _ = peak_rss_run([ARGS.quaver, 'modes', xyz, '--hessian', txt,
                                         '--hessian-units', 'eV/A^2', '--lowest',
                                         str(ARGS.lowest), '--format', 'json',
                                         '--output', out_json, '--force'])
    load_end = os.getloadavg()[0]

    # Sanity: the same eigenvalues on both sides.
    w_q = np.array([m['eigenvalue'] for m in doc_full['modes']])
    w_ql = np.array([m['eigenvalue'] for m in doc_low['modes']])
    scale = np.abs(w_np).max()
    agree_full = np.abs(w_q - w_np).max() / scale if len(w_q) == len(w_np) else float('nan')
    agree_low = np.abs(w_ql - w_np[:len(w_ql)]).max() / scale

    # --- Report
    mem_full_lim = TARGET_MEM_FULL[0] * matrix_mib + TARGET_MEM_FULL[1]
    mem_low_lim = TARGET_MEM_LOWEST[0] * matrix_mib + TARGET_MEM_LOWEST[1]
    rows = [
        ('full solve: qv_solve / numpy eigh', '%.3f / %.3f s' % (full, t_eigh),
         full / t_eigh, '<= %.2f' % TARGET_FULL_VS_EIGH, full / t_eigh <= TARGET_FULL_VS_EIGH),
        ('--lowest %d: qv_solve all / lowest' % ARGS.lowest, '%.3f / %.3f s' % (full, low),
         full / low, '>= %.1f' % TARGET_LOWEST_SPEEDUP, full / low >= TARGET_LOWEST_SPEEDUP),
        ('text read: numpy.loadtxt / quaver', '%.3f / %.3f s' % (t_loadtxt, t_read_txt),
         t_loadtxt / t_read_txt, '>= %.1f' % TARGET_TEXT_VS_LOADTXT,
         t_loadtxt / t_read_txt >= TARGET_TEXT_VS_LOADTXT),
        ('peak RSS, all modes (.npy, json)', '%.1f MiB' % full_rss, full_rss / matrix_mib,
         '<= %.1f MiB' % mem_full_lim, full_rss <= mem_full_lim),
        ('peak RSS, --lowest %d (.npy, json)' % ARGS.lowest, '%.1f MiB' % low_rss,
         low_rss / matrix_mib, '<= %.1f MiB' % mem_low_lim, low_rss <= mem_low_lim),
    ]
    log('')
    log('== Quaver vs NumPy, %d atoms (%dx%d), OPENBLAS_NUM_THREADS=%d (both sides), '
        'best of %d rounds' % (ARGS.atoms, n, n, THREADS, R))
    log('%-40s %-22s %8s  %-14s %s' % ('target', 'figures', 'ratio', 'target', ''))
    for name, figs, ratio, target, ok in rows:
        log('%-40s %-22s %8.3f  %-14s %s' % (name, figs, ratio, target, verdict(ok)))
    log('(memory ratio column: peak RSS / matrix size of %.2f MiB)' % matrix_mib)
    log('')
    log('context (not targets):')
    log('  per round: qv_solve all / eigh %s; qv_solve all / lowest %s; loadtxt / quaver text %s'
        % (', '.join('%.3f' % (b['full']['best_s'] / e) for b, e in zip(bs_runs, eigh_t)),
           ', '.join('%.2f' % (b['full']['best_s'] / b['lowest']['best_s']) for b in bs_runs),
           ', '.join('%.1f' % (t / r[0]['best_s']) for t, r in zip(loadtxt_t, read_runs))))
    log('  dsyevd alone (bench-solve)               %.3f s; qv_solve all / dsyevd = %.3f'
        % (t_dsyevd, full / t_dsyevd))
    log('  preparation (symmetrize+mass weight+projection, bench-solve) %.3f s' % prep)
    stage = {k: min(b[k] for b in bs_runs) for k in
             ('dsytrd_s', 'dstedc_s', 'dormtr_all_s', 'dstemr_s', 'dormtr_lowest_s')}
    log('  inside LAPACK (bench-solve --lapack-stages): dsytrd %.3f s, then for all modes '
        'dstedc %.3f s + dormtr %.3f s, for the lowest %d+8 dstemr %.3f s + dormtr %.3f s'
        % (stage['dsytrd_s'], stage['dstedc_s'], stage['dormtr_all_s'], ARGS.lowest,
           stage['dstemr_s'], stage['dormtr_lowest_s']))
    log('  quaver modes end to end (.npy, json), all  %.3f s; / numpy eigh = %.3f'
        % (full_wall, full_wall / t_eigh))
    log('  quaver modes end to end (.npy, json), --lowest %d  %.3f s; all / lowest = %.2f'
        % (ARGS.lowest, low_wall, full_wall / low_wall))
    log('  quaver modes end to end (.npy, csv), all  %.3f s, peak %.1f MiB' % (csv_wall, csv_rss))
    log('  quaver modes end to end (text, json), --lowest %d  %.3f s, peak %.1f MiB'
        % (ARGS.lowest, txt_wall, txt_rss))
    log('  .npy read: quaver %.3f s, numpy.load %.3f s' % (t_read_npy, t_npload))
    log('  text and .npy read back identically: quaver %s (max diff %g), numpy.loadtxt %s'
        % (txt_npy_diff == 0, txt_npy_diff, loadtxt_same))
    log('  eigenvalues agree with numpy to %.1e (all), %.1e (lowest) relative to max|lambda|'
        % (agree_full, agree_low))
    log('  peak RSS measured with %s; times are wall clock (time.perf_counter, '
        'g_get_monotonic_time)' % rss_how)
    log('  other processes used %s of the CPUs during the rounds; load average %.2f at the '
        'start, %.2f at the end%s'
        % (', '.join('%.0f%%' % (100 * x) for x in others), load_start, load_end,
           '' if min(others) < 0.05 else
           ': no round ran alone, the figures may be slow and noisy'))
    log('  the full-solve and --lowest targets are compared on qv_solve alone (bench-solve); '
        'the text target on qv_hessian_read_file alone (bench-read); memory on the command')
    return 0


if __name__ == '__main__':
    sys.exit(main())
