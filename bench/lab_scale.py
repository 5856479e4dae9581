#!/usr/bin/env python3
"""Scale benchmark: plumb against the plain sqlite3 shell on the same machine, in one run.

Generates an invented laboratory deterministically (fixed seed), then measures:
  1. `plumb check import` of 1,000,000 readings (100,000 runs), validated and audited, against the sqlite3
     shell's `.import` of the very same CSV into a bare table (target: within 2.5x);
  2. `plumb due --all` and `plumb summary` on 5,000 instruments and 2,000,000 readings against one sqlite3
     aggregate query over the same tables (target: within 3x), and their peak memory (target: < 100 MB).
Prints the figures and the ratios. Python 3 standard library only.

Usage: bench/lab_scale.py [--plumb build/plumb] [--work DIR] [--instruments 5000] [--runs 100000] [--repeat 3] [--keep]

The import is timed --repeat times on fresh copies (the shell's import into a fresh bare database, plumb's into a
fresh copy of the set-up lab) and the median of each is compared, because a shared machine's speed varies from
one minute to the next.
"""
import argparse
import datetime
import os
import random
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

SEED = 20261130
READINGS_PER_RUN = 10
WEIGHTS = 20
OPERATORS = ["Ada Quill", "Bo Lindqvist-Arnaud", "Cyrus Mendel", "Dana Okafor", "Eli Tanskanen"]
HEADER = "instrument,procedure,date,operator,weight,reading,unit\n"
FIRST_DAY = datetime.date(2018, 1, 1)


def run(cmd, **kw):
    return subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL, **kw)


class Timing:
    """Median wall time and median CPU time (user + system) of a command's runs, in seconds."""

    def __init__(self, wall, cpu):
        self.wall, self.cpu = wall, cpu

    def ratio(self, base):
        return f"wall {self.wall / base.wall:.2f}x, cpu {self.cpu / base.cpu:.2f}x"


def timed(cmd, repeat=1):
    """Runs `cmd` `repeat` times (output discarded). CPU time is reported beside wall time because the
    machine may be shared: wall time then depends on the neighbours, CPU time much less."""
    walls, cpus = [], []
    for _ in range(repeat):
        t0 = time.perf_counter()
        p = subprocess.Popen(cmd, stdout=subprocess.DEVNULL)
        _, status, usage = os.wait4(p.pid, 0)
        walls.append(time.perf_counter() - t0)
        if os.waitstatus_to_exitcode(status) != 0:
            sys.exit(f"bench: {' '.join(cmd)} failed")
        cpus.append(usage.ru_utime + usage.ru_stime)
    return Timing(statistics.median(walls), statistics.median(cpus))


def peak_kib(cmd):
    """Maximum resident set size of `cmd` from GNU time -v, in KiB."""
    r = subprocess.run(["/usr/bin/time", "-v"] + cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                       text=True, check=True)
    return int(re.search(r"Maximum resident set size \(kbytes\): (\d+)", r.stderr).group(1))


def balance_id(k):
    return f"BAL-{k:05d}"


def setup_lab(plumb, db, instruments):
    """The lab, 20 reference weights with long-valid certificates, and the balances, through plumb itself."""
    run([plumb, "--db", db, "init", "--lab", "Bench Scale Laboratory"])
    for w in range(1, WEIGHTS + 1):
        run([plumb, "--db", db, "weight", "add", f"W{w:03d}", "--nominal", "100g", "--class", "E2", "--correction",
             "0.02mg", "--uncertainty", "0.05mg", "--k", "2", "--certificate", f"BENCH-CERT-{w}", "--calibrated",
             "2017-06-01", "--due", "2030-06-01", "--by", "Bench Setup"])
    # Registering thousands of balances one command each is setup, not measured; two at a time.
    procs = []
    for k in range(1, instruments + 1):
        procs.append(subprocess.Popen([plumb, "--db", db, "balance", "add", balance_id(k), "--capacity", "220g",
                                       "--readability", "0.1mg", "--every", "30d", "--smallest-net", "200mg",
                                       "--location", f"Building {k % 7 + 1}, room {k % 40 + 1}", "--since",
                                       "2017-12-01", "--by", "Bench Setup"], stdout=subprocess.DEVNULL))
        if len(procs) == 2:
            for p in procs:
                if p.wait() != 0:
                    sys.exit("bench: balance add failed")
            procs = []
    for p in procs:
        if p.wait() != 0:
            sys.exit("bench: balance add failed")


