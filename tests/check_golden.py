#!/usr/bin/python3
"""Golden outputs of phaseplan-cli: what every document we ship or test with gives today.

Usage: check_golden.py <phaseplan-cli> <source-dir> <build-dir>
       PHASEPLAN_UPDATE_GOLDEN=1 check_golden.py ...   (rewrites tests/golden/, for a deliberate change)

Runs the command line over every document under data/demo/ and tests/data/ with every JSON
subcommand (solve, recipe, line, eluent, sequence, pressure, transfer; sheet and labels with
the PDF's text from pdftotext, the output path left out), over each embedded case
of the bad-input tables (cli_bad_input, line_bad_input, sequence_bad_input with its 'set' paths
applied to its base), each reference buffer of reference_buffers.json through solve, and the
'reagents' and 'device formats' listings. Each run's exit status, stdout and stderr are compared
with tests/golden/<source>.json.

This is the behaviour lock of the pipeline redesign: a refactor must leave every output
unchanged. Numbers in stdout are compared to 1e-9 relative (a compiler's last-digit rounding is
not a change); every text, key, exit status and error line is compared exactly. A deliberate
change of wording or figures is made by rerunning with PHASEPLAN_UPDATE_GOLDEN=1 and listing the
diff (`git diff tests/golden`) in the commit message.

Prints one line per difference (source, run, JSON path, golden value, new value) and
"N runs, M differ".
"""
import copy
import json
import math
import os
import re
import subprocess
import sys
import tempfile

CLI, SRC, BUILD = sys.argv[1], sys.argv[2], sys.argv[3]
GOLDEN_DIR = os.path.join(SRC, "tests", "golden")
UPDATE = os.environ.get("PHASEPLAN_UPDATE_GOLDEN") == "1"
COMMANDS = ["solve", "recipe", "line", "eluent", "sequence", "pressure", "transfer"]
REL_TOL = 1e-9
ABS_TOL = 1e-12

ENV = dict(os.environ)
ENV["QT_QPA_PLATFORM"] = "offscreen"
ENV["XDG_RUNTIME_DIR"] = tempfile.mkdtemp(prefix="golden-xdg-")
ENV["PHASEPLAN_NOW"] = "2026-12-01T15:00:00"
ENV["LC_ALL"] = "C.UTF-8"
ENV.pop("LANG", None)


PDF_DIR = tempfile.mkdtemp(prefix="golden-pdf-")


def run(args, stdin_text):
    if args[0] in ("sheet", "labels"):
        return run_pdf(args, stdin_text)
    p = subprocess.run([CLI] + args, input=stdin_text.encode("utf-8"), capture_output=True,
                       env=ENV, timeout=60)
    out = p.stdout.decode("utf-8", "replace")
    try:
        out_value = json.loads(out) if out.strip() else ""
    except ValueError:
        out_value = out
    return {"exit": p.returncode, "stdout": out_value,
            "stderr": p.stderr.decode("utf-8", "replace")}


def run_pdf(args, stdin_text):
    """sheet and labels: the result without its output path, and the PDF's text (pdftotext)."""
    pdf = os.path.join(PDF_DIR, "out.pdf")
    if os.path.exists(pdf):
        os.remove(pdf)
    p = subprocess.run([CLI] + args + ["-o", pdf], input=stdin_text.encode("utf-8"),
                       capture_output=True, env=ENV, timeout=60)
    out = p.stdout.decode("utf-8", "replace")
    try:
        out_value = json.loads(out) if out.strip() else ""
    except ValueError:
        out_value = out
    if isinstance(out_value, dict):
        out_value.pop("output", None)
    text = ""
    if p.returncode == 0 and os.path.exists(pdf):
        text = subprocess.run(["pdftotext", "-layout", pdf, "-"], capture_output=True,
                              timeout=60).stdout.decode("utf-8", "replace")
    # The print time is the wall clock's (the page says when it was printed): not compared.
    text = re.sub(r"Printed \d{4}-\d\d-\d\d \d\d:\d\d", "Printed <time>", text)
    return {"exit": p.returncode, "stdout": out_value,
            "stderr": p.stderr.decode("utf-8", "replace"), "pdf_text": text.split("\n")}


def set_path(doc, path, value):
    """Applies one 'set' of sequence_bad_input.json: a.b[1].c = value (None removes)."""
    parts = []
    for seg in path.split("."):
        m = re.fullmatch(r"([^\[\]]+)((?:\[\d+\])*)", seg)
        parts.append(m.group(1))
        parts += [int(i) for i in re.findall(r"\[(\d+)\]", m.group(2))]
    node = doc
    for key in parts[:-1]:
        node = node[key]
    if value is None:
        if isinstance(node, dict):
            node.pop(parts[-1], None)
        else:
            del node[parts[-1]]
    else:
        node[parts[-1]] = value


