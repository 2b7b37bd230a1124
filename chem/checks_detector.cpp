// The checks that depend on the detector: UV cutoff and a non-volatile additive into a mass
// spectrometer.
#include "chem/checks.h"
#include "chem/checks_common.h"

#include "chem/error.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <map>
#include <set>

namespace chem {

using namespace checks_internal;

const char* detector_type_name(DetectorType type) {
    switch (type) {
    case DetectorType::uv:
        return "uv";
    case DetectorType::dad:
        return "dad";
    case DetectorType::pda:
        return "pda";
    case DetectorType::uv_ms:
        return "uv-ms";
    case DetectorType::ms:
        return "ms";
    case DetectorType::elsd:
        return "elsd";
    case DetectorType::cad:
        return "cad";
    case DetectorType::fluorescence:
        return "fluorescence";
    case DetectorType::ri:
        return "ri";
    }
    return "uv";
}

const std::vector<DetectorType>& detector_types() {
    static const std::vector<DetectorType> t = {
        DetectorType::uv,    DetectorType::dad,          DetectorType::pda,
        DetectorType::uv_ms, DetectorType::ms,           DetectorType::elsd,
        DetectorType::cad,   DetectorType::fluorescence, DetectorType::ri};
    return t;
}

std::optional<DetectorType> detector_type_from_name(const std::string& name) {
    for (DetectorType t : detector_types())
        if (name == detector_type_name(t))
            return t;
    return std::nullopt;
}

bool detector_reads_uv(DetectorType t) {
    return t == DetectorType::uv || t == DetectorType::dad || t == DetectorType::pda ||
           t == DetectorType::uv_ms;
}
bool detector_needs_volatile(DetectorType t) {
    return t == DetectorType::ms || t == DetectorType::uv_ms || t == DetectorType::elsd ||
           t == DetectorType::cad;
}

std::vector<CheckWarning> check_uv_cutoff(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.detector || !detector_reads_uv(c.detector->type) || !c.detector->wavelength_nm)
        return out;
    const double wl = *c.detector->wavelength_nm;
    const double margin = c.detector->margin_nm;
    const auto used = lines_in_use(*c.input, *c.plan);
    LineValues line_a{}; // each line's absorbance at wl
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && c.profiles[l] && c.profiles[l]->described)
            line_a[l] = uv_absorbance(c.profiles[l]->uv_parts, wl);
    struct Worst {
        double a = -1;
        std::string where;
        double t_min = 0;
        LineValues percent{};
    } worst;
    for (const NamedStretch& ns : all_stretches(*c.input, *c.plan))
        for (const bool end : {false, true}) {
            const LineValues& pc = end ? ns.s.percent_end : ns.s.percent_start;
            double a = 0;
            for (int l = 0; l < max_lines; ++l)
                a += pc[l] / 100.0 * line_a[l];
            if (a > worst.a + 1e-12) {
                worst = {a, ns.where, ns.s.start_min + (end ? ns.s.duration_min : 0.0), pc};
            }
        }
    // The eluent's cutoff at that composition, from all its parts (absorbance adds).
    std::vector<UvPart> eluent;
    bool tables = false;
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && c.profiles[l] && c.profiles[l]->described && worst.percent[l] > 0)
            for (const UvPart& u : c.profiles[l]->uv_parts) {
                eluent.push_back(u);
                eluent.back().scale *= worst.percent[l] / 100.0;
                tables = tables || !u.table.empty();
            }
    const double cut = worst.a > 0 ? line_uv_cutoff_nm(eluent, nullptr) : 0;
    // Within the margin: on the cutoff model alone, A ≥ 10^(−margin/w) is the same as a cutoff
    // within margin_nm of the wavelength; a published table bends the curve, so then the cutoff
    // itself is compared.
    const bool near = tables ? worst.a > 0 && cut >= wl - margin
                             : worst.a >= std::pow(10.0, -margin / uv_decade_nm);
    if (near || worst.a >= 1) {
        // The line, and the part of it, that brings most of the absorbance there.
        int top_line = -1;
        double top_a = -1;
        std::string part;
        for (int l = 0; l < max_lines; ++l) {
            if (!c.profiles[l] || worst.percent[l] <= 0)
                continue;
            for (const UvPart& u : c.profiles[l]->uv_parts) {
                const double a = worst.percent[l] / 100.0 * uv_absorbance({u}, wl);
                if (a > top_a) {
                    top_a = a;
                    top_line = l;
                    part = u.who;
                }
            }
        }
        const bool below = worst.a >= 1;
        std::string where;
        if (!c.lone_line) {
            std::string mix;
            for (int l = 0; l < max_lines; ++l)
                if (worst.percent[l] > 0)
                    mix += (mix.empty() ? "" : ", ") + fmt(worst.percent[l], 0) + " % " + letter(l);
            where = worst.where == "standby"
                        ? " at standby (" + mix + ")"
                        : " in method " + worst.where + " at " + fmt(worst.t_min, 2) +
                              " min of each injection (" + mix + ")";
        }
        const std::string who =
            top_line >= 0 ? named(c, part) + (c.lone_line ? "" : " in " + line_title(c, top_line))
                          : std::string("its parts");
        CheckWarning w = make(
            "uv-cutoff", below ? Sev::warning : Sev::caution, top_line >= 0 ? letter(top_line) : "",
            std::string(c.lone_line ? "The line" : "The eluent") + where + " absorbs " +
                fmt(worst.a, 2) + " (1 cm) at " + fmt(wl, 0) + " nm, mostly from " + who +
                ": its UV cutoff there is " + fmt(cut, 0) + " nm; the detector reads at " +
                fmt(wl, 0) + " nm, " +
                (below ? "below the cutoff: expect a high baseline and a drifting gradient."
                       : "within " + fmt(margin, 0) +
                             " nm of it: expect baseline drift over the gradient."));
        w.number("wavelength_nm", wl);
        w.number("cutoff_nm", cut);
        w.number("absorbance", worst.a);
        w.number("margin_nm", margin);
        w.text("limited_by", part);
        if (!c.lone_line) {
            w.text("method", worst.where);
            w.number("t_min", worst.t_min);
        }
        out.push_back(w);
    }
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->uv_unknown.empty()) {
            CheckWarning w = make("uv-cutoff", Sev::caution, letter(l),
                                  line_title(c, l) + ": no UV cutoff figure for " +
                                      join(named(c, p->uv_unknown)) + "; check its absorbance at " +
                                      fmt(wl, 0) + " nm before the run.");
            w.number("wavelength_nm", wl);
            w.text("unknown", join(p->uv_unknown));
            out.push_back(w);
        }
        if (!p->uv_beyond_table.empty()) {
            CheckWarning w =
                make("uv-cutoff", Sev::info, letter(l),
                     line_title(c, l) + ": " + join(named(c, p->uv_beyond_table)) +
                         " is above the highest concentration in its UV table; the cutoff used (" +
                         fmt(p->uv_cutoff_nm, 0) + " nm) is a lower bound.");
            w.number("cutoff_nm", p->uv_cutoff_nm);
            out.push_back(w);
        }
    }
    return out;
}

