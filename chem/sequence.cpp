#include "chem/sequence.h"
#include "chem/guard.h"

#include "chem/error.h"

#include <algorithm>
#include <cmath>
#include <map>

namespace chem {

namespace {

constexpr double percent_sum_tolerance = 0.01; // each gradient row sums to 100 ± 0.01
constexpr double max_flow_ml_min = 100.0;      // above any analytical pump
constexpr double max_minutes = 1.0e5;          // about 70 days
constexpr double max_volume_ml = 1.0e6;        // 1000 L
constexpr int max_injections = 1000000;        // per row and in the whole sequence
constexpr double max_sequence_minutes = 1.0e6; // about 694 days: keeps clock times in range

std::string letter_key(int i) {
    return std::string(1, line_letter(i));
}

/// Volume of line l delivered over a stretch at flow f: f/100 · (p_s + p_e)/2 · D (trapezoid,
/// exact for a linear percentage).
double stretch_volume(const Stretch& s, int l, double flow) {
    return flow / 100.0 * 0.5 * (s.percent_start[l] + s.percent_end[l]) * s.duration_min;
}

/// Time τ into a stretch at which line l has delivered `volume_ml`, 0 ≤ volume ≤ stretch volume.
/// Delivered(τ) = f/100 · (p_s τ + (p_e − p_s) τ² / (2D)): a quadratic a τ² + b τ − r = 0 with
/// a = (p_e − p_s)/(2D), b = p_s, r = 100 V / f. The root is taken in the form
/// τ = 2r / (b + √(b² + 4 a r)), which stays accurate when a → 0 and when b = 0.
double time_into_stretch(const Stretch& s, int l, double flow, double volume_ml) {
    const double r = 100.0 * volume_ml / flow;
    const double b = s.percent_start[l];
    const double a = (s.percent_end[l] - s.percent_start[l]) / (2.0 * s.duration_min);
    const double disc = std::max(0.0, b * b + 4.0 * a * r);
    const double denom = b + std::sqrt(disc);
    if (denom <= 0)
        return 0;
    return std::clamp(2.0 * r / denom, 0.0, s.duration_min);
}

} // namespace

void validate_composition(const LineValues& p, const std::array<bool, max_lines>& defined,
                          const std::string& at, const char* where) {
    double sum = 0;
    for (int l = 0; l < max_lines; ++l) {
        const std::string f = at + "." + letter_key(l);
        require_range(p[l], 0, 100, f, "%");
        if (p[l] > 0 && !defined[l])
            throw Error(f, "line " + letter_key(l) + " is not defined in lines");
        sum += p[l];
    }
    if (std::fabs(sum - 100.0) > percent_sum_tolerance)
        throw Error(at, std::string("the percentages of ") + where + " add to " +
                            format_number(sum) + ", not 100");
}

char line_letter(int index) {
    return static_cast<char>('A' + index);
}

int line_index(std::string_view key) {
    if (key.size() != 1)
        return -1;
    const int i = key[0] - 'A';
    return i >= 0 && i < max_lines ? i : -1;
}

const char* dry_phase_name(DryPhase p) {
    switch (p) {
    case DryPhase::none:
        return "none";
    case DryPhase::priming:
        return "priming";
    case DryPhase::injection:
        return "injection";
    case DryPhase::standby:
        return "standby";
    }
    return "?";
}

double Method::percent_at(int line, double t) const {
    if (gradient.empty())
        return 0;
    if (t >= run_min)
        return gradient.front().percent[line]; // re-equilibration
    if (t <= gradient.front().t_min)
        return gradient.front().percent[line];
    for (std::size_t i = 1; i < gradient.size(); ++i) {
        const auto& g0 = gradient[i - 1];
        const auto& g1 = gradient[i];
        if (t <= g1.t_min)
            return g0.percent[line] +
                   (g1.percent[line] - g0.percent[line]) * (t - g0.t_min) / (g1.t_min - g0.t_min);
    }
    return gradient.back().percent[line];
}

std::vector<Stretch> stretches(const Method& m) {
    std::vector<Stretch> out;
    if (m.gradient.empty())
        return out;
    auto push = [&](double start, double duration, const LineValues& ps, const LineValues& pe) {
        if (duration > 0)
            out.push_back({start, duration, ps, pe});
    };
    const auto& first = m.gradient.front();
    const auto& last = m.gradient.back();
    push(0, first.t_min, first.percent, first.percent);
    for (std::size_t i = 1; i < m.gradient.size(); ++i)
        push(m.gradient[i - 1].t_min, m.gradient[i].t_min - m.gradient[i - 1].t_min,
             m.gradient[i - 1].percent, m.gradient[i].percent);
    push(last.t_min, m.run_min - last.t_min, last.percent, last.percent);
    push(m.run_min, m.equilibration_min, first.percent, first.percent);
    return out;
}

LineValues volume_per_injection_ml(const Method& m) {
    LineValues v{};
    for (const auto& s : stretches(m))
        for (int l = 0; l < max_lines; ++l)
            v[l] += stretch_volume(s, l, m.flow_ml_min);
    return v;
}

const std::vector<double>& common_bottle_sizes_ml() {
    // Common laboratory bottle and solvent-container sizes (common practice, no source).
    static const std::vector<double> sizes = {100,  250,  500,  1000,  2000,
                                              2500, 4000, 5000, 10000, 20000};
    return sizes;
}

void validate_method(const Method& m, const std::array<bool, max_lines>& defined) {
    const std::string at = "methods." + m.name;
    require_positive(m.flow_ml_min, max_flow_ml_min, at + ".flow_ml_min", "mL/min");
    if (m.gradient.empty())
        throw Error(at + ".gradient", "needs at least one row");
    for (std::size_t i = 0; i < m.gradient.size(); ++i) {
        const std::string row = at + ".gradient[" + std::to_string(i) + "]";
        const double t = m.gradient[i].t_min;
        require_range(t, 0, max_minutes, row + ".t_min", "min");
        if (i > 0 && !(t > m.gradient[i - 1].t_min))
            throw Error(row + ".t_min", format_number(t) + " min is not after the previous row's " +
                                            format_number(m.gradient[i - 1].t_min) +
                                            " min (times must ascend)");
        validate_composition(m.gradient[i].percent, defined, row, "this row");
    }
    require_positive(m.run_min, max_minutes, at + ".run_min", "min");
    if (m.run_min < m.gradient.back().t_min)
        throw Error(at + ".run_min", format_number(m.run_min) +
                                         " min ends before the last gradient row at " +
                                         format_number(m.gradient.back().t_min) + " min");
    require_range(m.equilibration_min, 0, max_minutes, at + ".equilibration_min", "min");
}

int SequencePlan::injection_at(double t) const {
    if (rows.empty() || injections == 0)
        return 0;
    if (t <= 0)
        return 1;
    // rows are in time order: the last row starting at or before t.
    auto it = std::upper_bound(rows.begin(), rows.end(), t,
                               [](double v, const RowPlan& r) { return v < r.start_min; });
    const RowPlan& r = *(it == rows.begin() ? rows.begin() : std::prev(it));
    const double inj = methods[r.method].injection_min;
    int k = inj > 0 ? static_cast<int>(std::floor((t - r.start_min) / inj)) : 0;
    k = std::clamp(k, 0, r.injections - 1);
    return r.first_injection + k;
}

double SequencePlan::waste_at(double t) const {
    double w = prime_ml;
    if (t <= 0)
        return w;
    for (std::size_t i = 0; i < rows.size(); ++i) {
        const RowPlan& r = rows[i];
        if (t <= r.start_min)
            return w;
        const double dt = std::min(t, r.end_min) - r.start_min;
        w += row_flow_ml_min[i] * dt;
    }
    if (t > total_min)
        w += standby_flow_ml_min * std::min(t - total_min, standby_min);
    return w;
}

std::optional<double> SequencePlan::time_waste_reaches(double volume) const {
    double w = prime_ml;
    if (volume <= w)
        return 0.0;
    for (std::size_t i = 0; i < rows.size(); ++i) {
        const RowPlan& r = rows[i];
        const double add = row_flow_ml_min[i] * (r.end_min - r.start_min);
        if (w + add >= volume)
            return r.start_min + (volume - w) / row_flow_ml_min[i];
        w += add;
    }
    const double add = standby_flow_ml_min * standby_min;
    if (add > 0 && w + add >= volume)
        return total_min + (volume - w) / standby_flow_ml_min;
    return std::nullopt;
}

SequencePlan plan_sequence(const SequenceInput& in) {
    // ---- validation, in the order of the document
    std::array<bool, max_lines> defined{};
    bool any_line = false;
    for (int l = 0; l < max_lines; ++l) {
        if (!in.lines[l])
            continue;
        defined[l] = any_line = true;
        const BottleSpec& b = *in.lines[l];
        const std::string at = "lines." + letter_key(l);
        require_positive(b.bottle_ml, max_volume_ml, at + ".bottle_ml", "mL");
        require_range(b.residue_ml, 0, max_volume_ml, at + ".residue_ml", "mL");
        if (b.residue_ml >= b.bottle_ml)
            throw Error(at + ".residue_ml", format_number(b.residue_ml) +
                                                " mL leaves nothing usable of the " +
                                                format_number(b.bottle_ml) + " mL bottle");
        require_range(b.prime_ml, 0, max_volume_ml, "prime_ml." + letter_key(l), "mL");
    }
    if (!any_line)
        throw Error("lines", "no line defined (give at least one of A, B, C, D)");
    if (in.methods.empty())
        throw Error("methods", "no method defined");
    std::map<std::string, int> method_index;
    for (std::size_t i = 0; i < in.methods.size(); ++i) {
        const Method& m = in.methods[i];
        if (m.name.empty())
            throw Error("methods", "a method has an empty name");
        if (!method_index.emplace(m.name, static_cast<int>(i)).second)
            throw Error("methods." + m.name, "is defined twice");
        validate_method(m, defined);
    }
    if (in.rows.empty())
        throw Error("sequence", "needs at least one row");
    std::vector<int> row_method(in.rows.size());
    // Totals over the rows, in wide types: 2500 rows of 10^6 injections would overflow an int
    // and run for millennia, far past any clock time the plan can print.
    long long total_injections = 0;
    double total_minutes = 0;
    for (std::size_t i = 0; i < in.rows.size(); ++i) {
        const std::string at = "sequence[" + std::to_string(i) + "]";
        const auto it = method_index.find(in.rows[i].method);
        if (it == method_index.end()) {
            std::string known;
            for (const auto& [name, idx] : method_index)
                known += (known.empty() ? "" : ", ") + name;
            throw Error(at + ".method",
                        "unknown method " + guard::quote_id(in.rows[i].method) +
                            " (known: " + guard::cut(known, 20 * guard::max_id_chars) + ")");
        }
        row_method[i] = it->second;
        if (in.rows[i].injections < 1 || in.rows[i].injections > max_injections)
            throw Error(at + ".injections", std::to_string(in.rows[i].injections) +
                                                " is outside 1 to " +
                                                std::to_string(max_injections));
        total_injections += in.rows[i].injections;
        total_minutes += in.rows[i].injections * in.methods[it->second].injection_min();
        if (total_injections > max_injections)
            throw Error(at + ".injections",
                        "brings the sequence to " + std::to_string(total_injections) +
                            " injections, above the limit of " + std::to_string(max_injections));
        if (total_minutes > max_sequence_minutes)
            throw Error(at + ".injections", "brings the sequence to " +
                                                format_number(total_minutes) +
                                                " min, above the limit of " +
                                                format_number(max_sequence_minutes) + " min");
    }
    if (in.standby) {
        require_positive(in.standby->flow_ml_min, max_flow_ml_min, "standby.flow_ml_min", "mL/min");
        require_range(in.standby->duration_min, 0, max_minutes, "standby.duration_min", "min");
        if (in.standby->percent)
            validate_composition(*in.standby->percent, defined, "standby", "the standby");
    }
    if (in.waste_capacity_ml)
        require_positive(*in.waste_capacity_ml, max_volume_ml, "waste_ml", "mL");
    require_range(in.safety_margin_fraction, 0, 1, "safety_margin", "(a fraction)");

    // ---- per method: exact volumes per injection and the stretches for dry-time solving
    SequencePlan plan;
    std::vector<std::vector<Stretch>> method_stretches(in.methods.size());
    plan.methods.reserve(in.methods.size());
    for (std::size_t i = 0; i < in.methods.size(); ++i) {
        const Method& m = in.methods[i];
        MethodPlan mp;
        mp.name = m.name;
        mp.injection_min = m.injection_min();
        method_stretches[i] = stretches(m);
        for (const auto& s : method_stretches[i])
            for (int l = 0; l < max_lines; ++l)
                mp.per_injection_ml[l] += stretch_volume(s, l, m.flow_ml_min);
        mp.pumped_per_injection_ml = m.flow_ml_min * mp.injection_min;
        for (const auto& g : m.gradient)
            for (int l = 0; l < max_lines; ++l)
                mp.max_percent[l] = std::max(mp.max_percent[l], g.percent[l]);
        plan.methods.push_back(mp);
    }

    // ---- lines: priming first
    LineValues used{};
    for (int l = 0; l < max_lines; ++l) {
        LinePlan& lp = plan.lines[l];
        if (!defined[l])
            continue;
        const BottleSpec& b = *in.lines[l];
        lp.defined = true;
        lp.prime_ml = b.prime_ml;
        lp.usable_ml = b.bottle_ml - b.residue_ml;
        used[l] = b.prime_ml;
        plan.prime_ml += b.prime_ml;
        if (used[l] > lp.usable_ml) {
            lp.runs_dry = true;
            lp.dry_phase = DryPhase::priming;
            lp.dry_at_min = 0.0;
        }
    }

    // ---- rows in order
    plan.rows.reserve(in.rows.size());
    plan.row_flow_ml_min.reserve(in.rows.size());
    double t = 0;
    int injection = 1;
    for (std::size_t i = 0; i < in.rows.size(); ++i) {
        const int mi = row_method[i];
        const Method& m = in.methods[mi];
        const MethodPlan& mp = plan.methods[mi];
        const int n = in.rows[i].injections;
        RowPlan rp;
        rp.method = mi;
        rp.injections = n;
        rp.first_injection = injection;
        rp.start_min = t;
        rp.end_min = t + n * mp.injection_min;
        for (int l = 0; l < max_lines; ++l) {
            if (!defined[l])
                continue;
            const double v = mp.per_injection_ml[l];
            rp.volume_ml[l] = n * v;
            LinePlan& lp = plan.lines[l];
            const double usable = lp.usable_ml;
            if (!lp.runs_dry && used[l] + n * v > usable * (1 + 1e-12)) {
                // The k-th injection of the row (0-based) is the one that empties the bottle.
                int k = v > 0 ? static_cast<int>(std::floor((usable - used[l]) / v)) : 0;
                k = std::clamp(k, 0, n - 1);
                double remaining = usable - used[l] - k * v;
                double tau = 0;
                for (const auto& s : method_stretches[mi]) {
                    const double sv = stretch_volume(s, l, m.flow_ml_min);
                    if (remaining <= sv) {
                        tau = s.start_min +
                              time_into_stretch(s, l, m.flow_ml_min, std::max(0.0, remaining));
                        break;
                    }
                    remaining -= sv;
                    tau = s.start_min + s.duration_min;
                }
                lp.runs_dry = true;
                lp.dry_phase = DryPhase::injection;
                lp.dry_after_injection = injection + k;
                lp.dry_row = static_cast<int>(i);
                lp.dry_at_min = t + k * mp.injection_min + tau;
            }
            used[l] += n * v;
        }
        plan.row_flow_ml_min.push_back(m.flow_ml_min);
        plan.pumped_ml += n * mp.pumped_per_injection_ml;
        plan.rows.push_back(rp);
        t = rp.end_min;
        injection += n;
    }
    plan.injections = injection - 1;
    plan.total_min = t;

    // ---- standby after the last injection
    if (in.standby && in.standby->duration_min > 0) {
        const Standby& sb = *in.standby;
        const LineValues p =
            sb.percent ? *sb.percent : in.methods[row_method.back()].gradient.front().percent;
        plan.standby_min = sb.duration_min;
        plan.standby_flow_ml_min = sb.flow_ml_min;
        plan.standby_percent = p;
        for (int l = 0; l < max_lines; ++l) {
            if (!defined[l])
                continue;
            const double rate = sb.flow_ml_min * p[l] / 100.0;
            const double v = rate * sb.duration_min;
            LinePlan& lp = plan.lines[l];
            if (!lp.runs_dry && used[l] + v > lp.usable_ml * (1 + 1e-12) && rate > 0) {
                lp.runs_dry = true;
                lp.dry_phase = DryPhase::standby;
                lp.dry_after_injection = plan.injections;
                lp.dry_at_min = t + std::max(0.0, lp.usable_ml - used[l]) / rate;
            }
            used[l] += v;
        }
        plan.pumped_ml += sb.flow_ml_min * sb.duration_min;
    }

    // ---- totals per line
    for (int l = 0; l < max_lines; ++l) {
        LinePlan& lp = plan.lines[l];
        if (!lp.defined)
            continue;
        lp.required_ml = used[l];
        lp.pumped_ml = used[l] - lp.prime_ml;
        lp.spare_ml = lp.usable_ml - lp.required_ml;
        lp.min_bottle_ml =
            lp.required_ml * (1 + in.safety_margin_fraction) + in.lines[l]->residue_ml;
        for (double size : common_bottle_sizes_ml())
            if (size >= lp.min_bottle_ml) {
                lp.suggested_bottle_ml = size;
                break;
            }
    }
    plan.waste_ml = plan.pumped_ml + plan.prime_ml;
    return plan;
}

} // namespace chem
