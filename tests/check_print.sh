#!/bin/sh
# Printed sheets and labels, checked from the outside:
#   - poppler's pdftotext: the recipe sheet holds every field issue 5 §2 asks for, and the right
#     numbers: target masses and volumes recomputed here from the composition with molar masses
#     from python3-periodictable (not from PhasePlan), pH / ionic strength / buffer capacity as the
#     `recipe` subcommand gives them, the pH from the actual amounts as `solve` gives it for the
#     composition as made, the expiry as Python's calendar adds the shelf life of data/solvents.json;
#   - pdfinfo: A4, US Letter and 62 mm page sizes;
#   - pdftoppm + zbarimg (Debian zbar-tools): each label's QR code decodes back to the batch id;
#   - bad input exits 2 with one line naming the field and leaves no file (an old file untouched).
# Pages are rendered to PNG in <build-dir>/print-check/ (pdftoppm -r 80) for looking at.
# Usage: sh check_print.sh <phaseplan-cli> <source-dir> <build-dir>
set -eu
CLI="$1"
SRC="$2"
BUILD="$3"
OUT="$BUILD/print-check"
rm -rf "$OUT"
mkdir -p "$OUT"
exec /usr/bin/python3 - "$CLI" "$SRC" "$OUT" <<'PY'
import datetime, json, math, os, re, subprocess, sys

import periodictable  # Debian python3-periodictable: an outside source of formula masses

cli, src, out = sys.argv[1:4]
failures = []


def check(cond, what):
    print(("ok   " if cond else "FAIL ") + what)
    if not cond:
        failures.append(what)


def run(args, stdin=None):
    p = subprocess.run([cli] + args, input=stdin, capture_output=True, text=True, timeout=120)
    return p.returncode, p.stdout, p.stderr


def run_json(args, stdin=None):
    code, so, se = run(args, stdin)
    if code != 0:
        raise SystemExit("phaseplan-cli %s failed (%d): %s" % (" ".join(args), code, se))
    return json.loads(so)


def write(name, doc):
    path = os.path.join(out, name)
    with open(path, "w") as f:
        json.dump(doc, f, indent=1)
    return path


def pdftext(pdf):
    # -raw: the text in the order it was drawn, so a table cell's lines stay together.
    return subprocess.run(["pdftotext", "-raw", pdf, "-"], capture_output=True, text=True, check=True).stdout


def page_size_pt(pdf):
    info = subprocess.run(["pdfinfo", pdf], capture_output=True, text=True, check=True).stdout
    m = re.search(r"Page size:\s+([\d.]+) x ([\d.]+) pts", info)
    return float(m.group(1)), float(m.group(2))


def pages(pdf):
    info = subprocess.run(["pdfinfo", pdf], capture_output=True, text=True, check=True).stdout
    return int(re.search(r"Pages:\s+(\d+)", info).group(1))


def render(pdf, prefix, dpi):
    subprocess.run(["pdftoppm", "-r", str(dpi), "-png", pdf, os.path.join(out, prefix)], check=True)
    return sorted(os.path.join(out, f) for f in os.listdir(out) if f.startswith(prefix + "-") and f.endswith(".png"))


def qr_codes(png):
    p = subprocess.run(["zbarimg", "-q", "--raw", png], capture_output=True, text=True)
    return [l for l in p.stdout.splitlines() if l.strip()]


def fmt_amount(v):  # the sheet's rule: about four significant figures
    a = abs(v)
    d = 1 if a >= 100 else 2 if a >= 10 else 3 if a >= 1 else 4
    return "%.*f" % (d, v)


def measure_decimals(v, unit):  # DEVELOPERS.md, "Amounts to weigh and measure" (common practice)
    a = abs(v)
    if unit == "g":
        return 4 if a < 1 else 3 if a < 100 else 2
    return 3 if a < 1 else 2 if a < 10 else 1 if a < 100 else 0


def fmt_band(target, unit, tol=0.02):  # the target's decimals, each end rounded inward
    d = measure_decimals(round(target, measure_decimals(target, unit)), unit)
    s = 10 ** d
    lo = math.ceil(target * (1 - tol) * s - 1e-9) / s
    hi = math.floor(target * (1 + tol) * s + 1e-9) / s
    return "%.*f–%.*f" % (d, lo, d, hi)


