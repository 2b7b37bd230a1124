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

std::vector<Finding> check_uv_cutoff(const SequenceCheckInput& c) {
    std::vector<Finding> out;
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
        NamedStretch const* where = nullptr;
        double t_min = 0;
        LineValues percent{};
    } worst;
    const std::vector<NamedStretch> stretches_run = all_stretches(*c.input, *c.plan);
    for (const NamedStretch& ns : stretches_run)
        for (const bool end : {false, true}) {
            const LineValues& pc = end ? ns.s.percent_end : ns.s.percent_start;
            double a = 0;
            for (int l = 0; l < max_lines; ++l)
                a += pc[l] / 100.0 * line_a[l];
            if (a > worst.a + 1e-12) {
                worst = {a, &ns, ns.s.start_min + (end ? ns.s.duration_min : 0.0), pc};
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
        Finding w = make(FindingKind::uv_cutoff_eluent, below ? Sev::warning : Sev::caution,
                         top_line >= 0 ? Subject::of_line(top_line) : Subject{});
        if (!c.lone_line && worst.where) {
            w.where = worst.where->place();
            for (int l = 0; l < max_lines; ++l)
                if (worst.percent[l] > 0)
                    w.detail("line_percent_" + letter(l), worst.percent[l]);
        }
        w.number("wavelength_nm", wl);
        w.number("cutoff_nm", cut);
        w.number("absorbance", worst.a);
        w.number("margin_nm", margin);
        w.text("limited_by", part);
        if (!c.lone_line && worst.where) {
            w.text("method", worst.where->where);
            w.number("t_min", worst.t_min);
        }
        out.push_back(w);
    }
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->uv_unknown.empty()) {
            Finding w = make(FindingKind::uv_cutoff_unknown, Sev::caution, Subject::of_line(l));
            w.number("wavelength_nm", wl);
            w.text("unknown", join(p->uv_unknown));
            for (const auto& id : p->uv_unknown)
                w.items.emplace_back(id, std::nan(""));
            out.push_back(w);
        }
        if (!p->uv_beyond_table.empty()) {
            Finding w = make(FindingKind::uv_cutoff_beyond_table, Sev::info, Subject::of_line(l));
            w.number("cutoff_nm", p->uv_cutoff_nm);
            for (const auto& id : p->uv_beyond_table)
                w.items.emplace_back(id, std::nan(""));
            out.push_back(w);
        }
    }
    return out;
}

// (b) Lines that meet in the mixer (both above 0 % at the same time) and do not mix; and parts of
// one line that do not mix.

std::vector<Finding> check_ms_nonvolatile(const SequenceCheckInput& c) {
    std::vector<Finding> out;
    if (!c.detector || !detector_needs_volatile(c.detector->type))
        return out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->nonvolatile.empty()) {
            Finding w = make(FindingKind::ms_nonvolatile, Sev::warning, Subject::of_line(l));
            for (const auto& id : p->nonvolatile)
                for (const auto& s : p->solutes)
                    if (s.reagent == id)
                        w.items.emplace_back(id, s.mmol_per_l);
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
            Finding w = make(FindingKind::ms_additive, Sev::caution, Subject::of_line(l));
            w.detail("mmol_per_l", s.mmol_per_l);
            w.detail_text("ms_caution", add->ms_caution);
            w.detail_text("ms_caution_source", add->ms_caution_source);
            w.text("detector", detector_type_name(c.detector->type));
            w.text("additive", s.reagent);
            out.push_back(w);
        }
        if (!p->volatility_unknown.empty()) {
            Finding w = make(FindingKind::ms_volatility_unknown, Sev::caution, Subject::of_line(l));
            for (const auto& id : p->volatility_unknown)
                w.items.emplace_back(id, std::nan(""));
            w.text("detector", detector_type_name(c.detector->type));
            w.text("unknown", join(p->volatility_unknown));
            out.push_back(w);
        }
    }
    return out;
}

} // namespace chem
