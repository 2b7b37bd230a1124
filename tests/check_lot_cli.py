#!/usr/bin/python3
"""The reagent-lot shelf through the real phaseplan-cli binary (`lot add|list|open`).

Usage: check_lot_cli.py <phaseplan-cli> <source-dir> <build-dir>

Contract (README "Reagent lots"): every bad input exits 2 with one stderr line that starts with
the field at fault and quotes the value as typed, and nothing on stdout; a good lot is put on the
shelf under the login that signs in (password from standard input) and `audit verify` then counts
its entry. The date rules (opened not before received, expiry after received) are common
practice, no source.
"""
import datetime
import json
import os
import shutil
import sys
import tempfile

from cli_checks import Checks

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
WORK = os.path.abspath(tempfile.mkdtemp(prefix="lot-cli-", dir=BUILD))
CHECKS = Checks(CLI)
ENV = CHECKS.env
failures = CHECKS.failures
run = CHECKS.run
case = CHECKS.case


def refused(name, result, field, value):
    rc, out, err = result
    lines = err.strip("\n").split("\n")
    case(name, rc == 2 and out == "" and len(lines) == 1
         and lines[0].startswith("phaseplan-cli: " + field + ":") and value in lines[0],
         "rc=%d out=%r err=%r" % (rc, out, err))


db = os.path.join(WORK, "demo.sqlite")
rc, out, err = run(["db", "demo", "--database", db])
case("db demo", rc == 0, err)
rc, out, err = run(["audit", "verify", "--database", db])
entries = int(out.split()[1]) if rc == 0 else 0

good = ["lot", "add", "--reagent", "phosphoric-acid", "--lot", "PA-77001", "--supplier",
        "Veldmark Reagents", "--received-on", "2026-11-20", "--opened-on", "2026-11-21",
        "--expires-on", "2028-11-30", "--quantity", "2.5 L", "--as", "demo-prep",
        "--database", db]


def with_option(option, value):
    args = list(good)
    args[args.index(option) + 1] = value
    return args


pw = b"demo-prep-2026\n"
refused("opened before received", run(with_option("--opened-on", "2026-11-19"), pw),
        "opened_on", "2026-11-19")
refused("expiry on the day received", run(with_option("--expires-on", "2026-11-20"), pw),
        "expires_on", "2026-11-20")
refused("not a date", run(with_option("--received-on", "20.11.2026"), pw), "received_on",
        "20.11.2026")
refused("31 November", run(with_option("--received-on", "2026-11-31"), pw), "received_on",
        "2026-11-31")
refused("a unit that is not g, kg, mL or L", run(with_option("--quantity", "2 lb"), pw),
        "quantity_unit", "lb")
refused("a quantity without its unit", run(with_option("--quantity", "2.5"), pw), "quantity",
        "2.5")
refused("a reagent the library does not have",
        run(with_option("--reagent", "phosphoric-acd"), pw), "reagent", "phosphoric-acd")
refused("the administrator keeps no shelf",
        run(with_option("--as", "demo-admin"), b"demo-admin-2026\n"), "who", "demo-admin")
refused("a wrong password", run(good, b"not-the-password\n"), "password", "wrong")
refused("the password on the command line", run(good + ["--password", "x"]), "password",
        "command line")
dup = with_option("--reagent", "sodium-dihydrogen-phosphate-monohydrate")
dup[dup.index("--lot") + 1] = "SP-1987"  # a demo lot (storage/demo.cpp)
refused("a lot already on the shelf", run(dup, pw), "lot", "SP-1987")
rc, out, err = run(["audit", "verify", "--database", db])
case("refusals record nothing but the failed sign-in",
     rc == 0 and int(out.split()[1]) == entries + 1, out + err)

rc, out, err = run(good, pw)
lot = json.loads(out) if rc == 0 else {}
case("lot add", rc == 0 and lot.get("lot") == "PA-77001" and lot.get("created_by") == "demo-prep"
     and lot.get("quantity") == 2.5 and lot.get("quantity_unit") == "L", out + err)
