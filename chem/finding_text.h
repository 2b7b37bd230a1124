#pragma once
// The one place where a finding (chem/finding.h) becomes a sentence. Every wording of every check
// is here, in a switch on FindingKind; the checks fill only data.
#include "chem/equilibrium.h"
#include "chem/finding.h"
#include "chem/sequence.h"

#include <array>
#include <string>

namespace chem {

/// What the sentences need from outside the finding.
struct RenderContext {
    ClockFormatter clock = default_clock; ///< times from the sequence start
    NameLookup name_of;                   ///< reagent, solvent, additive ids; empty: the ids
    /// The lines' display names ("Line A (Phosphate pH 2.5)"); empty or the letter: "Line A".
    std::array<std::string, max_lines> line_names{};
};

/// The sentence of a finding, with its numbers and its subject named.
std::string describe(const Finding& f, const RenderContext& ctx);

/// A chem::Warning that carries `f`, its message worded by describe(f, ctx).
Warning warning_of(Finding f, const RenderContext& ctx = {});

/// A signed percentage with one decimal: "+2.5 %", "-0.4 %".
std::string signed_percent(double fraction);

/// How a line is named in a sentence: "Line A" or "Line A (Phosphate pH 2.5)".
std::string line_title(const std::string& letter, const RenderContext& ctx);

} // namespace chem
