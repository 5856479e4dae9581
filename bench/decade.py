#!/usr/bin/env python3
"""Decade bench: a generated lab grown in steps (e.g. 100,000 -> 1,000,000 -> 4,000,000 readings) and, at each
size, the commands an inspector and the lab's staff run, each against a floor measured in the same run.

Per size it prints, for each command: wall time, CPU time (user + system, from wait4) and peak memory (the
child's maximum resident set size, from wait4), the ratios to its floor, and the growth exponent of the wall time
from the size before (log(t2/t1) / log(n2/n1): 0 is flat, 1 linear). On a shared machine the CPU ratio is the
steadier one (wall time then depends on the neighbours). The floors:
  import          the sqlite3 shell's `.import` of the same CSV into a fresh bare table
  audit verify    sha256sum of the database file + sqlite3 `PRAGMA integrity_check`
  backup          a plain copy of the file (cp) + plumb's own verification (`audit verify`) of the database
  due, summary    one sqlite3 aggregate query over check_runs (GROUP BY instrument_id)
  check record    the sqlite3 shell inserting one run's 10 readings into the bare table
  check show, certificate PDF, history chart, one-instrument report
                  the sqlite3 shell selecting the readings of that run / instrument
Python 3 standard library only. Not a test: nothing here fails a build; it prints figures for bench/RESULTS.md.

Usage: bench/decade.py [--plumb build/plumb] [--work DIR] [--sizes 100000,1000000,4000000] [--instruments 5000]
                       [--repeat 3] [--keep]
The scratch folder (default: a temporary one) is removed at the end unless --keep. Sizes that do not fit the
free disk (about 800 bytes per reading: the lab, its backup copy and the CSV) are skipped and said so.
"""
import argparse
import datetime
import math
import os
import random
import shutil
import statistics
import subprocess
import sys
import tempfile
import time

SEED = 20261203
READINGS_PER_RUN = 10
WEIGHTS = 20
OPERATORS = ["Ada Quill", "Bo Lindqvist-Arnaud", "Cyrus Mendel", "Dana Okafor", "Eli Tanskanen"]
HEADER = "instrument,procedure,date,operator,weight,reading,unit\n"
FIRST_DAY = datetime.date(2017, 1, 2)  # moved back in main() when the largest size needs more weeks than since then
BYTES_PER_READING_ON_DISK = 800  # the lab (about 340), its backup copy (340) and the CSV (65)


class Run:
    def __init__(self, wall, cpu, rss_kib):
        self.wall, self.cpu, self.rss_kib = wall, cpu, rss_kib

    def __add__(self, other):  # two commands one after the other: times add, memory is the larger
        return Run(self.wall + other.wall, self.cpu + other.cpu, max(self.rss_kib, other.rss_kib))


def measure(cmd, env=None, repeat=1, stdout=subprocess.DEVNULL):
    """Median wall, median CPU and largest peak RSS of `repeat` runs of `cmd`."""
    walls, cpus, rss = [], [], []
    for _ in range(repeat):
        t0 = time.perf_counter()
        p = subprocess.Popen(cmd, stdout=stdout, stderr=subprocess.PIPE, env=env)
        _, status, usage = os.wait4(p.pid, 0)
        walls.append(time.perf_counter() - t0)
        err = p.stderr.read().decode(errors="replace")
        p.stderr.close()
        if os.waitstatus_to_exitcode(status) != 0:
            sys.exit(f"bench: {' '.join(cmd)} failed: {err.strip()}")
        cpus.append(usage.ru_utime + usage.ru_stime)
        rss.append(usage.ru_maxrss)
    return Run(statistics.median(walls), statistics.median(cpus), max(rss))


def quiet(cmd, env=None, stdin=None):
    r = subprocess.run(cmd, env=env, input=stdin, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    if r.returncode != 0:
        sys.exit(f"bench: {' '.join(cmd)} failed: {r.stderr.strip()}")


def balance_id(k):
    return f"BAL-{k:05d}"


def secret_file(path, text):
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o600)
    with os.fdopen(fd, "w") as f:
        f.write(text + "\n")
    return path


