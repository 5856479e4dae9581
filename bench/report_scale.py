#!/usr/bin/env python3
"""Report and start-up benchmark: the whole-lab HTML report, a one-instrument report and the start-up of commands
that draw nothing, each against a floor measured in the same run. Prints figures and ratios; not a test.

  1. Builds an invented lab (fixed seed; test-only fast password hashing, so never a lab to keep): INSTRUMENTS
     balances with RUNS weekly checks of 10 readings each, imported with `check import`.
  2. `report --html` of the whole lab: wall, CPU, peak memory, bytes written (overview, pages, largest page), and
     per instrument; against `sqlite3` reading every reading of the lab once (the floor of any report).
  3. `report --html --instrument` of one instrument (median of 5).
  4. Start-up: `--help`, `due`, `check show LAST` against `sqlite3 :memory: .quit` (median of 30 each), and the
     shared libraries each loads (LD_DEBUG=libs). With --before OLD_PLUMB the same for another binary.

Usage: bench/report_scale.py [--plumb build/plumb] [--before OLD] [--instruments 20] [--runs 500] [--work DIR]
With --work DIR the lab is kept there, and a later run with the same DIR (and sizes) uses it again.
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

SEED = 20261203
READINGS_PER_RUN = 10
PASSWORD = "bench-only-password-1"
FIRST = "bench-first-password-1"


def timed(cmd, env=None):
    t0 = time.perf_counter()
    p = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, env=env)
    _, status, usage = os.wait4(p.pid, 0)
    wall = time.perf_counter() - t0
    err = p.stderr.read().decode()
    if os.waitstatus_to_exitcode(status) != 0:
        sys.exit(f"bench: {' '.join(cmd)} failed: {err}")
    return wall, usage.ru_utime + usage.ru_stime, usage.ru_maxrss  # KiB on Linux


def median_ms(cmd, n, env=None):
    """Median wall and median CPU (user + system) time in ms: on a shared machine CPU time varies less."""
    runs = [timed(cmd, env) for _ in range(n)]
    return statistics.median(r[0] for r in runs) * 1000, statistics.median(r[1] for r in runs) * 1000


def libraries(cmd):
    env = dict(os.environ, LD_DEBUG="libs")
    r = subprocess.run(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True, env=env)
    return len(set(re.findall(r"calling init: (\S+)", r.stderr)))


def pw_file(work, name, text):
    path = os.path.join(work, name)
    with open(os.open(path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o600), "w") as f:
        f.write(text + "\n")
    return path


def build_lab(plumb, work, instruments, runs):
    db = os.path.join(work, "lab.db")
    env = dict(os.environ, PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING="1")
    admin_pw, first_pw = pw_file(work, "admin.pw", PASSWORD), pw_file(work, "first.pw", FIRST)
    qm_pw = pw_file(work, "qm.pw", PASSWORD)
    run = lambda *a: subprocess.run([plumb, "--db", db, *a], check=True, stdout=subprocess.DEVNULL, env=env)
    run("--password-file", admin_pw, "init", "--lab", "Bench Report Laboratory", "--admin", "bench-admin",
        "--admin-name", "Bench Admin")
    run("--user", "bench-admin", "--password-file", admin_pw, "user", "add", "bench-qm", "--name", "Bench Manager",
        "--role", "quality-manager", "--role", "technician", "--new-password-file", first_pw)
    run("--user", "bench-qm", "--password-file", first_pw, "user", "password", "--new-password-file", qm_pw)
    qm = ["--user", "bench-qm", "--password-file", qm_pw]
    run(*qm, "weight", "add", "W001", "--nominal", "100g", "--class", "E2", "--correction", "0.02mg",
        "--uncertainty", "0.05mg", "--k", "2", "--certificate", "BENCH-CERT-1", "--calibrated", "2015-06-01",
        "--due", "2035-06-01")
    for k in range(1, instruments + 1):
        run(*qm, "balance", "add", f"BAL-{k:05d}", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
            "--smallest-net", "200mg", "--location", f"Building {k % 7 + 1}, room {k % 40 + 1}", "--since",
            "2015-12-01")
    rng = random.Random(SEED)
    csv = os.path.join(work, "history.csv")
    start = datetime.date(2016, 1, 4)
    with open(csv, "w") as f:
        f.write("instrument,procedure,date,operator,weight,reading,unit\n")
        for k in range(1, instruments + 1):
            for j in range(runs):
                day = (start + datetime.timedelta(days=7 * j)).isoformat()
                drift = j * (k % 3) // 200  # tenths of a mg: some balances drift slowly, others not
                for _ in range(READINGS_PER_RUN):
                    t = 1000000 + drift + rng.randint(-2, 2)
                    f.write(f"BAL-{k:05d},repeatability,{day},Bench Technician,W001,{t // 10000}.{t % 10000:04d},g\n")
    run(*qm, "check", "import", csv)
    os.remove(csv)
    return db


def folder_bytes(path):
    total, largest, files = 0, 0, 0
    for name in os.listdir(path):
        size = os.path.getsize(os.path.join(path, name))
        total, largest, files = total + size, max(largest, size), files + 1
    return total, largest, files


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--plumb", default="build/plumb")
    ap.add_argument("--before", default=None, help="another plumb binary to compare (same database schema)")
    ap.add_argument("--instruments", type=int, default=20)
    ap.add_argument("--runs", type=int, default=500, help="weekly checks per instrument (10 readings each)")
    ap.add_argument("--work", default=None)
    ap.add_argument("--keep", action="store_true")
    args = ap.parse_args()
    plumb = os.path.abspath(args.plumb)
    work = args.work or tempfile.mkdtemp(prefix="plumb-report-bench-")
    os.makedirs(work, exist_ok=True)
    print(f"plumb report bench, {datetime.datetime.now(datetime.timezone.utc):%Y-%m-%d %H:%M} UTC; nproc "
          f"{os.cpu_count()}, load {os.getloadavg()[0]:.2f}")
    t0 = time.perf_counter()
    readings = args.instruments * args.runs * READINGS_PER_RUN
    if args.work and os.path.exists(os.path.join(work, "lab.db")):  # the lab of an earlier run with this --work
        db = os.path.join(work, "lab.db")
        print(f"lab: reused {db} ({os.path.getsize(db) / 1e6:.0f} MB)")
    else:
        db = build_lab(plumb, work, args.instruments, args.runs)
        print(f"lab: {args.instruments} balances x {args.runs} weekly checks = {readings} readings, built in "
              f"{time.perf_counter() - t0:.0f} s ({os.path.getsize(db) / 1e6:.0f} MB)")

    floor = timed(["sqlite3", db, "SELECT count(*), sum(length(text)) FROM readings;"])
    print(f"\nfloor: sqlite3 reading every reading once: wall {floor[0]:.2f} s, cpu {floor[1]:.2f} s")
    binaries = [("plumb", plumb)] + ([("before", os.path.abspath(args.before))] if args.before else [])
    for label, binary in binaries:
        out = os.path.join(work, f"{label}.html")
        wall, cpu, rss = timed([binary, "--db", db, "report", "--html", out, "--on", "2026-01-05"])
        folder = os.path.join(work, f"{label}-instruments")
        pages = folder_bytes(folder) if os.path.isdir(folder) else (0, 0, 0)
        print(f"\n{label}: whole-lab report --html: wall {wall:.2f} s, cpu {cpu:.2f} s, peak {rss / 1024:.0f} MiB; "
              f"cpu {cpu / floor[1]:.1f}x the floor's; cpu {cpu / args.instruments * 1000:.0f} ms per instrument")
        print(f"   overview {os.path.getsize(out) / 1e3:.0f} KB; {pages[2]} pages, {pages[0] / 1e6:.1f} MB in all, "
              f"largest {pages[1] / 1e3:.0f} KB")
        one = os.path.join(work, f"{label}-one.html")
        wall_ms, cpu_ms = median_ms([binary, "--db", db, "report", "--html", one, "--instrument", "BAL-00001", "--on",
                                     "2026-01-05"], 5)
        print(f"   one instrument ({args.runs} runs): median of 5: wall {wall_ms:.0f} ms, cpu {cpu_ms:.0f} ms; "
              f"{os.path.getsize(one) / 1e3:.0f} KB")
    print("\nstart-up (median of 30 runs: wall, cpu; shared libraries loaded):")
    base = median_ms(["sqlite3", ":memory:", ".quit"], 30)
    print(f"   sqlite3 :memory: .quit       {base[0]:6.1f} ms {base[1]:6.1f} ms  "
          f"{libraries(['sqlite3', ':memory:', '.quit']):3d} libraries")
    for label, binary in binaries:
        for name, cmd in [("--help", ["--help"]), ("due", ["--db", db, "due", "--on", "2026-01-05"]),
                          ("check show LAST", ["--db", db, "check", "show", "LAST"])]:
            ms = median_ms([binary, *cmd], 30)
            print(f"   {label:7s}{name:22s}{ms[0]:6.1f} ms {ms[1]:6.1f} ms  {libraries([binary, *cmd]):3d} libraries  "
                  f"wall {ms[0] / base[0]:.1f}x, cpu {ms[1] / max(base[1], 0.001):.1f}x sqlite3")
    if not args.keep and not args.work:
        shutil.rmtree(work)


if __name__ == "__main__":
    main()
