// Every sentence of the sequence and line checks, made from a finding's data at render time.
#include "chem/finding_text.h"

#include "chem/checks_common.h"
#include "chem/viscosity.h"

#include <cmath>

namespace chem {

using namespace checks_internal;

namespace {

/// The sentence helpers over one finding and its context.
struct Words {
    const Finding& f;
    const RenderContext& ctx;

    double n(const char* key) const { return f.number_of(key); }
    const std::string& t(const char* key) const { return f.text_of(key); }
    bool flag(const char* key) const { return f.has_number(key) && f.number_of(key) != 0; }
    std::string name(const std::string& id) const { return ctx.name_of ? ctx.name_of(id) : id; }
    std::string clock(double minutes) const {
        return ctx.clock ? ctx.clock(minutes) : default_clock(minutes);
    }
    std::string count(double v) const { return std::to_string(std::llround(v)); }
    /// The items' names, joined: "Sodium phosphate, Triethylamine".
    std::string item_names() const {
        std::vector<std::string> v;
        for (const auto& [id, x] : f.items)
            v.push_back(name(id));
        return join(v);
    }
    /// The subject line as the sentence opens with it: "Line A (Phosphate)", "The line Wash".
    std::string title() const {
        if (f.alone) {
            const std::string& n = ctx.line_names[0];
            return n.empty() || n == f.subject.id ? std::string("The line") : "The line " + n;
        }
        return line_title(f.subject.id, ctx);
    }
    /// A line's share of the mix from the details "percent_A" …: "30 % A, 70 % B" (sep ", ")
    /// or "A 30 %/B 70 %" (pressure: letter first, sep "/").
    std::string mix(bool letter_first, const char* sep) const {
        std::string out;
        for (int l = 0; l < max_lines; ++l) {
            const std::string key = "line_percent_" + letter(l);
            const double p = f.number_of(key);
            if (!(p > 0))
                continue;
            out += out.empty() ? "" : sep;
            out +=
                letter_first ? letter(l) + " " + fmt(p, 0) + " %" : fmt(p, 0) + " % " + letter(l);
        }
        return out;
    }
    std::string pct(double fraction) const { return fmt(100 * fraction, 0) + " % organic"; }
};

std::string uv_eluent(const Words& w) {
    const Finding& f = w.f;
    const double wl = w.n("wavelength_nm");
    const double a = w.n("absorbance");
    const bool below = a >= 1;
    std::string where;
    if (!f.alone)
        where = f.where.kind == Subject::Kind::standby
                    ? " at standby (" + w.mix(false, ", ") + ")"
                    : " in method " + f.where.id + " at " + fmt(w.n("t_min"), 2) +
                          " min of each injection (" + w.mix(false, ", ") + ")";
    const std::string who =
        f.subject.kind == Subject::Kind::line
            ? w.name(w.t("limited_by")) + (f.alone ? "" : " in " + line_title(f.subject.id, w.ctx))
            : std::string("its parts");
    return std::string(f.alone ? "The line" : "The eluent") + where + " absorbs " + fmt(a, 2) +
           " (1 cm) at " + fmt(wl, 0) + " nm, mostly from " + who + ": its UV cutoff there is " +
           fmt(w.n("cutoff_nm"), 0) + " nm; the detector reads at " + fmt(wl, 0) + " nm, " +
           (below ? "below the cutoff: expect a high baseline and a drifting gradient."
                  : "within " + fmt(w.n("margin_nm"), 0) +
                        " nm of it: expect baseline drift over the gradient.");
}

std::string immiscible_lines(const Words& w) {
    const Finding& f = w.f;
    const std::string& a = f.subject.id;
    const std::string& b = f.subject.other;
    const bool imm = w.t("miscibility") == miscibility_name(Miscibility::immiscible);
    const std::string where = f.where.kind == Subject::Kind::standby
                                  ? "in the standby"
                                  : "in method \u201c" + f.where.id + "\u201d from " +
                                        method_time_words(w.n("t_min")) + " into each injection";
    return "Lines " + a + " and " + b + " meet in the mixer " + where + " (about " +
           fmt(w.n("percent_a")) + " % " + a + " with " + fmt(w.n("percent_b")) + " % " + b +
           "): " + w.name(w.t("solvent_a")) + " and " + w.name(w.t("solvent_b")) + " are " +
           (imm ? "immiscible, so the eluent separates into two phases."
                : "only partly miscible: check the proportions stay within their mutual "
                  "solubility.");
}

/// A salt form of a solubility form table in words: "hydrogen phosphate (HPO₄²⁻)".
std::string form_words(const std::string& form) {
    if (form == "dihydrogen-phosphate")
        return "dihydrogen phosphate (H₂PO₄⁻)";
    if (form == "hydrogen-phosphate")
        return "hydrogen phosphate (HPO₄²⁻)";
    if (form == "phosphate")
        return "phosphate (PO₄³⁻)";
    return group_words(form);
}

std::string precipitation(const Words& w) {
    const Finding& f = w.f;
    const bool over = f.severity == Finding::Severity::warning;
    std::string where;
    if (f.where.kind == Subject::Kind::line)
        where = f.alone ? "in the bottle" : "in the bottle of line " + f.where.id;
    else if (f.where.kind == Subject::Kind::standby)
        where = "in the standby";
    else
        where = "in method \u201c" + f.where.id + "\u201d, " + method_time_words(w.n("t_min")) +
                " into each injection";
    const std::string basis =
        w.t("basis") == "published" ? "published data" : "a conservative rule of thumb";
    if (!w.t("form").empty()) {
        // A group checked form by form (chem::SaltLoad): say which form limits.
        const double total = w.n("mmol_per_l"), held = w.n("limit_mmol_per_l");
        const double share = held > 0 ? total / held : 0;
        std::string msg = (over ? "Buffer salt " : "Buffer salt near its limit: ") +
                          group_words(w.t("group")) + " reaches " + fmt(total, 2) + " mmol/L at " +
                          fmt(100 * w.n("organic_fraction_v")) + " % organic " + where + ", " +
                          (over ? "more than" : "close to what") + " the solution holds there: ";
        const std::string in = " mmol/L in water–" + w.name(w.t("organic"));
        if (w.flag("speciated"))
            msg += "at s_s pH " + fmt(w.n("ph_s_s"), 2) + " the " + form_words(w.t("form")) +
                   " limits, " + fmt(w.n("form_mmol_per_l"), 2) + " mmol/L against its limit of " +
                   fmt(w.n("form_limit_mmol_per_l"), 2) + in + ", and its forms together reach " +
                   fmt(100 * share, 0) + " % of their limits (" + basis + ").";
        else
            msg += "without the eluent's pH all of it is counted as its least soluble form, the " +
                   form_words(w.t("form")) + ", limit " + fmt(w.n("form_limit_mmol_per_l"), 2) +
                   in + " (" + basis + ").";
        if (over)
            msg += " It may precipitate in the mixer, the column or the check valves: lower the "
                   "salt or the organic end, or use a pH where the salt is in its more soluble "
                   "form.";
        return msg;
    }
    std::string msg = (over ? "Buffer salt " : "Buffer salt near its limit: ") +
                      group_words(w.t("group")) + " reaches " + fmt(w.n("mmol_per_l"), 2) +
                      " mmol/L at " + fmt(100 * w.n("organic_fraction_v")) + " % organic " + where +
                      ", " + (over ? "above" : "close to") + " the limit of " +
                      fmt(w.n("limit_mmol_per_l"), 2) + " mmol/L in water–" +
                      w.name(w.t("organic")) + " (" + basis + ").";
    if (over)
        msg += " It may precipitate in the mixer, the column or the check valves: lower the salt "
               "or the organic end.";
    return msg;
}

std::string column_ph_eluent(const Words& w) {
    const Finding& f = w.f;
    const bool low = w.flag("below");
    const std::string where =
        f.alone ? "The line's eluent" : "In method " + f.subject.id + ", the eluent";
    const std::string span = f.alone ? ""
                                     : " from " + fmt(w.n("from_t_min"), 2) + " to " +
                                           fmt(w.n("to_t_min"), 2) + " min of each injection (" +
                                           w.pct(w.n("from_organic_fraction_v")) + " to " +
                                           w.pct(w.n("to_organic_fraction_v")) + "), worst at " +
                                           fmt(w.n("t_min"), 2) + " min";
    return where + " has s_w pH " + fmt(w.n("ph"), 2) + " at " + w.pct(w.n("organic_fraction_v")) +
           " and " + fmt(w.n("temperature_c"), 0) + " °C" + span + ", " +
           (low ? "below" : "above") +
           (w.flag("method_column") ? " the method's column's range of pH "
                                    : " the column's range of pH ") +
           fmt(w.n("ph_min"), 1) + " to " + fmt(w.n("ph_max"), 1) + ": " +
           (low ? "the bonded phase hydrolyses." : "the silica dissolves.") +
           " The organic moves the pH away from the aqueous buffer's; use a column rated for this "
           "pH or change the buffer." +
           (w.flag("extrapolated") ? " (The eluent pH there is an estimate.)" : "");
}

std::string buffer_range(const Words& w) {
    const Finding& f = w.f;
    const std::string where = f.alone ? "The line's eluent"
                                      : "In method " + f.subject.id + ", from " +
                                            fmt(w.n("from_t_min"), 2) + " to " +
                                            fmt(w.n("to_t_min"), 2) + " min of each injection (" +
                                            w.pct(w.n("from_organic_fraction_v")) + " to " +
                                            w.pct(w.n("to_organic_fraction_v")) + "), the eluent";
    return where + " has s_s pH " + fmt(w.n("ph_s_s"), 2) + " at " +
           w.pct(w.n("organic_fraction_v")) + ", " + fmt(w.n("gap"), 2) +
           " units from the nearest s_s pKa′ (" + w.t("nearest_system") + " " +
           fmt(w.n("nearest_pka"), 2) + ")" +
           ": outside pKa′ ± 1 the eluent buffers poorly, so the sample or the column can shift "
           "its pH and retention. Choose a buffer whose pKa′ in the eluent lies within one unit "
           "of its pH." +
           (w.flag("extrapolated") ? " (The eluent pH there is an estimate.)" : "");
}

std::string shelf_life(const Words& w) {
    const bool known = w.f.has_number("prepared_at_min");
    const bool already = !w.f.has_number("expires_during_injection");
    return w.title() + " (" + w.t("kind") + ", shelf life " + fmt(w.n("shelf_life_h"), 0) +
           " h, a lab-set default) " +
           (known ? "was prepared at " + w.clock(w.n("prepared_at_min"))
                  : "even if prepared at the start, " + w.clock(0)) +
           ", and " +
           (already ? "is past its shelf life before the sequence starts."
                    : "passes its shelf life at " + w.clock(w.n("expires_at_min")) +
                          ", during injection " + w.count(w.n("expires_during_injection")) +
                          " of " + w.count(w.n("injections")) + ".") +
           " Prepare it fresh.";
}

/// What a bottle needs and what to prepare: shared by runs-dry and its caution.
std::string bottle_need(const Words& w) {
    return "the sequence needs " + fmt(w.n("required_ml"), 0) +
           " mL (priming included), the bottle has " + fmt(w.n("usable_ml"), 0) +
           " mL usable above the residue";
}
std::string bottle_suggestion(const Words& w) {
    return "Prepare at least " + fmt(std::ceil(w.n("min_bottle_ml")), 0) + " mL (" +
           fmt(100 * w.n("margin_fraction"), 0) + " % spare plus the residue)" +
           (w.f.has_number("suggested_bottle_ml")
                ? ", e.g. a " + fmt(w.n("suggested_bottle_ml"), 0) + " mL bottle."
                : ".");
}

std::string runs_dry(const Words& w) {
    const std::string& phase = w.t("phase");
    std::string when;
    if (phase == dry_phase_name(DryPhase::priming))
        when = "already during priming";
    else if (phase == dry_phase_name(DryPhase::standby))
        when = "during the standby after injection " + w.count(w.n("dry_after_injection")) +
               ", at " + w.clock(w.n("dry_at_min"));
    else
        when = "during injection " + w.count(w.n("dry_after_injection")) + " of " +
               w.count(w.n("injections")) + ", at " + w.clock(w.n("dry_at_min"));
    return w.title() + " runs dry " + when + ": " + bottle_need(w) + ". The pump then draws air. " +
           bottle_suggestion(w);
}

std::string runs_low(const Words& w) {
    const double spare = w.n("spare_ml");
    return w.title() + " lasts, but with only " + fmt(spare, 0) + " mL to spare (" +
           fmt(100 * spare / w.n("required_ml"), 1) + " %, less than the " +
           fmt(100 * w.n("margin_fraction"), 0) + " % margin): " + bottle_need(w) + ". " +
           bottle_suggestion(w);
}

std::string waste_overflow(const Words& w) {
    const double waste = w.n("waste_ml");
    std::string when;
    if (w.f.has_number("full_at_min")) {
        const double t = w.n("full_at_min");
        if (t <= 0)
            when = " during priming";
        else if (w.f.has_number("full_during_injection"))
            when =
                " during injection " + w.count(w.n("full_during_injection")) + ", at " + w.clock(t);
        else
            when = " during the standby, at " + w.clock(t);
    }
    return "The waste container overfills" + when + ": the sequence sends " + fmt(waste, 0) +
           " mL to waste (priming included) into " + fmt(w.n("capacity_ml"), 0) +
           " mL of free volume. Empty it first or use a larger one (at least " +
           fmt(std::ceil(waste * 1.1), 0) + " mL with 10 % spare).";
}

std::string pressure_limit(const Words& w) {
    const double peak = w.n("max_pressure_bar");
    const double limit_bar = w.n("limit_bar");
    const bool over = peak > limit_bar;
    const std::string where = "peaks at " + fmt(peak, 0) + " bar " + fmt(w.n("peak_t_min"), 1) +
                              " min into each injection, with " +
                              fmt(100 * w.n("organic_fraction_v"), 0) +
                              " % v/v organic in the column (" + w.mix(true, "/") + " entering it)";
    const std::string limit = fmt(limit_bar, 0) + " bar limit of the " + w.t("limited_by");
    // A one-method document (pressure, transfer) has no method name to give.
    const std::string subject =
        w.f.subject.id.empty() ? std::string("The method") : "Method " + w.f.subject.id;
    return over ? subject + " " + where + ", above the " + limit +
                      ": the pump would stop the sequence. Lower the flow, raise the column "
                      "temperature or use a column with larger particles."
                : subject + " " + where + ", within 10 % of the " + limit +
                      ": a partly blocked frit or a colder room could trip it.";
}

std::string ionic_strength_high(const Words& w) {
    const std::string& model = w.t("model");
    if (model == "sit")
        return "Ionic strength " + format_number(w.n("ionic_strength_mol_per_kg")) +
               " mol/kg is above 3.5 mol/kg, beyond the range where the SIT activity model was "
               "fitted: treat the pH as indicative only and measure it.";
    if (model == "truesdell-jones")
        return "Ionic strength " + format_number(w.n("ionic_strength_mol_per_kg")) +
               " mol/kg is above 1 mol/kg, beyond the range where the Truesdell–Jones activity "
               "model was checked: treat the pH as indicative only and measure it, or choose "
               "\"activity_model\": \"sit\".";
    if (w.f.severity == Severity::warning)
        return "Ionic strength " + format_number(w.n("ionic_strength_mol_per_l")) +
               " mol/L is above 0.5 mol/L, where the Davies activity model does not hold: treat "
               "the pH as indicative only (errors of 0.1 pH unit or more) and measure it, or "
               "choose \"activity_model\": \"sit\".";
    return "Ionic strength " + format_number(w.n("ionic_strength_mol_per_l")) +
           " mol/L is above 0.1 mol/L; the Davies activity model loses accuracy here (a few "
           "hundredths of a pH unit); \"activity_model\": \"sit\" holds to a few mol/kg.";
}

std::string activity_model_differs(const Words& w) {
    const bool tj = w.t("model") == "truesdell-jones";
    return "The Davies model gives pH " + format_fixed(w.n("davies_ph"), 3) + " and the " +
           (tj ? "Truesdell–Jones" : "SIT") + " model pH " + format_fixed(w.n("extended_ph"), 3) +
           " at I = " + format_fixed(w.n("ionic_strength_mol_per_l"), 3) +
           " mol/L: they differ by more than 0.02. " +
           (tj ? "Truesdell–Jones (\"activity_model\": \"truesdell-jones\") holds to about 1 mol/kg"
               : "SIT (\"activity_model\": \"sit\") holds to a few mol/kg") +
           ", Davies to about 0.1 mol/L.";
}

std::string ph_outside_pka_range(const Words& w) {
    // The nearest step: its system, the conditional pKa′ and the thermodynamic pKa at T.
    const std::string nearest = w.f.subject.kind == Subject::Kind::system
                                    ? w.f.subject.id + " pKa′ " +
                                          format_fixed(w.n("pka_conditional"), 2) + " (pKa " +
                                          format_fixed(w.n("pka"), 2) + ")"
                                    : std::string();
    return "pH " + format_fixed(w.n("target_ph"), 2) + " is " + format_fixed(w.n("gap"), 2) +
           " pH units from the nearest conditional pKa′ (" + nearest + " at " +
           format_number(w.n("temperature_c")) +
           " °C and I = " + format_fixed(w.n("ionic_strength_mol_per_l"), 3) +
           " mol/L); outside pKa′ ± 1 the solution buffers poorly.";
}

std::string small_amount(const Words& w) {
    const std::string who = w.name(w.f.subject.id) + ": ";
    if (w.f.has_number("mass_g"))
        return who + format_fixed(w.n("mass_g") * 1000, 2) +
               " mg is below what a lab balance weighs well (10 mg); make a larger volume or use "
               "a stock solution.";
    return who + format_fixed(w.n("volume_ml") * 1000, 1) +
           " µL is below what a pipette delivers well (10 µL); make a larger volume or dilute "
           "the reagent first.";
}

/// A signed deviation in pH units: "+0.11", "-0.08"; `plus_at_zero` gives "+0.00" for 0.
std::string ph_deviation(double d, bool plus_at_zero) {
    return std::string(d > 0 || (plus_at_zero && d >= 0) ? "+" : "") + format_fixed(d, 2);
}

/// A fraction as a percentage with one decimal at most: "12.5 %", "-30 %".
std::string transfer_percent(double fraction) {
    return format_number(std::round(fraction * 1000.0) / 10.0) + " %";
}

std::string eluent_ph_extrapolated(const Words& w) {
    const Finding& f = w.f;
    std::vector<std::string> how;
    if (w.flag("mixed_organics"))
        how.push_back("acetonitrile and methanol together: each one's shifts of pKa, pKw and δ at "
                      "the total organic fraction, weighted by its share of the organic");
    const std::vector<std::string> others = f.texts_all("other_organic");
    const std::vector<std::string> bases = f.texts_all("other_organic_basis");
    for (std::size_t i = 0; i < others.size(); ++i)
        how.push_back(others[i] + " has no published parameters here: treated as " +
                      (i < bases.size() ? bases[i] : std::string()) +
                      " (the same kind of solvent)");
    if (w.flag("beyond_published_range"))
        how.push_back("the organic fraction " + format_fixed(100 * w.n("organic_fraction_v"), 0) +
                      " % lies beyond the published range (about 60 % acetonitrile, 80 % "
                      "methanol): the pKa and pKw shifts are extrapolated linearly in 1/ε from "
                      "the last two published rows, and δ from its equation");
    const std::vector<std::string> systems = f.texts_all("estimated_system");
    const std::vector<double> steps = f.numbers_all("estimated_step");
    const std::vector<std::string> from = f.texts_all("analogue_system");
    const std::vector<double> from_steps = f.numbers_all("analogue_step");
    if (!systems.empty()) {
        std::string list;
        for (std::size_t i = 0; i < systems.size(); ++i) {
            const std::string analogue = i < from.size() && !from[i].empty() ? from[i] : "none";
            list += (i ? ", " : "") + systems[i] + " step " + w.count(steps.at(i)) + " from " +
                    analogue + " step " + w.count(from_steps.at(i));
        }
        how.push_back("no published s_s pKa table for " + list +
                      ": each takes the shift of a system whose acid form has the same charge");
    }
    std::string msg = "The eluent pH is an estimate: ";
    for (std::size_t i = 0; i < how.size(); ++i)
        msg += (i ? "; " : "") + how[i];
    return msg + ". Treat it as indicative (a few tenths of a pH unit) and measure the s_w pH of "
                 "the mixed eluent if it matters.";
}

std::string viscosity_estimate(const Words& w) {
    const bool ideal = w.t("viscosity_basis") == viscosity_basis_name(ViscosityBasis::ideal_mixing);
    return "The viscosity of " + w.item_names() + " with water is " +
           (ideal ? "not modelled: ideal mixing of the pure solvents at their library temperature "
                    "is used, so the pressure may be well off."
                  : "a one-point estimate: the pressure is rougher than for acetonitrile or "
                    "methanol.");
}

/// The first `n` characters (UTF-8 code points) of `s`, never cutting inside one.
std::string first_chars(const std::string& s, std::size_t n) {
    std::size_t i = 0;
    for (std::size_t count = 0; i < s.size(); ++i)
        if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80 && count++ == n)
            break;
    return s.substr(0, i);
}

/// An instrument's kind in words: "balance", "pH meter"; `other` when neither.
std::string device_words(const std::string& kind, const char* other) {
    if (kind == "balance")
        return "balance";
    if (kind == "ph_meter")
        return "pH meter";
    return other;
}

std::string expired_lot_override(const Words& w) {
    const std::string& name = w.t("name");
    const std::string who = name.empty() ? w.t("by") : name + " (" + w.t("by") + ")";
    // An ISO time to the second, "2026-12-02 14:03:00", with " UTC" for a time in Z.
    std::string at = w.t("at");
    std::string when;
    if (!at.empty()) {
        when = first_chars(at, 19);
        for (char& c : when)
            if (c == 'T')
                c = ' ';
        when = " at " + when + (at.back() == 'Z' ? " UTC" : "");
    }
    const std::string& expired = w.t("lot_expires_on");
    return "Lot " + w.t("lot") + " of " + w.name(w.f.subject.id) + " expired on " +
           (expired.empty() ? std::string("(date not recorded)") : expired) +
           "; used by override of " + who + when + ": " + w.t("reason");
}

std::string reading_calibration_due(const Words& w) {
    const std::string what = w.f.subject.kind == Subject::Kind::reagent
                                 ? "The amount of " + w.name(w.f.subject.id)
                                 : std::string("The measured pH");
    return what + " was taken from " + device_words(w.t("device_kind"), "instrument") + " " +
           w.f.where.id + ", which was due for calibration on " + w.t("calibration_due");
}

std::string batch_shelf_life(const Words& w) {
    // Fixed decimals as the contract wrote them (ties away from zero).
    return "One batch of " + w.t("recipe") + " for " + w.count(w.n("bottles")) +
           " bottles would be used over " + format_fixed_ties_away(w.n("span_h"), 1) +
           " h, longer than its shelf life of " + format_fixed_ties_away(w.n("shelf_life_h"), 0) +
           " h (" + w.t("kind") + ", a lab-set default): make at least " + w.count(w.n("batches")) +
           " batches.";
}

} // namespace