def fmt_recorded(v, unit):  # an actual as recorded: the rule's decimals, more if entered
    a = abs(v)
    if unit == "g":
        d = 4 if a < 1 else 3 if a < 100 else 2
    else:
        d = 3 if a < 1 else 2 if a < 10 else 1 if a < 100 else 0
    while d < 6 and abs(round(v * 10**d) - v * 10**d) >= 1e-6:
        d += 1
    return "%.*f" % (d, v)


def fmt_mmol(mol_per_l):
    return "%.2f mmol/L" % (mol_per_l * 1000)


def printed_near(text, expected, unit):
    """True when the text shows `expected` (in `unit`) to its printed precision (half the last
    digit) plus 0.05 % for the difference between periodictable's and IUPAC 2021 weights."""
    for m in re.finditer(r"(\d+\.\d+) " + re.escape(unit) + r"\b", text):
        s = m.group(1)
        half_digit = 0.5 * 10 ** -len(s.split(".")[1])
        if abs(float(s) - expected) <= half_digit + 5e-4 * expected:
            return True
    return False


# ---- the demo buffer with a batch -------------------------------------------------------------
# The line-A buffer of the invented overnight assay (as data/demo has it; kept here so that the
# checks below, which name its reagents and hazards, do not move when the demo does).
demo = {"name": "Line A buffer: 20 mM sodium phosphate pH 2.5, release assay on HPLC-07",
        "target_ph": 2.5, "temperature_c": 25, "volume_ml": 2000, "route": "mix",
        "acid": "phosphoric-acid", "base": "sodium-dihydrogen-phosphate-monohydrate",
        "concentration_mol_per_l": 0.02}
recipe = run_json(["recipe", write("demo-recipe.json", demo)])
reagents = {r["id"]: r for r in run_json(["reagents"])["reagents"]}
items = {i["reagent"]: i for i in recipe["items"]}
acid, salt = demo["acid"], demo["base"]  # the demo mixes an acid form and a salt (mix route)
batch_id = "HR-QC117-A-0042"
# The salt weighed 2.5 % over its target (out of the ± 2 % tolerance), the acid 0.5 % over.
salt_actual = round(items[salt]["mass_g"] * 1.025, 4)
acid_actual = round(items[acid]["volume_ml"] * 1.005, 3)
doc = dict(demo)
doc["purpose"] = "Mobile phase A for the overnight assay QC-117"
doc["batch"] = {"id": batch_id, "prepared_by": "R. Okafor", "prepared_at": "2026-12-01T16:30:00",
                "checked_by": "M. Lindqvist",
                "actual": [{"reagent": acid, "volume_ml": acid_actual, "lot": "PA-88121"},
                           {"reagent": salt, "mass_g": salt_actual, "lot": "SP-2207"}],
                "measured_ph": 2.53, "ph_meter_id": "PHM-3", "balance_id": "BAL-07",
                "comment": "Made in the 2 L flask from shelf 4.",
                "deviation": {"note": "Salt 2.5 % over; QA agreed to use it for system suitability only.",
                              "by": "M. Lindqvist", "at": "2026-12-01T16:55:00"}}
doc_path = write("demo-batch.json", doc)

for paper, size in (("a4", (595.28, 841.89)), ("letter", (612.0, 792.0))):
    pdf = os.path.join(out, "sheet-%s.pdf" % paper)
    summary = run_json(["sheet", doc_path, "-o", pdf, "--paper", paper])
    w, h = page_size_pt(pdf)
    check(abs(w - size[0]) < 1 and abs(h - size[1]) < 1, "%s sheet page size %.1f x %.1f pt" % (paper, w, h))
    check(summary["pages"] == pages(pdf), "%s sheet: reported page count %d matches the PDF" % (paper, summary["pages"]))
    render(pdf, "sheet-%s" % paper, 80)

text = pdftext(os.path.join(out, "sheet-a4.pdf"))
flat = re.sub(r"\s+", " ", text)