// (b) Lines that meet in the mixer (both above 0 % at the same time) and do not mix; and parts of
// one line that do not mix.

std::vector<CheckWarning> check_ms_nonvolatile(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.detector || !detector_needs_volatile(c.detector->type))
        return out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->nonvolatile.empty()) {
            std::vector<std::string> parts;
            for (const auto& id : p->nonvolatile)
                for (const auto& s : p->solutes)
                    if (s.reagent == id)
                        parts.push_back(named(c, id) + " " + fmt(s.mmol_per_l, 2) + " mmol/L");
            CheckWarning w =
                make("ms-nonvolatile", Sev::warning, letter(l),
                     line_title(c, l) + " carries non-volatile " + join(parts) + " into the " +
                         detector_type_name(c.detector->type) +
                         " detector: it deposits in the source and suppresses the signal. Use a "
                         "volatile "
                         "buffer (formate, acetate, ammonium bicarbonate) or divert the flow.");
            for (const auto& s : p->solutes)
                if (std::find(p->nonvolatile.begin(), p->nonvolatile.end(), s.reagent) !=
                    p->nonvolatile.end())
                    w.number(s.reagent + "_mmol_per_l", s.mmol_per_l);
            w.text("detector", detector_type_name(c.detector->type));
            w.text("nonvolatile", join(p->nonvolatile));
            out.push_back(w);
        }
        for (const Solute& s : p->solutes) {
            const Additive* add = c.solvents->find_additive(s.reagent);
            if (!add || add->ms_caution.empty())
                continue;
            CheckWarning w =
                make("ms-nonvolatile", Sev::caution, letter(l),
                     line_title(c, l) + " carries " + s.reagent + " (" + fmt(s.mmol_per_l, 2) +
                         " mmol/L) into the " + detector_type_name(c.detector->type) +
                         " detector: " + add->ms_caution + " (" + add->ms_caution_source + ").");
            w.text("detector", detector_type_name(c.detector->type));
            w.text("additive", s.reagent);
            out.push_back(w);
        }
        if (!p->volatility_unknown.empty()) {
            CheckWarning w =
                make("ms-nonvolatile", Sev::caution, letter(l),
                     line_title(c, l) + ": volatility of " + join(named(c, p->volatility_unknown)) +
                         " is not recorded; check it suits the " +
                         detector_type_name(c.detector->type) + " detector.");
            w.text("detector", detector_type_name(c.detector->type));
            w.text("unknown", join(p->volatility_unknown));
            out.push_back(w);
        }
    }
    return out;
}

} // namespace chem
