#!/usr/bin/python3
"""phaseplan-cli and phaseplan-cli-full (app/CMakeLists.txt, issue 10's start-up time).

Usage: check_cli_split.py <phaseplan-cli> <source-dir> <build-dir>

phaseplan-cli links Qt Core and the core alone, so that the JSON commands start without loading
Qt GUI, SQL, Serial Port, libsodium and libqrencode; it runs the device, database and PDF
commands by executing phaseplan-cli-full, found beside it. Checked here against the programs
themselves: the dynamic section that `readelf -d` prints (binutils), the bytes and status of a
command run through either program, and the one-line error (status 3, as for missing data) when
phaseplan-cli-full is not there.
"""
import os
import shutil
import subprocess
import sys
import tempfile

from cli_checks import Checks

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
FULL = os.path.join(os.path.dirname(os.path.abspath(CLI)), "phaseplan-cli-full")
CHECKS = Checks(CLI)
case = CHECKS.case
DEMO = os.path.join(SRC, "data", "demo", "overnight-sequence.json")


def needed(program):
    """The libraries a program names in its dynamic section (DT_NEEDED)."""
    out = subprocess.run(["readelf", "-d", program], capture_output=True, text=True,
                         check=True).stdout
    return [line.split("[", 1)[1].split("]", 1)[0] for line in out.splitlines()
            if "(NEEDED)" in line]


def run(program, args):
    p = subprocess.run([program] + args, capture_output=True, timeout=120, env=CHECKS.env)
    return p.returncode, p.stdout, p.stderr


light = needed(CLI)
heavy = ("libQt6Gui", "libQt6Sql", "libQt6SerialPort", "libQt6PrintSupport", "libsodium",
         "libqrencode")
case("phaseplan-cli loads Qt Core", any(n.startswith("libQt6Core") for n in light), str(light))
case("phaseplan-cli loads none of Qt GUI, SQL, Serial Port, libsodium, libqrencode",
     not [n for n in light if n.startswith(heavy)], str(light))
case("phaseplan-cli-full is beside phaseplan-cli", os.access(FULL, os.X_OK), FULL)

# The same bytes and status through either program: a JSON command that phaseplan-cli runs
# itself, a device command and a records command that it hands on, an error of the latter.
for args in (["sequence", DEMO], ["device", "formats"], ["device", "read", "--baud", "x"],
             ["audit", "verify"], ["lot", "list", "--database"], ["frobnicate", DEMO]):
    a, b = run(CLI, args), run(FULL, args)
    case("the same through either program: " + " ".join(args[:2]), a == b,
         "phaseplan-cli %r, phaseplan-cli-full %r" % (a[0], b[0]))

# phaseplan-cli alone: the JSON commands still run; a command of phaseplan-cli-full names it.
work = tempfile.mkdtemp(prefix="cli-split-", dir=BUILD)
try:
    alone = os.path.join(work, "phaseplan-cli")
    shutil.copy2(CLI, alone)
    data = ["--data", os.path.join(SRC, "data")]
    rc, out, err = run(alone, ["sequence", DEMO] + data)
    case("phaseplan-cli alone runs sequence", rc == 0 and out == run(CLI, ["sequence", DEMO])[1],
         "rc=%d err=%r" % (rc, err))
    for args in (["device", "formats"], ["sheet", DEMO, "-o", os.path.join(work, "x.pdf")],
                 ["--paper", "a4", "labels", DEMO],
                 ["db", "demo", "--database", os.path.join(work, "demo.sqlite")]):
        rc, out, err = run(alone, args + data)
        lines = err.decode("utf-8", "replace").strip("\n").split("\n")
        case("phaseplan-cli alone: " + " ".join(args[:2]) + " names phaseplan-cli-full",
             rc == 3 and out == b"" and len(lines) == 1
             and lines[0].startswith("phaseplan-cli: command: ")
             and "phaseplan-cli-full" in lines[0],
             "rc=%d out=%r err=%r" % (rc, out[:200], err))
finally:
    shutil.rmtree(work, ignore_errors=True)

if CHECKS.failures:
    print("%d failed: %s" % (len(CHECKS.failures), ", ".join(CHECKS.failures)))
    sys.exit(1)
print("all passed")
