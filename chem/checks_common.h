#pragma once
// What the sequence checks share (chem/checks*.cpp): wording helpers, the methods and stretches a
// sequence runs. Internal to the checks; not part of the core's contract.
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

inline std::string line_title(const SequenceCheckInput& c, int l) {
    const std::string& n = c.names[l];
    return "Line " + letter(l) + (n.empty() || n == letter(l) ? "" : " (" + n + ")");
}

/// An id as the message shows it: the library's name when the app gave a lookup.
inline std::string named(const SequenceCheckInput& c, const std::string& id) {
    return c.name_of ? c.name_of(id) : id;
}
inline std::vector<std::string> named(const SequenceCheckInput& c,
                                      const std::vector<std::string>& ids) {
    std::vector<std::string> out;
    for (const auto& id : ids)
        out.push_back(named(c, id));
    return out;
}
/// A salt group id ("potassium-phosphate") in words ("potassium phosphate").
inline std::string group_words(std::string g) {
    std::replace(g.begin(), g.end(), '-', ' ');
    return g;
}
/// "in method “assay”, 18 min 53 s into each injection"; "in the standby".
inline std::string where_words(const std::string& where, double t_min) {
    if (where == "standby")
        return "in the standby";
    return "in method \u201c" + where + "\u201d, " + method_time_words(t_min) +
           " into each injection";
}

inline std::string join(const std::vector<std::string>& v) {
    std::string out;
    for (std::size_t i = 0; i < v.size(); ++i)
        out += (i ? ", " : "") + v[i];
    return out;
}

inline CheckWarning make(const char* code, Sev sev, std::string line, std::string message) {
    CheckWarning w;
    w.code = code;
    w.severity = sev;
    w.line = std::move(line);
    w.message = std::move(message);
    return w;
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
};
inline std::vector<NamedStretch> all_stretches(const SequenceInput& in, const SequencePlan& plan) {
    std::vector<NamedStretch> out;
    for (int mi : methods_run(plan))
        for (const auto& s : stretches(in.methods[mi]))
            out.push_back({in.methods[mi].name, s});
    if (plan.standby_min > 0)
        out.push_back(
            {"standby", {0, plan.standby_min, plan.standby_percent, plan.standby_percent}});
    return out;
}

} // namespace chem::checks_internal

namespace chem {
/// Which lines the methods in `run` (indices into plan.methods) and the standby draw from
/// (defined in checks.cpp beside its public overload).
std::array<bool, max_lines> lines_in_use(const SequencePlan& plan, const std::vector<int>& run);
} // namespace chem