# Every field of issue 5 §2.
for label, needle in [
        ("batch id", batch_id),
        ("purpose", "Mobile phase A for the overnight assay QC-117"), ("preparer", "R. Okafor"),
        ("checker", "M. Lindqvist"), ("prepared date", "2026-12-01 16:30"),
        ("target column", "Target"), ("tolerance column", "Tolerance"), ("actual column", "Actual"),
        ("lot column", "Lot"), ("lot of the acid", "PA-88121"), ("lot of the salt", "SP-2207"),
        ("reagent name", "Phosphoric acid 85 %"), ("reagent name", "Sodium dihydrogen phosphate monohydrate"),
        ("step: dissolve", "dissolve"), ("step: pH", "Check the pH"), ("step: make up to volume", "make up to the mark"),
        ("step: filter", "Filter"), ("step: degas", "Degas"),
        ("predicted pH", "pH"), ("ionic strength", "Ionic strength"), ("buffer capacity", "Buffer capacity"),
        ("warning code", "amount-out-of-tolerance"),
        ("hazard statement H290", "H290 May be corrosive to metals"),
        ("hazard statement H314", "H314 Causes severe skin burns and eye damage"),
        ("pictogram GHS05", "GHS05"), ("caution: ventilation", "fume hood"),
        ("caution: protective equipment", "eye protection"), ("caution: SDS", "safety data sheet"),
        ("caution: local rules", "licensed practice"),
        ("sign-off: prepared by", "Prepared by"), ("sign-off: checked by", "Checked by"),
        ("sign-off: signature", "SIGNATURE")]:
    check(needle in flat, "sheet shows the %s (%r)" % (label, needle))
check(re.sub(r"\s+", "", demo["name"]) in re.sub(r"\s+", "", text), "sheet shows the recipe name %r" % demo["name"])
# Out of tolerance (the salt): the boxed mark on every page, the reason, the deviation note with
# who and when, the bench fields, and the correction worked out here by hand: scale s = actual /
# target of the salt (1.025), so the acid goes to 1.025 x its target and the volume to 2050 mL.
sheet_pages = pages(os.path.join(out, "sheet-a4.pdf"))
check(flat.count("OUT OF TOLERANCE") >= sheet_pages, "the mark is on each of the %d pages" % sheet_pages)
for label, needle in [("deviation note", "QA agreed to use it for system suitability only"),
                      ("deviation by", "M. Lindqvist"), ("deviation time", "2026-12-01 16:55"),
                      ("reason names the salt", "Sodium dihydrogen phosphate monohydrate: " + fmt_amount(salt_actual) + " g, +2.5 %"),
                      ("measured pH", "2.53"), ("pH meter", "PHM-3"), ("balance", "BAL-07"),
                      ("comment", "Made in the 2 L flask from shelf 4."),
                      ("scaled volume", "Make up to 2050.0 mL instead of 2000.0 mL")]:
    check(needle in flat, "out-of-tolerance sheet shows the %s (%r)" % (label, needle))
# By hand: the acid was 0.5 % over; against the scaled target it is 1.005 / 1.025 - 1 = -1.95 %,
# inside +/- 2 %, so nothing is added to it.
check("Add " not in flat and "of Phosphoric acid 85 %" not in flat.split("Suggested correction")[1][:300],
      "correction: the acid (1.005 / 1.025 - 1 = -1.95 %, within the band) needs nothing added")
check(re.search(r"\bsafe\b", flat, re.I) is None, "the sheet never calls anything safe")

# Expiry: prepared_at + the aqueous-buffer shelf life of data/solvents.json, by Python's calendar.
shelf = {e["kind"]: e["hours"] for e in json.load(open(os.path.join(src, "data/solvents.json")))["shelf_life"]}
expires = datetime.datetime(2026, 12, 1, 16, 30) + datetime.timedelta(hours=shelf["aqueous-buffer"])
check(expires.strftime("%Y-%m-%d %H:%M") in flat, "expiry %s (%g h shelf life)" % (expires, shelf["aqueous-buffer"]))

# Target amounts recomputed here: mass = c · V · M / assay, M from periodictable; a liquid's
# volume = mass / density (the library's assay and density are inputs, not results).
volume_l = demo["volume_ml"] / 1000
for comp in recipe["composition"]:
    r = reagents[comp["reagent"]]
    m = periodictable.formula(r["formula"]).mass
    mass_g = comp["mol_per_l"] * volume_l * m / (r["assay_percent"] / 100)
    check(printed_near(flat, mass_g, "g"), "%s target mass %.4f g (periodictable M = %.3f)" % (r["id"], mass_g, m))
    if r["form"] == "liquid":
        check(printed_near(flat, mass_g / r["density_g_per_ml"], "mL"),
              "%s target volume %.4f mL" % (r["id"], mass_g / r["density_g_per_ml"]))