def runs_for(path):
    """(run name, argv, stdin) for one source document."""
    with open(path, encoding="utf-8") as f:
        text = f.read()
    doc = json.loads(text)
    name = os.path.basename(path)
    out = [(cmd, [cmd, "-"], text) for cmd in COMMANDS + ["sheet", "labels"]]
    if name == "cli_bad_input.json":
        out += [("case: " + c["name"], [c["command"], "-"], c["input"]) for c in doc["cases"]]
    elif name == "line_bad_input.json":
        out += [("case: " + c["name"], ["line", "-"], json.dumps(c["input"]))
                for c in doc["cases"]]
    elif name == "sequence_bad_input.json":
        for c in doc["cases"]:
            d = copy.deepcopy(doc["base"])
            for k, v in c["set"].items():
                set_path(d, k, v)
            out.append(("case: " + c["name"], ["sequence", "-"], json.dumps(d)))
    elif name == "reference_buffers.json":
        for b in doc["buffers"]:
            d = {"components": b["components"]}
            for key in ("temperature_c",):
                if key in b:
                    d[key] = b[key]
            out.append(("solve: " + b["name"], ["solve", "-"], json.dumps(d)))
            d = dict(d, activity_model="sit")
            out.append(("solve, sit: " + b["name"], ["solve", "-"], json.dumps(d)))
    elif name == "overnight-sequence.json":
        # The sequence's methods through pressure, and moved to a narrower column by transfer.
        for m, method in doc["methods"].items():
            d = {"lines": doc["lines"], "method": method, "column": doc["column"],
                 "instrument": doc["instrument"]}
            out.append(("pressure: " + m, ["pressure", "-"], json.dumps(d)))
            t = {"method": method, "from": doc["column"],
                 "to": {"length_mm": 100, "id_mm": 2.1, "particle_um": 1.7},
                 "injection_ul": 10, "sequence_injections": 40}
            out.append(("transfer: " + m, ["transfer", "-"], json.dumps(t)))
        d = dict(doc, activity_model="sit")
        out.append(("sequence, sit", ["sequence", "-"], json.dumps(d)))
    elif name == "eluent-phosphate-acetonitrile.json":
        first, second = list(doc["composition"])[:2]
        for pct in range(0, 101, 10):
            d = dict(doc, composition={first: 100 - pct, second: pct})
            out.append((f"eluent at {pct} % {second}", ["eluent", "-"], json.dumps(d)))
    elif name in ("buffer-phosphate-ph2.5.json", "batch-line-a-buffer.json"):
        d = dict(doc, activity_model="sit")
        out.append(("recipe, sit", ["recipe", "-"], json.dumps(d)))
    return out


def differences(golden, new, where=""):
    if isinstance(golden, bool) or isinstance(new, bool):
        return [] if golden is new else [(where, golden, new)]
    if isinstance(golden, (int, float)) and isinstance(new, (int, float)):
        if math.isclose(golden, new, rel_tol=REL_TOL, abs_tol=ABS_TOL):
            return []
        return [(where, golden, new)]
    if isinstance(golden, dict) and isinstance(new, dict):
        diffs = []
        for k in sorted(set(golden) | set(new)):
            if k not in golden or k not in new:
                diffs.append((f"{where}.{k}", golden.get(k, "(absent)"), new.get(k, "(absent)")))
            else:
                diffs += differences(golden[k], new[k], f"{where}.{k}")
        return diffs
    if isinstance(golden, list) and isinstance(new, list):
        if len(golden) != len(new):
            return [(f"{where}.length", len(golden), len(new))]
        diffs = []
        for i, (g, n) in enumerate(zip(golden, new)):
            diffs += differences(g, n, f"{where}[{i}]")
        return diffs
    return [] if golden == new else [(where, golden, new)]


def short(v):
    s = json.dumps(v, ensure_ascii=False)
    return s if len(s) <= 160 else s[:157] + "..."


def main():
    sources = []
    for folder in ("data/demo", "tests/data"):
        for f in sorted(os.listdir(os.path.join(SRC, folder))):
            if f.endswith(".json"):
                sources.append(os.path.join(SRC, folder, f))
    results = {}
    for path in sources:
        key = os.path.relpath(path, SRC).replace("/", "__")
        results[key] = {name: run(args, stdin) for name, args, stdin in runs_for(path)}
    results["listings.json"] = {"reagents": run(["reagents"], ""),
                                "device formats": run(["device", "formats"], "")}

    total = sum(len(v) for v in results.values())
    if UPDATE:
        os.makedirs(GOLDEN_DIR, exist_ok=True)
        for key, value in results.items():
            with open(os.path.join(GOLDEN_DIR, key), "w", encoding="utf-8") as f:
                json.dump(value, f, indent=1, ensure_ascii=False, sort_keys=True)
                f.write("\n")
        print(f"{total} runs written to tests/golden")
        return 0

    bad = 0
    for key, value in results.items():
        golden_path = os.path.join(GOLDEN_DIR, key)
        if not os.path.exists(golden_path):
            print(f"{key}: no golden file (run with PHASEPLAN_UPDATE_GOLDEN=1)")
            bad += len(value)
            continue
        with open(golden_path, encoding="utf-8") as f:
            golden = json.load(f)
        for run_name in sorted(set(golden) | set(value)):
            if run_name not in value or run_name not in golden:
                print(f"{key} / {run_name}: run only in {'golden' if run_name in golden else 'new'}")
                bad += 1
                continue
            diffs = differences(golden[run_name], value[run_name])
            if diffs:
                bad += 1
                for where, g, n in diffs[:8]:
                    print(f"{key} / {run_name} {where}: golden {short(g)}, now {short(n)}")
    print(f"{total} runs, {bad} differ")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
