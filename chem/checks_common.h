#pragma once
// What the sequence checks (chem/checks*.cpp) and their sentences (chem/finding_text.cpp) share:
// number and list helpers, the methods and stretches a sequence runs. Internal to the checks; not
// part of the core's contract.
#include "chem/checks.h"
#include "chem/error.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <map>
#include <set>
#include <string>
#include <vector>

namespace chem::checks_internal {

using Sev = Warning::Severity;

inline std::string fmt(double v, int decimals = 1) {
    const double scale = std::pow(10.0, decimals);
    return format_number(std::round(v * scale) / scale);
}

inline std::string letter(int l) {
    return std::string(1, line_letter(l));
}

/// A salt group id ("potassium-phosphate") in words ("potassium phosphate").
inline std::string group_words(std::string g) {
    std::replace(g.begin(), g.end(), '-', ' ');
    return g;
}
inline std::string join(const std::vector<std::string>& v) {
    std::string out;
    for (std::size_t i = 0; i < v.size(); ++i)
        out += (i ? ", " : "") + v[i];
    return out;
}

inline Finding make(FindingKind kind, Sev sev, Subject subject) {
    Finding f;
    f.kind = kind;
    f.severity = sev;
    f.subject = std::move(subject);
    return f;
}

/// The methods the sequence runs (indices into plan.methods), each once.
inline std::vector<int> methods_run(const SequencePlan& plan) {
    // One pass over the rows with a flag per method, stopping once every method has been seen
    // (a plan has 10,000 rows and a few methods).
    std::vector<int> out;
    std::vector<char> seen(plan.methods.size(), 0);
    for (const auto& r : plan.rows) {
        if (out.size() == seen.size())
            break;
        if (r.method >= 0 && static_cast<std::size_t>(r.method) < seen.size() && !seen[r.method]) {
            seen[r.method] = 1;
            out.push_back(r.method);
        }
    }
    return out;
}

/// Every linear stretch the sequence runs through, with the method's name (standby included).
struct NamedStretch {
    std::string where; ///< method name or "standby"
    Stretch s;
    bool standby = false;
    Subject place() const { return standby ? Subject::of_standby() : Subject::of_method(where); }
};
inline std::vector<NamedStretch> all_stretches(const SequenceInput& in, const SequencePlan& plan) {
    std::vector<NamedStretch> out;
    for (int mi : methods_run(plan))
        for (const auto& s : stretches(in.methods[mi]))
            out.push_back({in.methods[mi].name, s, false});
    if (plan.standby_min > 0)
        out.push_back(
            {"standby", {0, plan.standby_min, plan.standby_percent, plan.standby_percent}, true});
    return out;
}

} // namespace chem::checks_internal

namespace chem {
/// Which lines the methods in `run` (indices into plan.methods) and the standby draw from
/// (defined in checks.cpp beside its public overload).
std::array<bool, max_lines> lines_in_use(const SequencePlan& plan, const std::vector<int>& run);
} // namespace chem