def setup_lab(plumb, db, work, instruments, env):
    """The lab with an administrator and a quality manager (who logs in once: a session), 20 weights, balances."""
    admin_pw = secret_file(os.path.join(work, "admin.pw"), "bench-admin-password-1")
    first_pw = secret_file(os.path.join(work, "first.pw"), "bench-first-password-1")
    qm_pw = secret_file(os.path.join(work, "qm.pw"), "bench-quality-password-1")
    quiet([plumb, "--db", db, "--password-file", admin_pw, "init", "--lab", "Decade Bench Laboratory", "--admin",
           "bench-admin", "--admin-name", "Bench Administrator"], env)
    admin = [plumb, "--db", db, "--user", "bench-admin", "--password-file", admin_pw]
    quiet(admin + ["user", "policy", "--idle-minutes", "1440"], env)
    quiet(admin + ["user", "add", "bench-qm", "--name", "Bench Quality Manager", "--role", "quality-manager",
                   "--new-password-file", first_pw], env)
    quiet([plumb, "--db", db, "--user", "bench-qm", "--password-file", first_pw, "user", "password",
           "--new-password-file", qm_pw], env)
    quiet([plumb, "--db", db, "--password-file", qm_pw, "login", "--user", "bench-qm"], env)
    for w in range(1, WEIGHTS + 1):
        quiet([plumb, "--db", db, "weight", "add", f"W{w:03d}", "--nominal", "100g", "--class", "E2", "--correction",
               "0.02mg", "--uncertainty", "0.05mg", "--k", "2", "--certificate", f"BENCH-CERT-{w}", "--calibrated",
               (FIRST_DAY - datetime.timedelta(days=200)).isoformat(), "--due", "2036-06-01"], env)
    procs = []
    for k in range(1, instruments + 1):
        procs.append(subprocess.Popen([plumb, "--db", db, "balance", "add", balance_id(k), "--capacity", "220g",
                                       "--readability", "0.1mg", "--every", "7d", "--smallest-net", "200mg",
                                       "--location", f"Building {k % 7 + 1}, room {k % 40 + 1}", "--since",
                                       (FIRST_DAY - datetime.timedelta(days=32)).isoformat()], env=env,
                                      stdout=subprocess.DEVNULL))
        if len(procs) == 2:
            for p in procs:
                if p.wait() != 0:
                    sys.exit("bench: balance add failed")
            procs = []
    for p in procs:
        if p.wait() != 0:
            sys.exit("bench: balance add failed")


