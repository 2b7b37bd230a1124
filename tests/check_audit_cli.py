#!/usr/bin/python3
"""The audit trail and the accounts through the real phaseplan-cli binary.

Usage: check_audit_cli.py <phaseplan-cli> <source-dir> <build-dir>

Contract (README "The lab's record"): `audit verify` exits 0 when the chain is intact and 1 with
one stdout line naming the first bad entry when it is not (21 CFR 11.10(e); EU GMP Annex 11 §9);
every bad input exits 2 with one stderr line naming the field and nothing on stdout; passwords are
read from standard input, never from the command line (21 CFR 11.300); an account locks after 5
wrong passwords (11.300(d)). The tampering is done with Python's own sqlite3 module (the outside
tool), after dropping the guard triggers as anyone with the file could.

With PHASEPLAN_TEST_BACKEND=postgresql (CTest's check_audit_cli_pg) every database is a fresh one
on the cluster PHASEPLAN_TEST_PG_URI names (tests/pg_cluster.sh), the outside tool is psql, and
the same contract is checked there; without that URI it prints SKIP with the reason.
"""
import csv
import glob
import hashlib
import io
import json
import os
import shutil
import sqlite3
import subprocess
import sys
import tempfile
import time
import urllib.parse

from cli_checks import Checks

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
PG = os.environ.get("PHASEPLAN_TEST_BACKEND") == "postgresql"
PG_URI = os.environ.get("PHASEPLAN_TEST_PG_URI", "")
if PG and not PG_URI:
    print("SKIP: PHASEPLAN_TEST_PG_URI is not set: start a cluster with tests/pg_cluster.sh "
          "start DIR and export the URI it prints (and PGPASSFILE=DIR/pgpass)")
    sys.exit(0)
PSQL = shutil.which("psql") or (sorted(glob.glob("/usr/lib/postgresql/*/bin/psql")) or [""])[-1]
pg_created = []
WORK = os.path.abspath(tempfile.mkdtemp(prefix="audit-cli-", dir=BUILD))
CHECKS = Checks(CLI)
ENV = CHECKS.env
failures = CHECKS.failures
run = CHECKS.run
case = CHECKS.case


def refused(name, result, field):
    rc, out, err = result
    lines = err.strip("\n").split("\n")
    case(name, rc == 2 and out == "" and len(lines) == 1
         and lines[0].startswith("phaseplan-cli: " + field),
         "rc=%d out=%r err=%r" % (rc, out[:200], err[:400]))


def pg_uri(dbname):
    u = urllib.parse.urlsplit(PG_URI)
    return urllib.parse.urlunsplit((u.scheme, u.netloc, "/" + dbname, u.query, ""))


def psql(uri, *statements, copy_out=None):
    """Runs statements in one transaction with psql (the outside tool); returns stdout."""
    args = [PSQL, "-X", "-q", "-v", "ON_ERROR_STOP=1", "-d", uri]
    script = "BEGIN;\n" + "".join(s + ";\n" for s in statements) + "COMMIT;\n"
    if copy_out:
        args += ["-c", "COPY (%s) TO STDOUT WITH (FORMAT csv)" % copy_out]
        script = None
    p = subprocess.run(args, input=None if script is None else script.encode(),
                       capture_output=True, timeout=120, env=ENV)
    if p.returncode != 0:
        raise RuntimeError("psql: " + p.stderr.decode("utf-8", "replace"))
    return p.stdout.decode("utf-8")


def new_location(name):
    """A path for a new file, or the URI of a new, empty PostgreSQL database."""
    if not PG:
        return os.path.join(WORK, name)
    db = "chk_%d_%d_%d" % (os.getpid(), int(time.time() * 1000) % 100000000, len(pg_created))
    # CREATE DATABASE cannot run inside the transaction psql() opens: close it first.
    psql(PG_URI, "COMMIT", "CREATE DATABASE " + db, "BEGIN")
    pg_created.append(db)
    return pg_uri(db)


