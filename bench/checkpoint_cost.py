#!/usr/bin/env python3
"""What signed checkpoints cost, measured in one run on this machine (doc/audit-trail.md, "Checkpoints").

  1. One Ed25519 signature (`openssl speed ed25519`, the same OpenSSL 3 that plumb links) against the time of one
     `plumb check record` command: the share of a command that signing its checkpoint takes.
  2. The bytes of the checkpoints table against the audit trail's, on the demo lab (`plumb demo`).
  3. `plumb audit verify` on the demo lab, with the lab's public key (every signature checked) and the time per
     checkpoint.
Prints figures and ratios; nothing is compared with a fixed threshold. Python 3 standard library only.

Usage: bench/checkpoint_cost.py [--plumb build/plumb] [--commands 40]
"""
import argparse
import os
import re
import sqlite3
import subprocess
import tempfile
import time

READINGS = "reading\n" + "".join(f"100.000{d}\n" for d in (3, 1, 2, 4, 2, 3, 1, 2, 3, 2))


def plumb(binary, *args, cwd):
    subprocess.run([binary, *args], check=True, cwd=cwd, stdout=subprocess.DEVNULL)


def sign_seconds():
    out = subprocess.run(["openssl", "speed", "-seconds", "2", "ed25519"], check=True, capture_output=True,
                         text=True).stdout
    # "253 bits EdDSA (Ed25519)   0.0000s   0.0001s  50000.0  15000.0": the times are rounded, so the rates
    # (signatures and verifications a second) are used.
    m = re.search(r"EdDSA \(Ed25519\)\s+[0-9.]+s\s+[0-9.]+s\s+([0-9.]+)\s+([0-9.]+)", out)
    return 1 / float(m.group(1)), 1 / float(m.group(2))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--plumb", default="build/plumb")
    ap.add_argument("--commands", type=int, default=40)
    a = ap.parse_args()
    binary = os.path.abspath(a.plumb)
    with tempfile.TemporaryDirectory() as work:
        db = os.path.join(work, "lab.db")
        for step in (["init", "--lab", "Bench Lab"],
                     ["weight", "add", "W100", "--nominal", "100g", "--class", "E2", "--correction", "0.03mg",
                      "--uncertainty", "0.05mg", "--k", "2", "--certificate", "RC-1", "--calibrated", "2026-03-02",
                      "--due", "2027-03-02"],
                     ["balance", "add", "BAL-A", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
                      "--smallest-net", "200mg"]):
            plumb(binary, "--db", db, *step, cwd=work)
        with open(os.path.join(work, "r.csv"), "w") as f:
            f.write(READINGS)
        start = time.perf_counter()
        for _ in range(a.commands):
            plumb(binary, "--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on",
                  "2026-11-30", "--by", "A. Technician", cwd=work)
        per_command = (time.perf_counter() - start) / a.commands
        sign, verify = sign_seconds()
        print(f"check record: {per_command * 1000:.1f} ms a command ({a.commands} commands)")
        print(f"Ed25519 sign {sign * 1e6:.0f} us, verify {verify * 1e6:.0f} us (openssl speed)")
        print(f"signing a checkpoint / one command: {sign / per_command:.5f}")

        demo = os.path.join(work, "demo.db")
        plumb(binary, "--db", demo, "demo", cwd=work)
        con = sqlite3.connect(demo)
        cp_bytes, cps = con.execute("SELECT sum(length(head_hash) + length(signed_at) + length(covers) + "
                                    "length(public_key) + length(signature) + 16), count(*) FROM checkpoints").fetchone()
        trail_bytes, records = con.execute("SELECT sum(length(at) + length(os_user) + length(actor) + length(action) + "
                                           "length(table_name) + length(row_key) + coalesce(length(after_json), 0) + "
                                           "coalesce(length(reason), 0) + 128 + 8), count(*) FROM audit_log").fetchone()
        con.close()
        print(f"demo: {records} audit records ({trail_bytes} bytes), {cps} checkpoints ({cp_bytes} bytes): "
              f"checkpoints / trail = {cp_bytes / trail_bytes:.3f}")
        start = time.perf_counter()
        plumb(binary, "--db", demo, "audit", "verify", "--public-key", demo + ".pub", cwd=work)
        with_key = time.perf_counter() - start
        print(f"demo: audit verify --public-key {with_key * 1000:.0f} ms, "
              f"{with_key / max(cps, 1) * 1e6:.0f} us a checkpoint (all of verification divided by checkpoints); "
              f"signature checks {cps * verify / with_key:.3f} of it")


if __name__ == "__main__":
    main()