std::string signed_percent(double fraction) {
    std::string s = fraction >= 0 ? "+" : "";
    s += format_fixed(fraction * 100, 1);
    s += " %";
    return s;
}

Warning warning_of(Finding f, const RenderContext& ctx) {
    Warning w;
    w.code = f.code();
    w.severity = f.severity;
    w.message = describe(f, ctx);
    w.finding = std::move(f);
    return w;
}

std::string line_title(const std::string& l, const RenderContext& ctx) {
    const int i = line_index(l);
    const std::string n = i >= 0 ? ctx.line_names[i] : std::string();
    return "Line " + l + (n.empty() || n == l ? "" : " (" + n + ")");
}

std::string describe(const Finding& f, const RenderContext& ctx) {
    const Words w{f, ctx};
    switch (f.kind) {
    case FindingKind::uv_cutoff_eluent:
        return uv_eluent(w);
    case FindingKind::uv_cutoff_unknown:
        return w.title() + ": no UV cutoff figure for " + w.item_names() +
               "; check its absorbance at " + fmt(w.n("wavelength_nm"), 0) + " nm before the run.";
    case FindingKind::uv_cutoff_beyond_table:
        return w.title() + ": " + w.item_names() +
               " is above the highest concentration in its UV table; the cutoff used (" +
               fmt(w.n("cutoff_nm"), 0) + " nm) is a lower bound.";
    case FindingKind::immiscible_in_line: {
        const bool imm = w.t("miscibility") == miscibility_name(Miscibility::immiscible);
        return w.title() + " mixes " + w.name(w.t("solvent_a")) + " (" +
               fmt(100 * w.n("fraction_a_v")) + " %) with " + w.name(w.t("solvent_b")) + " (" +
               fmt(100 * w.n("fraction_b_v")) + " %), which are " +
               (imm ? "immiscible: the bottle separates into two phases."
                    : "only partly miscible: check that the bottle stays one clear phase.");
    }
    case FindingKind::immiscible_lines:
        return immiscible_lines(w);
    case FindingKind::precipitation:
        return precipitation(w);
    case FindingKind::ms_nonvolatile: {
        std::vector<std::string> parts;
        for (const auto& [id, mmol] : f.items)
            parts.push_back(w.name(id) + " " + fmt(mmol, 2) + " mmol/L");
        return w.title() + " carries non-volatile " + join(parts) + " into the " + w.t("detector") +
               " detector: it deposits in the source and suppresses the signal. Use a volatile "
               "buffer (formate, acetate, ammonium bicarbonate) or divert the flow.";
    }
    case FindingKind::ms_additive:
        return w.title() + " carries " + w.t("additive") + " (" + fmt(w.n("mmol_per_l"), 2) +
               " mmol/L) into the " + w.t("detector") + " detector: " + w.t("ms_caution") + " (" +
               w.t("ms_caution_source") + ").";
    case FindingKind::ms_volatility_unknown:
        return w.title() + ": volatility of " + w.item_names() +
               " is not recorded; check it suits the " + w.t("detector") + " detector.";
    case FindingKind::column_ph_eluent:
        return column_ph_eluent(w);
    case FindingKind::column_ph_line: {
        const bool low = w.n("ph") < w.n("ph_min");
        return w.title() + " has pH " + fmt(w.n("ph"), 2) + " (" + w.t("ph_basis") + "), " +
               (low ? "below" : "above") + " the column's range of pH " + fmt(w.n("ph_min"), 1) +
               " to " + fmt(w.n("ph_max"), 1) + ": " +
               (low ? "the bonded phase hydrolyses." : "the silica dissolves.") +
               " Use a column rated for this pH or change the buffer.";
    }
    case FindingKind::buffer_range:
        return buffer_range(w);
    case FindingKind::shelf_life:
        return shelf_life(w);
    case FindingKind::runs_dry:
        return runs_dry(w);
    case FindingKind::runs_low:
        return runs_low(w);
    case FindingKind::waste_overflow:
        return waste_overflow(w);
    case FindingKind::waste_nearly_full: {
        const double waste = w.n("waste_ml"), cap = w.n("capacity_ml");
        return "The waste container will be " + fmt(100 * waste / cap, 0) + " % full (" +
               fmt(waste, 0) + " of " + fmt(cap, 0) + " mL): little room for a rerun or a spill.";
    }
    case FindingKind::pressure_limit:
        return pressure_limit(w);
    case FindingKind::ionic_strength_high:
        return ionic_strength_high(w);
    case FindingKind::activity_model_differs:
        return activity_model_differs(w);
    case FindingKind::ph_outside_pka_range:
        return ph_outside_pka_range(w);
    case FindingKind::low_buffer_capacity:
        return "Buffer capacity " + format_fixed(w.n("buffer_capacity_mol_per_l") * 1000, 2) +
               " mmol/L per pH is below 2 mmol/L per pH (common practice, no source): the sample "
               "or dissolved CO2 can shift the pH.";
    case FindingKind::small_amount:
        return small_amount(w);
    case FindingKind::amount_out_of_tolerance: {
        // Built with += : GCC 12 warns falsely (-Wrestrict) on long chains of literal + string.
        const std::string& unit = w.t("unit");
        std::string m = w.name(f.subject.id);
        m += ": " + format_amount(w.n("actual")) + " " + unit;
        m += " measured, target " + format_amount(w.n("target")) + " " + unit;
        m += " ± " + format_number(w.n("tolerance_fraction") * 100) + " %";
        m += " (" + format_amount(w.n("low")) + " to " + format_amount(w.n("high")) + " " + unit +
             "), ";
        m += signed_percent(w.n("deviation_fraction"));
        m += ".";
        return m;
    }
    case FindingKind::amount_not_entered:
        return w.name(f.subject.id) + ": no actual amount entered; the target " +
               format_amount(w.n("target")) + " " + w.t("unit") + " is assumed.";
    case FindingKind::titrant_volume_large:
        return "The titrant takes " + format_amount(w.n("volume_ml")) + " mL of the " +
               format_number(w.n("final_volume_ml")) +
               " mL final volume; use a more concentrated titrant.";
    case FindingKind::ph_off_target:
        return "From the actual amounts the predicted pH is " +
               format_fixed(w.n("predicted_ph"), 2) + ", " +
               ph_deviation(w.n("deviation_ph"), false) + " from the target " +
               format_fixed(w.n("target_ph"), 2) +
               " (more than 0.05: common practice, no source); check the meter reading and the "
               "weighings before use.";
    case FindingKind::measured_ph_out_of_tolerance: {
        std::string m = "Measured pH " + format_fixed(w.n("measured_ph"), 2);
        m += ", " + ph_deviation(w.n("deviation_ph"), true);
        m += " from the target " + format_fixed(w.n("target_ph"), 2);
        m += ", outside ± " + format_number(w.n("ph_tolerance")) + ".";
        return m;
    }
    case FindingKind::eluent_ph_extrapolated:
        return eluent_ph_extrapolated(w);
    case FindingKind::eluent_temperature:
        return "The aqueous pKa and pKw values are taken at " +
               format_number(w.n("temperature_c")) +
               " °C; the organic's shifts of them and δ are the published 25 °C values.";
    case FindingKind::dwell_too_large:
        return "The new system's dwell volume delays the gradient by " +
               format_fixed(w.n("delay_min"), 2) +
               " min more than the original, in column volumes: peaks elute later relative to the "
               "gradient. Start the gradient before the injection (injection delay) by that much "
               "if the system allows it.";
    case FindingKind::outside_allowed_adjustment:
        return "L/dp changes by " + transfer_percent(w.n("l_over_dp_change")) +
               ", outside the −25 % to +50 % that USP <621> allows as an adjustment: the moved "
               "method needs revalidation (or a column with an L/dp in that band).";
    case FindingKind::flow_not_scaled:
        return "The chosen flow " + format_fixed(w.n("flow_ml_min"), 3) + " mL/min differs by " +
               transfer_percent(w.n("deviation_fraction")) + " from the scaled flow " +
               format_fixed(w.n("scaled_flow_ml_min"), 3) +
               " mL/min; the gradient times are scaled for the chosen flow, so the gradient "
               "volume in column volumes is kept.";
    case FindingKind::small_injection:
        return "The scaled injection is " + format_fixed(w.n("injection_ul"), 2) +
               " µL: below what many autosamplers deliver precisely (common practice, no "
               "source); consider a more concentrated sample or a partial-loop setting.";
    case FindingKind::viscosity_estimate:
        return viscosity_estimate(w);
    case FindingKind::pressure_uncalibrated:
        return "The column pressure is a Kozeny–Carman estimate (flow resistance " +
               format_number(std::round(w.n("flow_resistance"))) +
               "); give the column a measured reference pressure to calibrate it.";
    case FindingKind::pressure_no_limit:
        return "Neither the column nor the instrument gives max_pressure_bar: the pressure is "
               "not checked against a limit.";
    case FindingKind::pressure_unknown: {
        std::string lines;
        for (const auto& [l, unused] : f.items)
            lines += l;
        return "No pressure for method " + f.subject.id + ": line(s) " + lines +
               " have no parts, so the viscosity is unknown.";
    }
    case FindingKind::buffer_scaled:
        return "The buffer of " + w.t("line_name") + " was designed for " +
               format_number(std::ceil(w.n("needed_ml"))) + " mL instead of " +
               format_number(w.n("requested_ml")) + " mL: the part needs that much.";
    case FindingKind::device_calibration_due: {
        const std::string what = device_words(w.t("device_kind"), "pH meter");
        return what + " " + f.subject.id + " was due for calibration on " + w.t("calibration_due") +
               ": calibrate it or use another " + what;
    }
    case FindingKind::reading_calibration_due:
        return reading_calibration_due(w);
    case FindingKind::expired_lot_override:
        return expired_lot_override(w);
    case FindingKind::batch_shelf_life:
        return batch_shelf_life(w);
    }
    return {};
}

} // namespace chem