def write_history(path, rng, instruments, runs, first_slot):
    """`runs` runs of READINGS_PER_RUN readings, spread evenly over the instruments, 30 days apart."""
    per_instrument = runs // instruments
    with open(path, "w", newline="") as f:
        f.write(HEADER)
        for k in range(1, instruments + 1):
            weight = f"W{(k % WEIGHTS) + 1:03d}"
            for j in range(first_slot, first_slot + per_instrument):
                day = FIRST_DAY + datetime.timedelta(days=30 * j + k % 30)
                operator = OPERATORS[rng.randrange(len(OPERATORS))]
                # About 2 % of runs scatter widely: their repeatability fails USP <41> (a real failure to find
                # in the history); the others scatter within +-0.1 mg and mostly pass.
                spread = 4 if rng.random() < 0.02 else 1
                rows = []
                for _ in range(READINGS_PER_RUN):
                    tenths_mg = 1000000 + rng.randint(-spread, spread)
                    rows.append(f"{balance_id(k)},repeatability,{day.isoformat()},{operator},{weight},"
                                f"{tenths_mg // 10000}.{tenths_mg % 10000:04d},g\n")
                f.write("".join(rows))


def cpu_model():
    try:
        with open("/proc/cpuinfo") as f:
            for line in f:
                if line.startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return "unknown"


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--plumb", default="build/plumb")
    ap.add_argument("--work", default=None, help="scratch folder (default: a temporary one, removed at the end)")
    ap.add_argument("--instruments", type=int, default=5000)
    ap.add_argument("--runs", type=int, default=100000, help="runs per import file (10 readings each)")
    ap.add_argument("--repeat", type=int, default=3, help="timed imports of each kind (the median is compared)")
    ap.add_argument("--keep", action="store_true", help="keep the scratch folder")
    args = ap.parse_args()
    plumb = os.path.abspath(args.plumb)
    work = args.work or tempfile.mkdtemp(prefix="plumb-bench-")
    os.makedirs(work, exist_ok=True)
    db = os.path.join(work, "lab.db")
    bare = os.path.join(work, "bare.db")
    first, second = os.path.join(work, "history-1.csv"), os.path.join(work, "history-2.csv")
    for p in (db, bare):
        for suffix in ("", "-wal", "-shm"):
            if os.path.exists(p + suffix):
                os.remove(p + suffix)
    env_note = f"nproc {os.cpu_count()}, {cpu_model()}, load before start {os.getloadavg()[0]:.2f}"
    print(f"plumb scale bench, {datetime.datetime.now(datetime.timezone.utc):%Y-%m-%d %H:%M} UTC; {env_note}")

    t0 = time.perf_counter()
    setup_lab(plumb, db, args.instruments)
    rng = random.Random(SEED)
    per = args.runs // args.instruments
    write_history(first, rng, args.instruments, args.runs, 0)
    write_history(second, rng, args.instruments, args.runs, per)
    readings = args.instruments * per * READINGS_PER_RUN
    print(f"setup: {args.instruments} balances, 2 files of {readings} readings ({os.path.getsize(first) / 1e6:.1f} MB "
          f"each) in {time.perf_counter() - t0:.1f} s")

    # 1. Import: the shell's .import of the same CSV into a bare table (created from the header) vs plumb, each
    #    repeated on a fresh database; the medians are compared.
    setup_copy = os.path.join(work, "lab-setup.db")
    shutil.copyfile(db, setup_copy)
    sqlite_runs, plumb_runs = [], []
    for _ in range(args.repeat):
        for p in (bare, db, db + "-wal", db + "-shm"):
            if os.path.exists(p):
                os.remove(p)
        shutil.copyfile(setup_copy, db)
        sqlite_runs.append(timed(["sqlite3", bare, ".mode csv", f".import {first} history"]))
        plumb_runs.append(timed([plumb, "--db", db, "check", "import", first, "--by", "Bench Import"]))
    median = lambda runs: Timing(statistics.median(t.wall for t in runs), statistics.median(t.cpu for t in runs))
    t_sqlite_import, t_plumb_import = median(sqlite_runs), median(plumb_runs)
    walls = lambda runs: ", ".join(f"{t.wall:.2f}" for t in runs)
    failed = subprocess.run(["sqlite3", db, "SELECT sum(verdict = 'fail'), count(*) FROM check_runs"],
                            check=True, capture_output=True, text=True).stdout.strip().split("|")
    print(f"\n1. import of {readings} readings ({readings // READINGS_PER_RUN} runs; {failed[0]} of {failed[1]} runs fail)")
    print(f"   sqlite3 .import into a bare table:       wall {t_sqlite_import.wall:8.2f} s  cpu {t_sqlite_import.cpu:8.2f} s"
          f"   (median of {args.repeat}; walls {walls(sqlite_runs)})")
    print(f"   plumb check import (validated, audited): wall {t_plumb_import.wall:8.2f} s  cpu {t_plumb_import.cpu:8.2f} s"
          f"   (median of {args.repeat}; walls {walls(plumb_runs)})")
    print(f"   ratio plumb / sqlite3: {t_plumb_import.ratio(t_sqlite_import)} (target <= 2.5x)")
    print(f"   database after the import {os.path.getsize(db) / 1e6:.0f} MB, the shell's bare table {os.path.getsize(bare) / 1e6:.0f} MB")

    # Second file so that the lab holds twice as many readings for the status queries.
    t_second = timed([plumb, "--db", db, "check", "import", second, "--by", "Bench Import"])
    total = 2 * readings
    print(f"   (second file imported in {t_second.wall:.2f} s wall, {t_second.cpu:.2f} s cpu; "
          f"the lab now holds {total} readings)")

    # 2. Status on the full lab: one aggregate query in the shell vs plumb's due list and summary.
    aggregate = ("SELECT instrument_id, max(performed_on), count(*), sum(verdict = 'fail') "
                 "FROM check_runs GROUP BY instrument_id;")
    t_sqlite_status = timed(["sqlite3", db, aggregate], repeat=5)
    due = [plumb, "--db", db, "due", "--all", "--on", "2026-06-01", "--format", "csv"]
    summary = [plumb, "--db", db, "summary", "--on", "2026-06-01", "--format", "csv"]
    t_due = timed(due, repeat=5)
    t_summary = timed(summary, repeat=5)
    ms = lambda t: f"wall {t.wall * 1000:7.1f} ms  cpu {t.cpu * 1000:7.1f} ms"
    print(f"\n2. lab status on {args.instruments} instruments and {total} readings (median of 5)")
    print(f"   sqlite3 one aggregate query: {ms(t_sqlite_status)}")
    print(f"   plumb due --all:             {ms(t_due)}   ratio {t_due.ratio(t_sqlite_status)} (target <= 3x)")
    print(f"   plumb summary:               {ms(t_summary)}   ratio {t_summary.ratio(t_sqlite_status)} (target <= 3x)")
    m_due, m_summary = peak_kib(due), peak_kib(summary)
    print(f"   peak memory: due {m_due / 1024:.1f} MiB, summary {m_summary / 1024:.1f} MiB (target < 100 MB)")
    print(f"   database size {os.path.getsize(db) / 1e6:.0f} MB")

    if not args.keep and not args.work:
        shutil.rmtree(work)
    elif not args.keep:
        for p in (first, second, bare, db, db + "-wal", db + "-shm", os.path.join(work, "lab-setup.db")):
            if os.path.exists(p):
                os.remove(p)


if __name__ == "__main__":
    main()