def query(loc, sql):
    """Rows of a SELECT, as text (csv through psql on PostgreSQL)."""
    if not PG:
        c = sqlite3.connect(loc)
        rows = [[("" if v is None else str(v)) for v in r] for r in c.execute(sql)]
        c.close()
        return rows
    return list(csv.reader(io.StringIO(psql(loc, copy_out=sql))))


def drop_trigger(name, table):
    return ("DROP TRIGGER IF EXISTS %s ON %s" % (name, table)) if PG else \
        ("DROP TRIGGER IF EXISTS " + name)


def fresh_demo(name):
    path = new_location(name)
    rc, out, err = run(["db", "demo", "--database", path])
    case("db demo " + name, rc == 0 and json.loads(out)["chain"]["intact"], err)
    return path


def tamper(path, *statements):
    drops = [drop_trigger(t, table) for t, table in (
        ("audit_log_no_update", "audit_log"), ("audit_log_no_delete", "audit_log"),
        ("audit_anchor_no_delete", "audit_anchor"), ("audit_anchor_steps", "audit_anchor"))]
    if PG:
        psql(path, *(drops + list(statements)))
        return
    c = sqlite3.connect(path)
    for s in drops + list(statements):
        c.execute(s)
    c.commit()
    c.close()


demo = fresh_demo("demo.sqlite")
# The demo's trail: 10 entries for its batch (create, print, amend, print, two signatures) and its
# four accounts, then 5 for the lots put on the shelf (app/storage/demo.cpp, demo_lots()).
DEMO_ENTRIES = 15

# ---- verify: intact ------------------------------------------------------------------------
rc, out, err = run(["audit", "verify", "--database", demo])
case("verify intact exits 0", rc == 0 and out.startswith("intact: %d entries" % DEMO_ENTRIES) and err == "",
     "rc=%d out=%r err=%r" % (rc, out, err))
if not PG:
    before = open(demo, "rb").read()
    run(["audit", "verify", "--database", demo])
    case("verify leaves the file as it was", open(demo, "rb").read() == before)
else:
    before = query(demo, "SELECT seq, hash FROM audit_log ORDER BY seq")
    run(["audit", "verify", "--database", demo])
    case("verify leaves the trail as it was",
         query(demo, "SELECT seq, hash FROM audit_log ORDER BY seq") == before)

# ---- the serialisation, recomputed outside (Python's hashlib SHA-256, FIPS 180-4) -------------
def entry_hash(fields):
    data = b"phaseplan-audit-v1\n" + b"".join(
        str(len(f.encode("utf-8"))).encode() + b":" + f.encode("utf-8") + b"\n" for f in fields)
    return hashlib.sha256(data).hexdigest()


prev, ok = "0" * 64, True
rows = query(demo, "SELECT seq, logged_at, login, action, record_type, record_id, reason,"
                   " changes, prev_hash, hash FROM audit_log ORDER BY seq")
for row in rows:
    fields = [str(row[0])] + list(row[1:9])
    ok = ok and row[8] == prev and entry_hash(fields) == row[9]
    prev = row[9]
ok = ok and len(rows) == DEMO_ENTRIES
case("every stored hash recomputed from the documented serialisation", ok)

# ---- export -----------------------------------------------------------------------------------
rc, out, err = run(["audit", "export", "--database", demo, "--batch", "HR-QC117-A-0041"])
doc = json.loads(out) if rc == 0 else {}
actions = [e["action"] for e in doc.get("entries", [])]
case("export --batch: the demo batch's whole history",
     actions == ["create", "print", "amend", "print", "sign", "sign"], "%r %s" % (actions, err))
sigs = doc.get("signatures", [])
case("export --batch: two signatures by two people, both holding",
     len(sigs) == 2 and sigs[0]["login"] != sigs[1]["login"] and all(s["holds"] for s in sigs)
     and [s["meaning"] for s in sigs] == ["prepared", "reviewed"], repr(sigs))
amend = doc["entries"][2] if len(doc.get("entries", [])) > 2 else {}
case("export: the amendment's reason and old -> new lot",
     "PA-88112" in amend.get("reason", "")
     and amend.get("changes", {}).get("actual[phosphoric-acid].lot") == {"old": "PA-88121",
                                                                         "new": "PA-88112"},
     repr(amend)[:400])