def write_history(path, rng, instruments, runs, first_slot):
    """`runs` runs of 10 readings, spread evenly over the instruments, weekly from `first_slot` on."""
    per_instrument = max(1, runs // instruments)
    with open(path, "w", newline="") as f:
        f.write(HEADER)
        for k in range(1, instruments + 1):
            weight = f"W{(k % WEIGHTS) + 1:03d}"
            rows = []
            for j in range(first_slot, first_slot + per_instrument):
                day = FIRST_DAY + datetime.timedelta(days=7 * j + k % 7)
                operator = OPERATORS[rng.randrange(len(OPERATORS))]
                spread = 4 if rng.random() < 0.02 else 1  # about 2 % of runs fail USP <41> repeatability
                for _ in range(READINGS_PER_RUN):
                    tenths_mg = 1000000 + rng.randint(-spread, spread)
                    rows.append(f"{balance_id(k)},repeatability,{day.isoformat()},{operator},{weight},"
                                f"{tenths_mg // 10000}.{tenths_mg % 10000:04d},g\n")
            f.write("".join(rows))
    return per_instrument


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--plumb", default="build/plumb")
    ap.add_argument("--work", default=None)
    ap.add_argument("--sizes", default="100000,1000000,4000000")
    ap.add_argument("--instruments", type=int, default=5000)
    ap.add_argument("--repeat", type=int, default=3, help="runs of each interactive command (median)")
    ap.add_argument("--keep", action="store_true")
    args = ap.parse_args()
    plumb = os.path.abspath(args.plumb)
    sizes = [int(s) for s in args.sizes.split(",")]
    # Weekly runs of every instrument up to the largest size must end before today (a future date is refused).
    global FIRST_DAY
    weeks = max(sizes) // READINGS_PER_RUN // args.instruments + 2
    FIRST_DAY = min(FIRST_DAY, datetime.date.today() - datetime.timedelta(days=7 * weeks + 7))
    work = os.path.abspath(args.work or tempfile.mkdtemp(prefix="plumb-decade-"))
    os.makedirs(work, exist_ok=True)
    env = dict(os.environ, XDG_STATE_HOME=os.path.join(work, "state"))
    env.pop("PLUMB_KEY", None)
    db, bare, copy = (os.path.join(work, n) for n in ("lab.db", "bare.db", "copy.db"))
    print(f"plumb decade bench, {datetime.datetime.now(datetime.timezone.utc):%Y-%m-%d %H:%M} UTC; nproc "
          f"{os.cpu_count()}, load before start {os.getloadavg()[0]:.2f}; {args.instruments} balances; sizes {sizes}")
    t0 = time.perf_counter()
    setup_lab(plumb, db, work, args.instruments, env)
    print(f"setup ({args.instruments} balances, 20 weights, 2 accounts) in {time.perf_counter() - t0:.1f} s")

    rng = random.Random(SEED)
    held, slot, previous = 0, 0, None
    instrument = balance_id(1)
    for size in sizes:
        free = shutil.disk_usage(work).free
        if size * BYTES_PER_READING_ON_DISK > free:
            print(f"\n== {size} readings: skipped, needs about {size * BYTES_PER_READING_ON_DISK / 1e9:.1f} GB, "
                  f"{free / 1e9:.1f} GB free")
            continue
        csv = os.path.join(work, "history.csv")
        runs = (size - held) // READINGS_PER_RUN
        per = write_history(csv, rng, args.instruments, runs, slot)
        slot += per
        added = per * args.instruments * READINGS_PER_RUN
        rows = {}
        for p in (bare,):
            if os.path.exists(p):
                os.remove(p)
        rows["import"] = (measure([plumb, "--db", db, "check", "import", csv], env),
                          measure(["sqlite3", bare, ".mode csv", f".import {csv} history"]))
        held += added
        os.remove(csv)
        on = (FIRST_DAY + datetime.timedelta(days=7 * slot)).isoformat()
        rows["audit verify"] = (measure([plumb, "--db", db, "audit", "verify"], env),
                                measure(["sha256sum", db]) + measure(["sqlite3", db, "PRAGMA integrity_check"]))
        if os.path.exists(copy):
            os.remove(copy)
        backup = measure([plumb, "--db", db, "backup", copy], env)
        os.remove(copy)
        rows["backup"] = (backup, measure(["cp", db, copy]) + rows["audit verify"][0])
        os.remove(copy)
        aggregate = ("SELECT instrument_id, max(performed_on), count(*), sum(verdict = 'fail') FROM check_runs "
                     "GROUP BY instrument_id;")
        floor_status = measure(["sqlite3", db, aggregate], repeat=args.repeat)
        rows["due --all"] = (measure([plumb, "--db", db, "due", "--all", "--on", on, "--format", "csv"], env,
                                     args.repeat), floor_status)
        rows["summary"] = (measure([plumb, "--db", db, "summary", "--on", on, "--format", "csv"], env, args.repeat),
                           floor_status)
        readings = os.path.join(work, "one-run.csv")
        with open(readings, "w") as f:
            f.write("reading\n" + "".join(f"100.000{i % 3}\n" for i in range(READINGS_PER_RUN)))
        rows["check record"] = (
            measure([plumb, "--db", db, "check", "record", instrument, "--procedure", "repeatability", "--weight",
                     "W002", "--readings", readings, "--on", on], env),
            measure(["sqlite3", bare, "BEGIN; " + "".join(
                f"INSERT INTO history VALUES ('{instrument}','repeatability','{on}','Ada Quill','W002','100.0001','g');"
                for _ in range(READINGS_PER_RUN)) + " COMMIT;"]))
        last_run = subprocess.run(["sqlite3", db, "SELECT max(id) FROM check_runs"], capture_output=True, text=True,
                                  check=True).stdout.strip()
        floor_run = measure(["sqlite3", db, f"SELECT * FROM readings WHERE run_id = {last_run};"], repeat=args.repeat)
        floor_instrument = measure(["sqlite3", db, f"SELECT r.* FROM check_runs c JOIN readings r ON r.run_id = c.id "
                                                   f"WHERE c.instrument_id = '{instrument}';"], repeat=args.repeat)
        rows["check show"] = (measure([plumb, "--db", db, "check", "show", "LAST"], env, args.repeat), floor_run)
        pdf = os.path.join(work, "certificate.pdf")
        rows["certificate PDF"] = (measure([plumb, "--db", db, "certificate", "issue", "LAST", "--format", "pdf",
                                            "--output", pdf], env), floor_run)
        svg = os.path.join(work, "chart.svg")
        rows["history chart"] = (measure([plumb, "--db", db, "history", instrument, "--chart", svg, "--quantity",
                                          "bias"], env, args.repeat), floor_instrument)
        html = os.path.join(work, "report.html")
        rows["one-instrument report"] = (measure([plumb, "--db", db, "report", "--html", html, "--instrument",
                                                  instrument, "--on", on], env, args.repeat), floor_instrument)
        for f in (pdf, svg, html, readings):
            if os.path.exists(f):
                os.remove(f)

        print(f"\n== {held} readings ({held // READINGS_PER_RUN} runs; this step imported {added}); database "
              f"{os.path.getsize(db) / 1e6:.0f} MB = {os.path.getsize(db) / held:.0f} bytes per reading; the shell's "
              f"bare table {os.path.getsize(bare) / 1e6:.0f} MB")
        split = subprocess.run(["sqlite3", db, "SELECT name, sum(pgsize) FROM dbstat GROUP BY name ORDER BY 2 DESC;"],
                               capture_output=True, text=True)
        if split.returncode == 0:  # dbstat: what each table and index costs per reading
            parts = [line.split("|") for line in split.stdout.split()]
            print("   bytes per reading (dbstat): " + ", ".join(
                f"{name} {int(size) / held:.1f}" for name, size in parts if int(size) / held >= 0.5))
        print(f"   {'command':24} {'wall s':>9} {'cpu s':>9} {'peak MiB':>9} | {'floor wall':>10} {'floor cpu':>9} "
              f"{'floor MiB':>9} | {'x wall':>8} {'x cpu':>8} | {'growth':>7}")
        for name, (mine, floor) in rows.items():
            growth = ""
            if previous and name in previous and previous[name][0].wall > 0:
                growth = f"{math.log(mine.wall / previous[name][0].wall) / math.log(held / previous['_held']):.2f}"
            cpu_ratio = f"{mine.cpu / floor.cpu:7.2f}x" if floor.cpu > 0 else "       -"
            print(f"   {name:24} {mine.wall:9.3f} {mine.cpu:9.3f} {mine.rss_kib / 1024:9.1f} | {floor.wall:10.3f} "
                  f"{floor.cpu:9.3f} {floor.rss_kib / 1024:9.1f} | {mine.wall / floor.wall:7.2f}x {cpu_ratio} | "
                  f"{growth:>7}")
        rows["_held"] = held
        previous = rows
        sys.stdout.flush()

    if not args.keep:
        shutil.rmtree(work)


if __name__ == "__main__":
    main()