# The tolerance band of the salt, ± 2 %.
check(fmt_band(items[salt]["mass_g"], "g") in flat,
      "salt tolerance band ± 2 %% with the target's decimals (%s)" % fmt_band(items[salt]["mass_g"], "g"))
# Actual amounts and their flags.
check(re.search(re.escape(fmt_recorded(salt_actual, "g")) + r" g typed SP-2207 OUT \+2\.5 %", flat) is not None,
      "salt actual %s g, typed, lot, flagged OUT +2.5 %%" % fmt_recorded(salt_actual, "g"))
check(re.search(re.escape(fmt_recorded(acid_actual, "mL")) + r" mL typed PA-88121 OK \+0\.[45] %", flat) is not None,
      "acid actual %s mL, typed, lot, within tolerance: OK" % fmt_recorded(acid_actual, "mL"))
# Predicted as planned: the `recipe` subcommand's numbers.
check("%.2f" % recipe["ph"] in flat, "planned pH %.2f" % recipe["ph"])
check(fmt_mmol(recipe["ionic_strength_mol_per_l"]) in flat, "planned ionic strength " + fmt_mmol(recipe["ionic_strength_mol_per_l"]))
check(fmt_mmol(recipe["buffer_capacity_mol_per_l"]) + " per pH" in flat, "planned buffer capacity")
# From the actual amounts: `solve` of the composition as made gives the pH printed.
summary = run_json(["sheet", doc_path, "-o", os.path.join(out, "sheet-again.pdf")])
made = summary["batch"]
solved = run_json(["solve", write("as-made.json", {"temperature_c": demo["temperature_c"], "components": made["composition"]})])
check(abs(solved["ph"] - made["ph"]) < 1e-6, "pH as made %.4f equals solve() of the composition as made" % made["ph"])
check("%.2f" % made["ph"] in flat, "pH from the actual amounts %.2f printed" % made["ph"])
check(made["ph"] > recipe["ph"], "more salt (the basic form) than planned raises the pH")
for comp in made["composition"]:
    r = reagents[comp["reagent"]]
    if comp["reagent"] == salt:
        expect = salt_actual / periodictable.formula(r["formula"]).mass / volume_l
    else:
        expect = acid_actual * r["density_g_per_ml"] * r["assay_percent"] / 100 / periodictable.formula(r["formula"]).mass / volume_l
    check(abs(comp["mol_per_l"] / expect - 1) < 1e-4, "%s as made %.6f mol/L (by hand %.6f)" % (comp["reagent"], comp["mol_per_l"], expect))
flagged = [w for w in summary["warnings"] if w["code"] == "amount-out-of-tolerance"]
check(len(flagged) == 1 and flagged[0]["reagent"] == salt and abs(flagged[0]["deviation_percent"] - 2.5) < 0.01,
      "exactly the salt is flagged out of tolerance, +2.5 %")

# The shipped demo buffer prints as it stands, with a batch.
shipped = json.load(open(os.path.join(src, "data/demo/buffer-phosphate-ph2.5.json")))
shipped["batch"] = {"id": "DEMO-1"}
code, so, se = run(["sheet", write("shipped-demo.json", shipped), "-o", os.path.join(out, "shipped-demo.pdf")])
shipped_text = pdftext(os.path.join(out, "shipped-demo.pdf"))
check(code == 0 and "DEMO-1" in shipped_text, "the shipped demo buffer prints a sheet")
check("OUT OF TOLERANCE" not in shipped_text, "a batch within tolerance carries no mark")
# A measured pH outside target ± ph_tolerance alone makes the batch out of tolerance.
shipped["batch"] = {"id": "DEMO-2", "measured_ph": 2.58, "ph_tolerance": 0.05}
code, so, se = run(["sheet", write("shipped-ph.json", shipped), "-o", os.path.join(out, "shipped-ph.pdf")])
check(code == 2 and "batch.deviation.note" in se and "Measured pH 2.58, +0.08" in se,
      "measured pH 2.58 against 2.50 ± 0.05 needs a deviation note: %r" % se.strip())

