#!/usr/bin/env python3
"""Load bench of plumb serve (not a timed test): a lab of --instruments balances with --runs runs of 10 readings in all
(5,000 balances and 200,000 runs = 2,000,000 readings by default), then --clients concurrent clients for --seconds seconds on the
overview, an instrument page with its chart and the weekly check form, --writers clients recording weekly checks,
and, in the same run, the same clients on a static file served by the same server (the floor). Prints requests per
second, p50/p95/p99 latency and errors for each, and the server's resident memory over the run.

    python3 bench/web_load.py --plumb build/plumb [--instruments 5000] [--runs 200000] [--seconds 60] [--lab DIR]

With --lab DIR the lab is built in DIR and kept, and a later run with the same DIR uses it as it is (the checks the
writers recorded included): the setup takes minutes, and a before/after comparison wants the same lab.

The lab is invented (fixed seed); accounts are hashed with plumb's test-only fast limits, since only the pages are
measured. Each client keeps one HTTP/1.1 connection (Python threads: the clients share one core's interpreter, so
the figures are a floor on what the server can do, and the static floor is measured the same way)."""

import argparse
import datetime
import http.client
import os
import random
import re
import statistics
import subprocess
import sys
import tempfile
import threading
import time
import urllib.parse

SEED = 20261203
READINGS = ["100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001", "100.0002",
            "100.0003", "100.0002"]


def run(plumb, db, env, *args):
    subprocess.run([plumb, "--db", db, *args], check=True, stdout=subprocess.DEVNULL, env=env)


