#pragma once
// One step of a preparation as data: what kind of step it is, its sentence, and the reagent and
// amount it measures. The sentence is unnumbered; whoever shows the steps numbers them (the
// command line's `line` output as "1. …", the screens and the sheet as a numbered list).
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace chem {

enum class StepKind {
    rinse_flask,          ///< stocks route: rinse the volumetric flask
    water_in_beaker,      ///< mix and titrate routes: about 80 % of the water in a beaker
    dissolve_solid,       ///< weigh a solid and dissolve it
    add_liquid,           ///< measure a neat liquid reagent into the water
    pipette_solution,     ///< pipette a stock solution into the flask
    make_up,              ///< make up to the mark (stocks route)
    check_ph,             ///< read the pH against the prediction
    calibrate_meter,      ///< bring to temperature and calibrate the meter (titrate route)
    titrate,              ///< add the titrant to the meter target
    transfer_and_make_up, ///< transfer to the volumetric flask and make up
    filter,               ///< membrane filtration
    degas,                ///< degas before use
    label,                ///< label the bottle
    prepare_buffer,       ///< a line: make the aqueous buffer part first
    combine_parts,        ///< a line: measure each part, then combine
    fill_bottle,          ///< a line of one part: fill it into the bottle
    add_additives,        ///< a line: additives into the combined line
    expect_contraction,   ///< a line: the volume lost on mixing
    mix_degas_and_label,  ///< a line: mix, degas and label the bottle
};

struct Step {
    Step() = default;
    /// A step with only its kind and sentence, or with the reagent and amounts it measures.
    Step(StepKind kind_, std::string text_, std::string reagent_ = {},
         std::optional<double> mass_g_ = std::nullopt,
         std::optional<double> volume_ml_ = std::nullopt)
        : kind(kind_), text(std::move(text_)), reagent(std::move(reagent_)), mass_g(mass_g_),
          volume_ml(volume_ml_) {}

    StepKind kind = StepKind::label;
    std::string text;                ///< the sentence, unnumbered
    std::string reagent;             ///< the reagent id the step measures, or empty
    std::optional<double> mass_g;    ///< the amount it weighs, g
    std::optional<double> volume_ml; ///< the amount it measures, mL
};

/// Whether a step of this kind degasses the solution.
inline bool degasses(StepKind k) {
    return k == StepKind::degas || k == StepKind::mix_degas_and_label;
}

/// The sentences, unnumbered, in order.
inline std::vector<std::string> step_texts(const std::vector<Step>& steps) {
    std::vector<std::string> out;
    out.reserve(steps.size());
    for (const Step& s : steps)
        out.push_back(s.text);
    return out;
}

/// The sentences numbered from 1: "1. Prepare …", "2. Measure …".
inline std::vector<std::string> numbered_step_texts(const std::vector<Step>& steps) {
    std::vector<std::string> out;
    out.reserve(steps.size());
    for (std::size_t i = 0; i < steps.size(); ++i)
        out.push_back(std::to_string(i + 1) + ". " + steps[i].text);
    return out;
}

} // namespace chem