csv_path = os.path.join(WORK, "trail.csv")
rc, out, err = run(["audit", "export", "--database", demo, "-o", csv_path])
rows = list(csv.reader(io.open(csv_path, encoding="utf-8", newline=""))) if rc == 0 else []
case("export -o .csv: header and one row per entry",
     rc == 0 and out == "" and rows[0][:4] == ["seq", "logged_at", "login", "action"]
     and len(rows) == DEMO_ENTRIES + 1
     and [r[0] for r in rows[1:]] == [str(i) for i in range(1, DEMO_ENTRIES + 1)],
     "rc=%d %s" % (rc, err))
refused("export to a folder", run(["audit", "export", "--database", demo, "-o", WORK]), "-o")
refused("export of an unknown batch", run(["audit", "export", "--database", demo, "--batch",
                                           "NOPE"]), "batch")

# ---- verify: tampered ---------------------------------------------------------------------------
for name, statements, seq in [
    ("a changed reason", ["UPDATE audit_log SET reason = 'no reason' WHERE seq = 7"], 7),
    ("a changed time", ["UPDATE audit_log SET logged_at = '2026-01-01T00:00:00.000Z' WHERE seq = 2"], 2),
    ("a changed value", ["UPDATE audit_log SET changes = replace(changes, 'PA-88112', 'PA-00000')"
                         " WHERE seq = 7"], 7),
    ("a deleted entry", ["DELETE FROM audit_log WHERE seq = 5"], 5),
    ("the last entry deleted", ["DELETE FROM audit_log WHERE seq = %d" % DEMO_ENTRIES],
     DEMO_ENTRIES),
    ("a signature's signer swapped behind the trail",
     [drop_trigger("signatures_no_update", "signatures"),
      "UPDATE signatures SET login = 'demo-approve' WHERE meaning = 'reviewed'"], 10),
    ("a batch amount changed behind the trail",
     [drop_trigger("batches_changes_recorded", "batches"),
      "UPDATE batches SET actual = replace(actual, '2.981', '2.891')"], 10),
    ("two entries reordered", ["UPDATE audit_log SET seq = 100 WHERE seq = 8",
                               "UPDATE audit_log SET seq = 8 WHERE seq = 9",
                               "UPDATE audit_log SET seq = 9 WHERE seq = 100"], 8),
]:
    if PG:
        path = fresh_demo("tampered")
    else:
        path = os.path.join(WORK, "tampered.sqlite")
        for suffix in ("", "-wal", "-shm"):
            if os.path.exists(path + suffix):
                os.remove(path + suffix)
        shutil.copy(demo, path)
    tamper(path, *statements)
    rc, out, err = run(["audit", "verify", "--database", path])
    case("verify finds " + name + " at entry %d" % seq,
         rc == 1 and out.startswith("broken at entry %d:" % seq) and out.count("\n") == 1
         and err == "", "rc=%d out=%r err=%r" % (rc, out, err))

# ---- verify: bad input ----------------------------------------------------------------------
refused("verify without --database", run(["audit", "verify"]), "database")
missing = pg_uri("no_such_database_here") if PG else os.path.join(WORK, "none.sqlite")
refused("verify of a missing file", run(["audit", "verify", "--database", missing]), "database")
other = new_location("other.sqlite")
if PG:
    psql(other, "CREATE TABLE t (x INTEGER)")
else:
    c = sqlite3.connect(other)
    c.execute("CREATE TABLE t (x)")
    c.commit()
    c.close()
refused("verify of another program's file", run(["audit", "verify", "--database", other]),
        "database")
refused("an unknown audit subcommand", run(["audit", "rewrite", "--database", demo]), "command")

# ---- accounts ---------------------------------------------------------------------------------
rc, out, err = run(["user", "list", "--database", demo])
users = {u["login"]: u for u in json.loads(out)["users"]} if rc == 0 else {}
case("user list: the four demo accounts",
     sorted(users) == ["demo-admin", "demo-approve", "demo-prep", "demo-review"]
     and users["demo-admin"]["role"] == "administrator" and "password" not in out, out[:300])