def setup(plumb, work, instruments, runs):
    env = dict(os.environ, PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING="1", XDG_STATE_HOME=os.path.join(work, "state"))
    db = os.path.join(work, "lab.db")
    secret = lambda name, text: open(os.open(os.path.join(work, name), os.O_CREAT | os.O_WRONLY, 0o600), "w").write(text + "\n")
    secret("ada.pw", "ada-bench-password-long")
    run(plumb, db, env, "--password-file", os.path.join(work, "ada.pw"), "init", "--lab", "Bench Load Laboratory",
        "--admin", "ada", "--admin-name", "Ada Quill")
    for login, name, role in (("quinn", "Quinn Adebayo", "quality-manager"), ("tess", "Tess Marlow", "technician")):
        secret(login + "-1.pw", login + "-first-password")
        secret(login + ".pw", login + "-bench-password")
        run(plumb, db, env, "--user", "ada", "--password-file", os.path.join(work, "ada.pw"), "user", "add", login,
            "--name", name, "--role", role, "--new-password-file", os.path.join(work, login + "-1.pw"))
        run(plumb, db, env, "--user", login, "--password-file", os.path.join(work, login + "-1.pw"), "user",
            "password", "--new-password-file", os.path.join(work, login + ".pw"))
    # The quality manager's CLI session (no password hashing per command) registers the lab.
    run(plumb, db, env, "--password-file", os.path.join(work, "quinn.pw"), "login", "--user", "quinn")
    for w in range(1, 21):
        run(plumb, db, env, "weight", "add", f"W{w:03d}", "--nominal", "100g", "--class", "E2", "--correction",
            "0.02mg", "--uncertainty", "0.05mg", "--k", "2", "--certificate", f"LOAD-{w}", "--calibrated",
            "2017-06-01", "--due", "2030-06-01")
    procs = []
    for k in range(1, instruments + 1):
        procs.append(subprocess.Popen([plumb, "--db", db, "balance", "add", f"BAL-{k:05d}", "--capacity", "220g",
                                       "--readability", "0.1mg", "--every", "7d", "--smallest-net", "200mg",
                                       "--location", f"Building {k % 7 + 1}, room {k % 40 + 1}", "--since",
                                       "2018-01-01"], stdout=subprocess.DEVNULL, env=env))
        if len(procs) == 2:
            if any(p.wait() != 0 for p in procs):
                sys.exit("bench: balance add failed")
            procs = []
    if any(p.wait() != 0 for p in procs):
        sys.exit("bench: balance add failed")
    rng = random.Random(SEED)
    per = max(1, runs // instruments)
    history = os.path.join(work, "history.csv")
    first = datetime.date(2018, 1, 1)
    with open(history, "w") as f:
        f.write("instrument,procedure,date,operator,weight,reading,unit\n")
        for k in range(1, instruments + 1):
            for j in range(per):
                day = first + datetime.timedelta(days=7 * j + k % 7)
                for _ in range(10):
                    t = 1000000 + rng.randint(-1, 1)
                    f.write(f"BAL-{k:05d},repeatability,{day},Bench Operator,W{k % 20 + 1:03d},{t // 10000}.{t % 10000:04d},g\n")
    subprocess.run([plumb, "--db", db, "check", "import", history], check=True, stdout=subprocess.DEVNULL, env=env)
    return db, env, per * instruments * 10


SESSION = {}  # tess's one session, shared by every client (the tabs of one browser): plumb serve limits log-ins
             # to 10 a minute per address, and every client here comes from 127.0.0.1


class Client:
    """One browser tab: a keep-alive connection with the session cookie of tess."""

    def __init__(self, port):
        self.conn = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
        self.cookie = ""
        if not SESSION:
            page = self.request("GET", "/login")[1]
            token = re.search(r'name="csrf" value="([0-9a-f]+)"', page).group(1)
            status, _ = self.request("POST", "/login", {"login": "tess", "password": "tess-bench-password",
                                                        "csrf": token})
            if status != 303:
                sys.exit(f"bench: log-in refused ({status})")
            SESSION["cookie"] = self.cookie
            SESSION["csrf"] = re.search(r'name="csrf" value="([0-9a-f]+)"', self.request("GET", "/")[1]).group(1)
        self.cookie, self.csrf = SESSION["cookie"], SESSION["csrf"]

    def request(self, method, path, form=None):
        headers = {"Cookie": self.cookie} if self.cookie else {}
        body = None
        if form is not None:
            body = urllib.parse.urlencode(form)
            headers["Content-Type"] = "application/x-www-form-urlencoded"
        self.conn.request(method, path, body=body, headers=headers)
        r = self.conn.getresponse()
        text = r.read().decode("utf-8", "replace")
        for name, value in r.getheaders():
            if name.lower() == "set-cookie" and "Max-Age=0" not in value:
                pair = value.split(";")[0]
                cookies = dict(c.split("=", 1) for c in self.cookie.split("; ") if c)
                k, v = pair.split("=", 1)
                cookies[k] = v
                self.cookie = "; ".join(f"{a}={b}" for a, b in cookies.items())
        return r.status, text


def hammer(port, seconds, pick, expected, results, errors):
    c = Client(port)
    end = time.perf_counter() + seconds
    while time.perf_counter() < end:
        name, method, path, form = pick(c)
        t0 = time.perf_counter()
        try:
            status, _ = c.request(method, path, form)
        except Exception as e:  # a refused or reset connection is an error of the run, counted
            errors.setdefault(name, []).append(repr(e))
            c = Client(port)
            continue
        results.setdefault(name, []).append(time.perf_counter() - t0)
        if status != expected[name]:
            errors.setdefault(name, []).append(status)


def phase(port, clients, writers, seconds, instruments, static_only):
    results, errors = {}, {}
    rng = random.Random(SEED)
    expected = {"overview": 200, "instrument page": 200, "chart": 200, "check form": 200, "record check": 200,
                "static file": 200}

    def reader(c):
        if static_only:
            return "static file", "GET", "/static/plumb.css", None
        k = rng.randint(1, instruments)
        choice = rng.randrange(4)
        if choice == 0:
            return "overview", "GET", "/", None
        if choice == 1:
            return "instrument page", "GET", f"/instruments/BAL-{k:05d}", None
        if choice == 2:
            return "chart", "GET", f"/instruments/BAL-{k:05d}/chart/bias.svg", None
        return "check form", "GET", "/checks/new", None

    def writer(c):
        k = rng.randint(1, instruments)
        return "record check", "POST", "/checks", {"balance": f"BAL-{k:05d}", "weight": f"W{k % 20 + 1:03d}",
                                                   "readings": "reading\n" + "\n".join(READINGS), "csrf": c.csrf}

    threads = [threading.Thread(target=hammer, args=(port, seconds, reader, expected, results, errors))
               for _ in range(clients)]
    if not static_only:
        threads += [threading.Thread(target=hammer, args=(port, seconds, writer, expected, results, errors))
                    for _ in range(writers)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    return results, errors


def rss_kib(pid):
    with open(f"/proc/{pid}/status") as f:
        return int(re.search(r"VmRSS:\s+(\d+)", f.read()).group(1))


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--plumb", default="build/plumb")
    ap.add_argument("--instruments", type=int, default=5000)
    ap.add_argument("--runs", type=int, default=200000, help="runs in the history (10 readings each)")
    ap.add_argument("--clients", type=int, default=20)
    ap.add_argument("--writers", type=int, default=2)
    ap.add_argument("--seconds", type=int, default=60)
    ap.add_argument("--lab", default=None, help="folder to build the lab in and keep, or to reuse it from")
    args = ap.parse_args()
    plumb = os.path.abspath(args.plumb)
    work = os.path.abspath(args.lab) if args.lab else tempfile.mkdtemp(prefix="plumb-web-bench-")
    os.makedirs(work, exist_ok=True)
    print(f"plumb web load bench, {datetime.datetime.now(datetime.timezone.utc):%Y-%m-%d %H:%M} UTC; nproc "
          f"{os.cpu_count()}, load before start {os.getloadavg()[0]:.2f}")
    t0 = time.perf_counter()
    if args.lab and os.path.exists(os.path.join(work, "lab.db")):
        db = os.path.join(work, "lab.db")
        env = dict(os.environ, PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING="1", XDG_STATE_HOME=os.path.join(work, "state"))
        readings = int(subprocess.run(["sqlite3", db, "SELECT count(*) FROM readings"], capture_output=True, text=True,
                                      check=True).stdout)
        print(f"lab: reused {work} ({readings} readings)")
    else:
        db, env, readings = setup(plumb, work, args.instruments, args.runs)
        print(f"setup: {args.instruments} balances, {readings} readings in {time.perf_counter() - t0:.0f} s")
    server = subprocess.Popen([plumb, "--db", db, "serve", "--port", "0", "--threads", str(args.clients + args.writers)],
                              stdout=subprocess.PIPE, text=True, env=env)
    line = server.stdout.readline()
    port = int(re.search(r":(\d+)/", line).group(1))
    memory = []
    stop = threading.Event()

    def sample():
        while not stop.is_set():
            memory.append(rss_kib(server.pid))
            time.sleep(1)

    sampler = threading.Thread(target=sample)
    sampler.start()
    Client(port)  # logs in once
    try:
        floor, floor_errors = phase(port, args.clients, 0, max(10, args.seconds // 4), args.instruments, True)
        pages, page_errors = phase(port, args.clients, args.writers, args.seconds, args.instruments, False)
    finally:
        stop.set()
        sampler.join()
        server.terminate()
        server.wait()
    print(f"\n{'request':<16}{'count':>8}{'per s':>9}{'p50 ms':>9}{'p95 ms':>9}{'p99 ms':>9}{'errors':>8}")
    for results, errors, seconds in ((floor, floor_errors, max(10, args.seconds // 4)), (pages, page_errors, args.seconds)):
        for name in sorted(results):
            t = sorted(results[name])
            q = lambda p: t[min(len(t) - 1, int(p * len(t)))] * 1000
            print(f"{name:<16}{len(t):>8}{len(t) / seconds:>9.1f}{q(0.50):>9.1f}{q(0.95):>9.1f}{q(0.99):>9.1f}"
                  f"{len(errors.get(name, [])):>8}")
        for name, e in errors.items():
            print(f"  errors of {name}: {e[:5]}")
    if memory:
        third = max(1, len(memory) // 3)
        print(f"\nserver memory (VmRSS): first third of the run median {statistics.median(memory[:third]) / 1024:.1f} MiB, "
              f"last third {statistics.median(memory[-third:]) / 1024:.1f} MiB, max {max(memory) / 1024:.1f} MiB")
    if floor.get("static file") and pages.get("overview"):
        ratio = statistics.median(pages["overview"]) / statistics.median(floor["static file"])
        print(f"overview p50 / static file p50: {ratio:.1f}x")
    if not args.lab:
        subprocess.run(["rm", "-rf", work])


if __name__ == "__main__":
    main()
