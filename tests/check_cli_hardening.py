#!/usr/bin/python3
"""Regression checks of issue 9 (hardening) against the real phaseplan-cli binary.

Usage: check_cli_hardening.py <phaseplan-cli> <source-dir> <build-dir>

Each case is named for what it prevents. The contract is README "The command-line tool" and
"Limits": bad input exits 2 with one stderr line naming the field and nothing on stdout;
output never carries "inf", "nan" or an overflowed integer; -o writes only a regular file or a
new path. Outside facts used: Linux /dev/null is a character device and mkfifo makes a FIFO
(POSIX); a UTF-16 lone surrogate is not a Unicode scalar value (Unicode 15, section 3.9).
"""
import json
import os
import stat
import subprocess
import sys
import tempfile

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
WORK = os.path.abspath(tempfile.mkdtemp(prefix="hardening-", dir=BUILD))
ENV = dict(os.environ)
ENV.setdefault("QT_QPA_PLATFORM", "offscreen")
failures = []


def load(name):
    with open(os.path.join(SRC, "data", "demo", name), encoding="utf-8") as f:
        return json.load(f)


def run(args, doc=None, raw=None, env=None, timeout=60):
    data = raw if raw is not None else json.dumps(doc, ensure_ascii=False).encode("utf-8")
    p = subprocess.run([CLI] + args, input=data, capture_output=True, timeout=timeout, env=env or ENV)
    return p.returncode, p.stdout.decode("utf-8", "replace"), p.stderr.decode("utf-8", "replace")


def case(name, ok, detail=""):
    print(("ok   " if ok else "FAIL ") + name + ("" if ok else ": " + detail[:600]))
    if not ok:
        failures.append(name)


def refused(name, result, field, words=()):
    rc, out, err = result
    lines = err.strip("\n").split("\n")
    good = rc == 2 and out == "" and len(lines) == 1 and lines[0].startswith("phaseplan-cli: " + field)
    good = good and all(w in err for w in words)
    case(name, good, "rc=%d out=%r err=%r" % (rc, out[:200], err[:400]))
    return err


def no_inf_nan(text):
    low = text.lower()
    return "inf" not in low.replace("info", "") and "nan" not in low and "-2147483648" not in text


buffer = load("buffer-phosphate-ph2.5.json")
batch_doc = load("batch-line-a-buffer.json")
sequence = load("overnight-sequence.json")

# --- unbounded work ------------------------------------------------------------------------
refused("input_over_16_mib_is_refused_not_bad_alloc", run(["solve", "/dev/zero"], raw=b""), "input",
        ["16 MiB"])
refused("stdin_over_16_mib_is_refused", run(["solve", "-"], raw=b" " * (16 * 1024 * 1024 + 10)), "input",
        ["16 MiB"])

err = refused("ten_megabyte_id_is_refused_and_not_echoed_whole",
              run(["solve", "-"], {"components": [{"reagent": "x" * 10_000_000, "mol_per_l": 0.01}]}),
              "components[0].reagent")
case("ten_megabyte_id_error_line_is_short", len(err) < 400, "%d bytes" % len(err))

err = refused("echoed_unknown_id_cut_to_64_characters_on_a_boundary",
              run(["solve", "-"], {"components": [{"reagent": "é" * 70, "mol_per_l": 0.01}]}),
              "components[0].reagent", ['"' + "é" * 64 + "…\""])

doc = dict(buffer)
doc["x" * 60000] = 1  # a long unknown key: no near-miss search over it
refused_or_ok = run(["recipe", "-"], doc)
case("long_unknown_key_is_ignored_without_edit_distance", refused_or_ok[0] == 0, refused_or_ok[2])

comps = [{"reagent": "sodium-chloride", "mol_per_l": 1e-6} for _ in range(100_000)]
rc, out, err = run(["solve", "-"], {"components": comps}, timeout=60)
case("solve_with_100000_components_completes", rc == 0 and '"ph"' in out, err)

doc = json.loads(json.dumps(batch_doc))
doc["batch"]["prepared_by"] = "p" * 10_000_000
refused("ten_megabyte_prepared_by_is_refused_by_length",
        run(["labels", "-", "-o", os.path.join(WORK, "big.pdf")], doc), "batch.prepared_by", ["1000 characters"])

for field in ("name", "purpose"):
    doc = json.loads(json.dumps(batch_doc))
    if field == "purpose":
        doc["batch"]["purpose"] = "p" * 5000
        field = "batch.purpose"
    else:
        doc["name"] = "n" * 5000
    refused("printed_%s_over_1000_characters_is_refused" % field.replace(".", "_"),
            run(["sheet", "-", "-o", os.path.join(WORK, "long.pdf")], doc), field, ["1000 characters"])

# --- non-finite numbers never reach paper ---------------------------------------------------
doc = dict(buffer)
doc["purity_percent"] = {buffer["acid"]: 1e-310}
refused("tiny_purity_is_refused_not_printed_as_inf", run(["recipe", "-"], doc), "purity_percent." + buffer["acid"])
doc = json.loads(json.dumps(batch_doc))
doc["purity_percent"] = {batch_doc["acid"]: 1e-310}
refused("tiny_purity_never_reaches_the_sheet",
        run(["sheet", "-", "-o", os.path.join(WORK, "inf.pdf")], doc), "purity_percent")
case("tiny_purity_leaves_no_pdf", not os.path.exists(os.path.join(WORK, "inf.pdf")))

doc = json.loads(json.dumps(sequence))
doc["lines"]["A"]["shelf_life_h"] = 1e-300
rc, out, err = run(["sequence", "-"], doc)
case("tiny_shelf_life_never_prints_an_overflowed_count",
     (rc == 2 and "shelf_life_h" in err) or (rc == 0 and no_inf_nan(out)), err + out[:300])

