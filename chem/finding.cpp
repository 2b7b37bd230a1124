#include "chem/finding.h"

#include "chem/checks_common.h"
#include "chem/sequence.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace chem {

const char* code_of(FindingKind kind) {
    switch (kind) {
    case FindingKind::uv_cutoff_eluent:
    case FindingKind::uv_cutoff_unknown:
    case FindingKind::uv_cutoff_beyond_table:
        return "uv-cutoff";
    case FindingKind::immiscible_in_line:
    case FindingKind::immiscible_lines:
        return "immiscible";
    case FindingKind::precipitation:
        return "precipitation";
    case FindingKind::ms_nonvolatile:
    case FindingKind::ms_additive:
    case FindingKind::ms_volatility_unknown:
        return "ms-nonvolatile";
    case FindingKind::column_ph_eluent:
    case FindingKind::column_ph_line:
        return "column-ph";
    case FindingKind::buffer_range:
        return "buffer-range";
    case FindingKind::shelf_life:
        return "shelf-life";
    case FindingKind::runs_dry:
    case FindingKind::runs_low:
        return "runs-dry";
    case FindingKind::waste_overflow:
    case FindingKind::waste_nearly_full:
        return "waste-overflow";
    case FindingKind::pressure_limit:
        return "pressure-limit";
    case FindingKind::ionic_strength_high:
        return "ionic-strength-high";
    case FindingKind::activity_model_differs:
        return "activity-model-differs";
    case FindingKind::ph_outside_pka_range:
        return "ph-outside-pka-range";
    case FindingKind::low_buffer_capacity:
        return "low-buffer-capacity";
    case FindingKind::small_amount:
        return "small-amount";
    case FindingKind::titrant_volume_large:
        return "titrant-volume-large";
    case FindingKind::amount_out_of_tolerance:
        return "amount-out-of-tolerance";
    case FindingKind::amount_not_entered:
        return "amount-not-entered";
    case FindingKind::ph_off_target:
        return "ph-off-target";
    case FindingKind::measured_ph_out_of_tolerance:
        return "measured-ph-out-of-tolerance";
    case FindingKind::eluent_ph_extrapolated:
        return "eluent-ph-extrapolated";
    case FindingKind::eluent_temperature:
        return "eluent-temperature";
    case FindingKind::dwell_too_large:
        return "dwell-too-large";
    case FindingKind::outside_allowed_adjustment:
        return "outside-allowed-adjustment";
    case FindingKind::flow_not_scaled:
        return "flow-not-scaled";
    case FindingKind::small_injection:
        return "small-injection";
    case FindingKind::viscosity_estimate:
        return "viscosity-estimate";
    case FindingKind::pressure_uncalibrated:
        return "pressure-uncalibrated";
    case FindingKind::pressure_no_limit:
        return "pressure-no-limit";
    case FindingKind::pressure_unknown:
        return "pressure-unknown";
    case FindingKind::buffer_scaled:
        return "buffer-scaled";
    case FindingKind::device_calibration_due:
    case FindingKind::reading_calibration_due:
        return "device-calibration-due";
    case FindingKind::expired_lot_override:
        return "expired-lot-override";
    case FindingKind::batch_shelf_life:
        return "shelf-life";
    }
    return "?";
}

Subject Subject::of_line(int index) {
    return {Kind::line, std::string(1, line_letter(index)), {}};
}
Subject Subject::of_lines(int a, int b) {
    return {Kind::line_pair, std::string(1, line_letter(a)), std::string(1, line_letter(b))};
}
Subject Subject::of_method(std::string name) {
    return {Kind::method, std::move(name), {}};
}
Subject Subject::of_standby() {
    return {Kind::standby, {}, {}};
}
Subject Subject::of_reagent(std::string id) {
    return {Kind::reagent, std::move(id), {}};
}
Subject Subject::of_system(std::string id) {
    return {Kind::system, std::move(id), {}};
}
Subject Subject::of_device(std::string id) {
    return {Kind::device, std::move(id), {}};
}
Subject Subject::of_batch(std::string recipe) {
    return {Kind::batch, std::move(recipe), {}};
}

std::string Subject::line_letters() const {
    if (kind == Kind::line)
        return id;
    if (kind == Kind::line_pair)
        return id + other;
    return {};
}

const char* subject_kind_name(Subject::Kind kind) {
    switch (kind) {
    case Subject::Kind::none:
        return "none";
    case Subject::Kind::line:
        return "line";
    case Subject::Kind::line_pair:
        return "line-pair";
    case Subject::Kind::method:
        return "method";
    case Subject::Kind::standby:
        return "standby";
    case Subject::Kind::reagent:
        return "reagent";
    case Subject::Kind::system:
        return "system";
    case Subject::Kind::device:
        return "device";
    case Subject::Kind::batch:
        return "batch";
    }
    return "?";
}

namespace {
template <class V>
const V* find_in(const std::vector<std::pair<std::string, V>>& v, const std::string& key) {
    for (const auto& [k, x] : v)
        if (k == key)
            return &x;
    return nullptr;
}
} // namespace

double Finding::number_of(const std::string& key) const {
    if (const double* v = find_in(numbers, key))
        return *v;
    if (const double* v = find_in(detail_numbers, key))
        return *v;
    return std::numeric_limits<double>::quiet_NaN();
}

bool Finding::has_number(const std::string& key) const {
    return find_in(numbers, key) || find_in(detail_numbers, key);
}

const std::string& Finding::text_of(const std::string& key) const {
    static const std::string none;
    if (const std::string* v = find_in(texts, key))
        return *v;
    if (const std::string* v = find_in(detail_texts, key))
        return *v;
    return none;
}

std::vector<double> Finding::numbers_all(const std::string& key) const {
    std::vector<double> out;
    for (const auto* v : {&numbers, &detail_numbers})
        for (const auto& [k, x] : *v)
            if (k == key)
                out.push_back(x);
    return out;
}

std::vector<std::string> Finding::texts_all(const std::string& key) const {
    std::vector<std::string> out;
    for (const auto* v : {&texts, &detail_texts})
        for (const auto& [k, x] : *v)
            if (k == key)
                out.push_back(x);
    return out;
}

std::string default_clock(double minutes) {
    return "t+" + checks_internal::fmt(minutes, 1) + " min";
}

std::string method_time_words(double minutes) {
    const long long total_s = std::llround(std::max(0.0, minutes) * 60.0);
    const long long m = total_s / 60, sec = total_s % 60;
    if (m == 0)
        return std::to_string(sec) + " s";
    if (sec == 0)
        return std::to_string(m) + " min";
    return std::to_string(m) + " min " + std::to_string(sec) + " s";
}

} // namespace chem