rc, out, err = run(["lot", "list", "--reagent", "phosphoric-acid", "--database", db])
listed = json.loads(out)["lots"] if rc == 0 else []
case("lot list: the reagent's lots, earliest expiry first",
     sorted(l["lot"] for l in listed) == ["PA-77001", "PA-88112", "PA-90417"]
     and [l["expires_on"] for l in listed] == sorted(l["expires_on"] for l in listed),
     repr(listed)[:400] + err)
solvent = with_option("--reagent", "acetonitrile")
solvent[solvent.index("--lot") + 1] = "ACN-5521"
solvent[solvent.index("--quantity") + 1] = "4 L"
rc, out, err = run(solvent, pw)
case("a solvent of the library has lots too", rc == 0 and json.loads(out)["lot"] == "ACN-5521",
     out + err)
rc, out, err = run(["audit", "verify", "--database", db])
case("the new lots are two more entries of an intact trail",
     rc == 0 and out.startswith("intact: %d entries" % (entries + 3)), out + err)
rc, out, err = run(["audit", "export", "--database", db])
last = ([e for e in json.loads(out)["entries"] if e["record_id"] == "phosphoric-acid/PA-77001"]
        or [{}])[-1] if rc == 0 else {}
case("the trail names who put the lot on the shelf",
     last.get("action") == "add-lot" and last.get("login") == "demo-prep"
     and last.get("record_id") == "phosphoric-acid/PA-77001", repr(last)[:400])

# lot open: the day a lot was opened (demo PA-90417 was received 10 days ago, not opened).
today = datetime.date.today()
opening = ["lot", "open", "--reagent", "phosphoric-acid", "--lot", "PA-90417", "--opened-on",
           today.isoformat(), "--as", "demo-prep", "--database", db]


def open_with(option, value):
    args = list(opening)
    args[args.index(option) + 1] = value
    return args


before = (today - datetime.timedelta(days=20)).isoformat()
refused("lot open: not a date", run(open_with("--opened-on", "2026-13-01"), pw), "opened_on",
        "2026-13-01")
refused("lot open: no day given", run(opening[:6] + opening[8:], pw), "opened_on", "required")
refused("lot open: before the lot was received", run(open_with("--opened-on", before), pw),
        "opened_on", before)
refused("lot open: a lot not on the shelf", run(open_with("--lot", "PA-00000"), pw), "lot",
        "PA-00000")
refused("lot open: the administrator keeps no shelf",
        run(open_with("--as", "demo-admin"), b"demo-admin-2026\n"), "who", "demo-admin")
refused("lot open: a wrong password", run(opening, b"not-the-password\n"), "password", "wrong")
rc, out, err = run(opening, pw)
opened = json.loads(out) if rc == 0 else {}
case("lot open", rc == 0 and opened.get("opened_on") == today.isoformat(), out + err)
rc, out, err = run(["lot", "list", "--reagent", "phosphoric-acid", "--database", db])
listed = {l["lot"]: l for l in json.loads(out)["lots"]} if rc == 0 else {}
case("lot list shows the day opened",
     listed.get("PA-90417", {}).get("opened_on") == today.isoformat(), out + err)
rc, out, err = run(["audit", "export", "--database", db])
last = ([e for e in json.loads(out)["entries"] if e["record_id"] == "phosphoric-acid/PA-90417"]
        or [{}])[-1] if rc == 0 else {}
case("the trail names who opened the lot",
     last.get("action") == "open-lot" and last.get("login") == "demo-prep", repr(last)[:400])
rc, out, err = run(["audit", "verify", "--database", db])
case("the trail stays intact after lot open", rc == 0 and out.startswith("intact:"), out + err)

shutil.rmtree(WORK, ignore_errors=True)
if failures:
    print("%d failed: %s" % (len(failures), ", ".join(failures)))
    sys.exit(1)
print("all passed")