# --- contract slips ---------------------------------------------------------------------------
for field, value in (("prepared_at", "0000-01-01T10:00:00"), ("expires_at", "9999-01-01T10:00:00")):
    doc = json.loads(json.dumps(batch_doc))
    doc["batch"][field] = value
    refused("batch_%s_outside_1900_to_9000_is_refused" % field,
            run(["sheet", "-", "-o", os.path.join(WORK, "date.pdf")], doc), "batch." + field, ["1900", "9000"])
doc = json.loads(json.dumps(batch_doc))
doc["batch"]["prepared_at"] = "8999-12-01T10:00:00"
doc["batch"].pop("expires_at", None)
doc["batch"]["shelf_life_h"] = 99999
refused("computed_expiry_after_year_9000_is_refused",
        run(["sheet", "-", "-o", os.path.join(WORK, "date.pdf")], doc), "batch.", ["9000"])

raw = json.dumps(batch_doc).replace('"HR-QC117-A-0042"', '"HR-\\ud800-1"').encode()
refused("lone_surrogate_in_batch_id_is_refused_not_printed_as_question_mark",
        run(["labels", "-", "-o", os.path.join(WORK, "qr.pdf")], raw=raw), "batch.id", ["surrogate"])

doc = json.loads(json.dumps(batch_doc))
doc["batch"]["id"] = "é" * 40  # 40 characters, 80 bytes: within the 64-character limit
rc, out, err = run(["labels", "-", "-o", os.path.join(WORK, "id40.pdf")], doc)
case("id_limit_counts_characters_not_bytes", rc == 0, err)
doc["batch"]["id"] = "é" * 65
refused("id_over_64_characters_is_refused_without_cutting_a_character",
        run(["labels", "-", "-o", os.path.join(WORK, "id65.pdf")], doc), "batch.id", ["é" * 64 + "…", "64 characters"])

rc, out, err = run(["solve", "-"], raw=b'{"components": [{"reagent": "bad\\u0000tail", "mol_per_l": 0.01}]}')
case("nul_in_an_id_does_not_cut_the_error_line", rc == 2 and "tail" in err and "\\x00" in err, err)

plans = {"plans": [sequence]}
for cmd in ("sheet", "labels"):
    refused("%s_given_a_plans_document_says_so" % cmd,
            run([cmd, "-", "-o", os.path.join(WORK, "plans.pdf")], plans), "plans", ["one plan"])

# --- output paths ------------------------------------------------------------------------------
doc = batch_doc
if os.path.exists("/dev/null") and stat.S_ISCHR(os.stat("/dev/null").st_mode):
    refused("o_onto_a_device_node_is_refused", run(["labels", "-", "-o", "/dev/null"], doc), "-o", ["regular file"])
    case("o_onto_a_device_node_leaves_it_a_device", stat.S_ISCHR(os.lstat("/dev/null").st_mode))
fifo = os.path.join(WORK, "fifo")
os.mkfifo(fifo)
refused("o_onto_a_fifo_is_refused", run(["labels", "-", "-o", fifo], doc), "-o", ["regular file"])
victim = os.path.join(WORK, "victim.txt")
with open(victim, "w") as f:
    f.write("not a pdf")
link = os.path.join(WORK, "planted.pdf")
os.symlink(victim, link)
refused("o_through_a_planted_symlink_is_refused", run(["labels", "-", "-o", link], doc), "-o", ["symbolic link"])
with open(victim) as f:
    case("planted_symlink_target_is_unchanged", f.read() == "not a pdf")
rc, out, err = run(["labels", "-", "-o", link, "--follow-symlinks"], doc)
with open(victim, "rb") as f:
    case("follow_symlinks_writes_the_target", rc == 0 and f.read(5) == b"%PDF-" and os.path.islink(link), err)
kept = os.path.join(WORK, "kept-mode.pdf")
with open(kept, "w") as f:
    f.write("old")
os.chmod(kept, 0o640)
rc, out, err = run(["labels", "-", "-o", kept], doc)
case("replaced_file_keeps_its_mode", rc == 0 and stat.S_IMODE(os.stat(kept).st_mode) == 0o640,
     "%o %s" % (stat.S_IMODE(os.stat(kept).st_mode), err))
ro = os.path.join(WORK, "read-only.pdf")
with open(ro, "w") as f:
    f.write("old")
os.chmod(ro, 0o444)
rc, out, err = run(["labels", "-", "-o", ro], doc)
case("replacing_a_read_only_file_never_makes_it_writable", stat.S_IMODE(os.stat(ro).st_mode) == 0o444,
     "%o" % stat.S_IMODE(os.stat(ro).st_mode))

# The runtime folder: never the predictable $TMPDIR/phaseplan-runtime-<uid>, never through a link.
tmp = os.path.join(WORK, "tmp")
os.mkdir(tmp)
target = os.path.join(WORK, "not-yours")
os.mkdir(target)
os.chmod(target, 0o755)
os.symlink(target, os.path.join(tmp, "phaseplan-runtime-%d" % os.getuid()))
env = dict(ENV)
env.pop("XDG_RUNTIME_DIR", None)
env["TMPDIR"] = tmp
rc, out, err = run(["labels", "-", "-o", os.path.join(WORK, "rt.pdf")], doc, env=env)
case("runtime_folder_never_chmods_through_a_planted_link",
     rc == 0 and stat.S_IMODE(os.stat(target).st_mode) == 0o755 and err == "", err)
case("runtime_folder_is_removed_after_use",
     sorted(os.listdir(tmp)) == ["phaseplan-runtime-%d" % os.getuid()], str(os.listdir(tmp)))

print("%d failed" % len(failures))
sys.exit(1 if failures else 0)