# ---- a line with one part over its band: the correction worked by hand ---------------------------
line = json.load(open(os.path.join(src, "data/demo/line-phosphate-acetonitrile.json")))
line_items = {i["part"]: i for i in run_json(["line", write("line.json", line)])["items"]}
others = [p for p in line_items if p != "buffer" and line_items[p].get("volume_ml")]
buffer_ml = line_items["buffer"]["volume_ml"]
line["batch"] = {"id": "HR-LINE-1", "actual": [{"reagent": "buffer", "volume_ml": round(buffer_ml * 1.06, 1)}],
                 "deviation": {"note": "buffer poured 6 % over", "by": "R. Okafor", "at": "2026-12-01T15:00:00"}}
lsum = run_json(["sheet", write("line-batch.json", line), "-o", os.path.join(out, "line-over.pdf")])
ltext_sheet = re.sub(r"\s+", " ", pdftext(os.path.join(out, "line-over.pdf")))
check(lsum["batch"]["out_of_tolerance"] and "OUT OF TOLERANCE" in ltext_sheet, "line: a part 6 % over marks the sheet")
# By hand: s = 1.06; each other part is measured at 1.06 x its target; the line holds 1.06 x its volume.
for p in others:
    want = "Measure %s mL of" % fmt_amount(line_items[p]["volume_ml"] * round(buffer_ml * 1.06, 1) / buffer_ml)
    check(want in ltext_sheet, "line correction: %r" % want)

# ---- labels ---------------------------------------------------------------------------------------
pdf = os.path.join(out, "labels-label62.pdf")
run_json(["labels", doc_path, "-o", pdf, "--paper", "label62"])
w, h = page_size_pt(pdf)
check(abs(w - 62 / 25.4 * 72) < 1, "label62 page is 62 mm wide (%.1f pt)" % w)
ltext = re.sub(r"\s+", " ", pdftext(pdf))
for needle in ("OUT OF TOLERANCE", batch_id, "pH %.2f" % made["ph"], "2026-12-01 16:30", expires.strftime("%Y-%m-%d %H:%M"), "R. Okafor",
               "NaH2PO4 " + fmt_mmol([c for c in made["composition"] if c["reagent"] == salt][0]["mol_per_l"]),
               "H314", "safety data sheets"):
    check(needle in ltext, "62 mm label shows %r" % needle)
render(pdf, "label62-80dpi", 80)
for png in render(pdf, "label62-300dpi", 300):
    codes = qr_codes(png)
    check(codes == [batch_id], "62 mm label QR decodes to the batch id: %s" % codes)
for paper in ("a4", "letter"):
    pdf = os.path.join(out, "labels-%s.pdf" % paper)
    res = run_json(["labels", doc_path, "-o", pdf, "--paper", paper])
    png = render(pdf, "labels-%s" % paper, 300)[0]
    codes = qr_codes(png)
    check(len(codes) == res["labels"] == 8 and set(codes) == {batch_id},
          "%s label sheet: %d QR codes, all decode to the batch id" % (paper, len(codes)))

# ---- a sequence: the sequence sheet and one label per line ---------------------------------------
seq = json.load(open(os.path.join(src, "data/demo/overnight-sequence.json")))
plan = run_json(["sequence", write("sequence.json", seq)])
seq["batch"] = {"id": "HR-0712-SEQ", "prepared_by": "R. Okafor", "prepared_at": "2026-12-01T15:00:00"}
seq_path = write("sequence-batch.json", seq)
pdf = os.path.join(out, "sequence-a4.pdf")
run_json(["sheet", seq_path, "-o", pdf])
render(pdf, "sequence-a4", 80)
stext = re.sub(r"\s+", " ", pdftext(pdf))
end = plan["end"].replace("T", " ")[:16]
check(end in stext, "sequence sheet shows the end time " + end)
check(fmt_amount(plan["waste_ml"]) + " mL" in stext, "sequence sheet shows the waste %s mL" % fmt_amount(plan["waste_ml"]))
for key, line in plan["lines"].items():
    check(line["name"] in stext, "sequence sheet names line %s (%s)" % (key, line["name"]))
    check(fmt_amount(line["required_ml"]) + " mL" in stext, "line %s needs %s mL" % (key, fmt_amount(line["required_ml"])))
    check(fmt_amount(line["min_bottle_ml"]) + " mL" in stext, "line %s: prepare at least %s mL" % (key, fmt_amount(line["min_bottle_ml"])))
    if line["runs_dry"]:
        check("runs dry during injection %d" % line["dry_after_injection"] in stext, "line %s runs dry: injection %d" % (key, line["dry_after_injection"]))