refused("a password on the command line is refused",
        run(["user", "add", "x1", "--name", "X", "--role", "preparer", "--as", "demo-admin",
             "--password", "secret-secret", "--database", demo]), "password")
rc, out, err = run(["user", "add", "t.new", "--name", "Tam New", "--role", "reviewer", "--as",
                    "demo-admin", "--database", demo], b"demo-admin-2026\nnew-password-1\n")
case("user add by the administrator (passwords on stdin)",
     rc == 0 and json.loads(out)["role"] == "reviewer", "rc=%d %s" % (rc, err))
refused("user add by a preparer",
        run(["user", "add", "t.two", "--name", "T", "--role", "preparer", "--as", "demo-prep",
             "--database", demo], b"demo-prep-2026\nnew-password-2\n"), "as")
refused("user add with the administrator's wrong password",
        run(["user", "add", "t.two", "--name", "T", "--role", "preparer", "--as", "demo-admin",
             "--database", demo], b"wrong-wrong\nnew-password-2\n"), "password")
refused("user add with a short password",
        run(["user", "add", "t.two", "--name", "T", "--role", "preparer", "--as", "demo-admin",
             "--database", demo], b"demo-admin-2026\nshort\n"), "password")
refused("user add with an unknown role",
        run(["user", "add", "t.two", "--name", "T", "--role", "boss", "--as", "demo-admin",
             "--database", demo], b"demo-admin-2026\nnew-password-2\n"), "role")
for i in range(5):
    r = run(["user", "passwd", "t.new", "--database", demo], b"not-the-password\nwhatever-123\n")
refused("the fifth wrong password locks the account", r, "password")
case("... and says so", "locked" in r[2], r[2])
refused("a locked account cannot sign in", run(["user", "passwd", "t.new", "--database", demo],
                                                b"new-password-1\nwhatever-123\n"), "login")
rc, out, err = run(["user", "unlock", "t.new", "--as", "demo-admin", "--database", demo],
                   b"demo-admin-2026\n")
case("the administrator unlocks it", rc == 0 and json.loads(out)["locked"] is False
     and json.loads(out)["failed_attempts"] == 0, err)
rc, out, err = run(["user", "passwd", "t.new", "--database", demo], b"new-password-1\nnewer-pass-2\n")
case("the account changes its own password", rc == 0, err)
rc, out, err = run(["user", "lock", "t.new", "--as", "demo-admin", "--database", demo],
                   b"demo-admin-2026\n")
case("the administrator locks it", rc == 0 and json.loads(out)["locked"] is True, err)
refused("no password on stdin", run(["user", "unlock", "t.new", "--as", "demo-admin",
                                     "--database", demo]), "password")
rc, out, err = run(["audit", "verify", "--database", demo])
case("every account change went into the chain, which holds",
     rc == 0 and int(out.split()[1]) > 10, "rc=%d out=%r" % (rc, out))
refused("user list of a missing file", run(["user", "list", "--database", missing]), "database")
refused("db demo onto an existing file", run(["db", "demo", "--database", demo]), "database")

# The first account of a new database must be an administrator and needs no --as.
new_db = new_location("new.sqlite")
refused("the first account is an administrator",
        run(["user", "add", "first", "--name", "F", "--role", "preparer", "--database", new_db],
            b"first-password\n"), "role")
rc, out, err = run(["user", "add", "first", "--name", "F", "--role", "administrator",
                    "--database", new_db], b"first-password\n")
case("the first administrator is added without --as", rc == 0, err)

for db in pg_created:
    psql(PG_URI, "COMMIT", "DROP DATABASE IF EXISTS %s WITH (FORCE)" % db, "BEGIN")
if failures:
    print("%d failed: %s" % (len(failures), ", ".join(failures)))
    sys.exit(1)
shutil.rmtree(WORK, ignore_errors=True)
print("all passed")