# The standby is said when there is one, and only then (the sheet said "Standby flow until" the
# end of the last injection for a night without any).
check(plan["standby_min"] > 0 and "STANDBY FLOW UNTIL " + plan["standby_end"].replace("T", " ")[:16] in stext.upper(),
      "sequence sheet says the standby until " + plan["standby_end"])
quiet = dict(seq)
quiet.pop("standby", None)
quiet_pdf = os.path.join(out, "sequence-no-standby.pdf")
run_json(["sheet", write("sequence-no-standby.json", quiet), "-o", quiet_pdf])
check("STANDBY" not in pdftext(quiet_pdf).upper(), "a night without a standby: the sheet says no standby")
pdf = os.path.join(out, "sequence-labels.pdf")
run_json(["labels", seq_path, "-o", pdf])
codes = qr_codes(render(pdf, "sequence-labels", 300)[0])
check(sorted(codes) == sorted("HR-0712-SEQ-" + k for k in plan["lines"]), "one label per line, QR codes %s" % codes)

# ---- bad input: status 2, one line naming the field, no file -------------------------------------
def bad(name, args_doc, extra, field):
    pdf = os.path.join(out, "bad-%s.pdf" % name)
    path = write("bad-%s.json" % name, args_doc) if args_doc is not None else doc_path
    code, so, se = run(["sheet", path, "-o", pdf] + extra)
    lines = se.strip().splitlines()
    lines = [l for l in lines if l.startswith("phaseplan-cli:")]
    check(code == 2 and len(lines) == 1 and field in lines[0] and so == "" and not os.path.exists(pdf),
          "bad input (%s): status %d, %r" % (name, code, lines[0] if lines else se))

def without(d, *path):
    d = json.loads(json.dumps(d))
    node = d
    for k in path[:-1]:
        node = node[k]
    del node[path[-1]]
    return d

def with_(d, value, *path):
    d = json.loads(json.dumps(d))
    node = d
    for k in path[:-1]:
        node = node[k]
    node[path[-1]] = value
    return d

bad("no batch", without(doc, "batch"), [], "batch")
bad("out of tolerance, no deviation note", without(doc, "batch", "deviation"), [], "batch.deviation.note")
bad("empty deviation note", with_(doc, "  ", "batch", "deviation", "note"), [], "batch.deviation.note")
bad("measured pH 15", with_(doc, 15, "batch", "measured_ph"), [], "batch.measured_ph")
bad("no id", without(doc, "batch", "id"), [], "batch.id")
bad("bad date", with_(doc, "01/12/2026", "batch", "prepared_at"), [], "batch.prepared_at")
bad("unknown reagent", with_(doc, "tris", "batch", "actual", 0, "reagent"), [], "batch.actual[0].reagent")
bad("negative mass", with_(doc, -3, "batch", "actual", 1, "mass_g"), [], "batch.actual[1].mass_g")
bad("mass as text", with_(doc, "3 g", "batch", "actual", 1, "mass_g"), [], "batch.actual[1].mass_g")
bad("recipe field", with_(doc, 15, "target_ph"), [], "target_ph")
bad("paper", None, ["--paper", "a5"], "--paper")
bad("label62 sheet", None, ["--paper", "label62"], "--paper")
code, so, se = run(["sheet", doc_path])
check(code == 2 and "-o" in se, "sheet without -o: status 2 naming -o")
# An existing file is left as it was when the input is bad.
keep = os.path.join(out, "keep.pdf")
open(keep, "w").write("keep")
code, so, se = run(["sheet", write("bad-keep.json", without(doc, "batch", "id")), "-o", keep])
check(code == 2 and open(keep).read() == "keep", "a failed run leaves an existing output file untouched")
leftovers = [f for f in os.listdir(out) if ".pdf." in f or f.startswith("bad-") and f.endswith(".pdf")]
check(leftovers == [], "no temporary or partial PDF left behind: %s" % leftovers)

print("%d failure(s)" % len(failures))
sys.exit(1 if failures else 0)
PY
