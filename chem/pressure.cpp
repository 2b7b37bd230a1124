#include "chem/pressure.h"

#include "chem/error.h"
#include "chem/units.h"

#include <algorithm>
#include <array>
#include <cmath>

namespace chem {

namespace {

constexpr double pi = 3.14159265358979323846;
constexpr double max_pressure_limit_bar = 3000; // above any analytical pump
constexpr int max_trace_points = 4000;

std::string sub(const std::string& parent, const char* key) {
    return parent + "." + key;
}

/// Cross-section of the empty tube in m².
double area_m2(const Column& c) {
    const double d = c.id_mm * 1e-3;
    return pi * d * d / 4.0;
}

/// ΔP in bar per (mPa·s of viscosity × mL/min of flow) for resistance Φ: Φ L /(A d_p²) in SI.
double bar_per_mpa_s_ml_min(const Column& c, double resistance) {
    const double dp = c.particle_um * 1e-6;
    const double flow_si = 1e-6 / 60.0; // 1 mL/min in m³/s
    return resistance * 1e-3 * (c.length_mm * 1e-3) * flow_si / (area_m2(c) * dp * dp) / 1e5;
}

/// The instrument's own pressure in bar per mPa·s of eluent at `flow_ml_min` (laminar flow:
/// ∝ F·η), from its reading with water at 25 °C.
double system_bar_per_mpa_s(const Instrument& in, double flow_ml_min) {
    if (!in.system_pressure_bar)
        return 0;
    return *in.system_pressure_bar * (flow_ml_min / in.system_flow_ml_min) /
           water_viscosity_mpa_s(to_kelvin(25.0));
}

/// The mixer's output sampled at n+1 equally spaced nodes over one injection (period T), with
/// the cumulative integral of each quantity and the periodic extension I(τ + kT) = k I(T) + I(τ).
/// Quantities: η, η·(1 − contraction) (the volume flow's share) and the organic fraction.
struct MixerSamples {
    static constexpr int channels = 3;
    double h = 0, period = 0, inv_h = 0, inv_period = 0;
    int n = 0;
    std::array<std::vector<double>, channels> value, prefix;

    void init(int steps, double step) {
        n = steps;
        h = step;
        period = step * steps;
        inv_h = 1.0 / h;
        inv_period = 1.0 / period;
        for (auto& v : value)
            v.assign(n + 1, 0.0);
    }
    void integrate() {
        for (int c = 0; c < channels; ++c) {
            prefix[c].assign(n + 1, 0.0);
            for (int j = 1; j <= n; ++j)
                prefix[c][j] = prefix[c][j - 1] + 0.5 * h * (value[c][j - 1] + value[c][j]);
        }
    }
    /// Where τ falls: whole periods before it, the node below it and the distance past that node.
    struct Place {
        double periods;
        int j;
        double dr;
    };
    Place place(double tau) const {
        const double k = std::floor(tau * inv_period);
        const double r = tau - k * period;
        const int j = std::clamp(static_cast<int>(r * inv_h), 0, n - 1);
        return {k, j, r - j * h};
    }
    double value_at(int c, const Place& p) const {
        const auto& v = value[c];
        return v[p.j] + p.dr * inv_h * (v[p.j + 1] - v[p.j]);
    }
    double integral_to(int c, const Place& p) const {
        return p.periods * prefix[c][n] + prefix[c][p.j] +
               0.5 * p.dr * (value[c][p.j] + value_at(c, p));
    }
    /// Mean of channel c over [a, b] (the value at b for an empty window).
    double mean(int c, const Place& a, const Place& b, double width) const {
        return width > 1e-12 ? (integral_to(c, b) - integral_to(c, a)) / width : value_at(c, b);
    }
};

} // namespace

double kozeny_carman_resistance(double porosity) {
    return 180.0 * (1 - porosity) * (1 - porosity) / (porosity * porosity * porosity);
}

double column_volume_ml(const Column& c) {
    // mm² × mm = µL; / 1000 for mL.
    return c.total_porosity * pi * c.id_mm * c.id_mm / 4.0 * c.length_mm / 1000.0;
}

double plates_estimate(const Column& c) {
    return 3000.0 * (c.length_mm / 10.0) / c.particle_um;
}

const char* limit_source_name(LimitSource s) {
    return s == LimitSource::column ? "column" : "instrument";
}

std::optional<PressureLimit> pressure_limit(const Column& c, const Instrument& i) {
    std::optional<PressureLimit> out;
    if (c.max_pressure_bar)
        out = PressureLimit{*c.max_pressure_bar, LimitSource::column};
    if (i.max_pressure_bar && (!out || *i.max_pressure_bar < out->bar))
        out = PressureLimit{*i.max_pressure_bar, LimitSource::instrument};
    return out;
}

void validate_column(const Column& c) {
    const std::string& f = c.field;
    require_positive(c.length_mm, 1000, sub(f, "length_mm"), "mm");
    require_positive(c.id_mm, 50, sub(f, "id_mm"), "mm");
    require_finite(c.particle_um, sub(f, "particle_um"));
    if (c.particle_um < 0.5 || c.particle_um > 50)
        throw Error(sub(f, "particle_um"),
                    format_number(c.particle_um) + " µm is outside 0.5 to 50 µm");
    require_range(c.porosity, 0.2, 0.9, sub(f, "porosity"), "(interparticle porosity)");
    require_finite(c.total_porosity, sub(f, "total_porosity"));
    if (c.total_porosity <= c.porosity || c.total_porosity > 0.95)
        throw Error(sub(f, "total_porosity"), format_number(c.total_porosity) +
                                                  " is not above the porosity " +
                                                  format_number(c.porosity) + " and at most 0.95");
    if (c.flow_resistance)
        require_range(*c.flow_resistance, 10, 1e5, sub(f, "flow_resistance"),
                      "(dimensionless, superficial velocity)");
    require_range(c.temperature_c, min_viscosity_temperature_c, max_viscosity_temperature_c,
                  sub(f, "temperature_c"), "°C");
    if (c.max_pressure_bar)
        require_range(*c.max_pressure_bar, 1, max_pressure_limit_bar, sub(f, "max_pressure_bar"),
                      "bar");
    if (c.reference) {
        const std::string r = sub(f, "reference");
        require_range(c.reference->pressure_bar, 1e-3, max_pressure_limit_bar,
                      sub(r, "pressure_bar"), "bar");
        require_positive(c.reference->flow_ml_min, 100, sub(r, "flow_ml_min"), "mL/min");
        if (c.reference->temperature_c)
            require_range(*c.reference->temperature_c, min_viscosity_temperature_c,
                          max_viscosity_temperature_c, sub(r, "temperature_c"), "°C");
        validate_composition(c.reference->percent, {true, true, true, true}, r,
                             "the reference composition");
    }
}

void validate_instrument(const Instrument& i) {
    const std::string& f = i.field;
    if (i.max_pressure_bar)
        require_range(*i.max_pressure_bar, 1, max_pressure_limit_bar, sub(f, "max_pressure_bar"),
                      "bar");
    if (i.system_pressure_bar) {
        require_range(*i.system_pressure_bar, 0, max_pressure_limit_bar,
                      sub(f, "system_pressure_bar"), "bar");
        require_positive(i.system_flow_ml_min, 100, sub(f, "system_flow_ml_min"), "mL/min");
    }
    require_range(i.dwell_ml, 0, 100, sub(f, "dwell_ml"), "mL");
}

PressureTrace pressure_trace(const SolventLibrary& solvents,
                             const std::array<const LineProfile*, max_lines>& profiles,
                             const Method& m, const Column& column, const Instrument& instrument,
                             double step_min) {
    validate_column(column);
    validate_instrument(instrument);
    validate_method(m, {true, true, true, true});
    require_positive(step_min, 1e4, "step_min", "min");
    // Every line the method runs must have a make-up: it sets the viscosity.
    auto check_described = [&](const LineValues& p, const std::string& where) {
        for (int l = 0; l < max_lines; ++l)
            if (p[l] > 0 && (!profiles[l] || !profiles[l]->described))
                throw Error(std::string("lines.") + line_letter(l) + ".parts",
                            "is needed for the pressure: " + where + " runs line " +
                                line_letter(l) + " at " + format_number(p[l]) +
                                " % and its make-up sets the viscosity");
    };
    for (const GradientRow& r : m.gradient)
        check_described(r.percent, "methods." + m.name);
    if (column.reference)
        check_described(column.reference->percent, column.field + ".reference");

    PressureTrace out;
    const BlendBasis basis =
        blend_basis(solvents, {profiles[0], profiles[1], profiles[2], profiles[3]});
    const EluentViscosity visc(basis, to_kelvin(column.temperature_c));
    out.viscosity_basis = visc.weakest_basis();
    out.viscosity_basis_organics = visc.weakest_organics();
    SolventBlend b;

    // Flow resistance: Kozeny–Carman, a stated value, or calibrated on the reference.
    out.flow_resistance =
        column.flow_resistance.value_or(kozeny_carman_resistance(column.porosity));
    if (column.reference) {
        const ReferencePressure& ref = *column.reference;
        const double t_ref = ref.temperature_c.value_or(column.temperature_c);
        blend(basis, ref.percent.data(), b);
        const double eta = t_ref == column.temperature_c
                               ? visc.at(b)
                               : EluentViscosity(basis, to_kelvin(t_ref)).at(b);
        const double sys = system_bar_per_mpa_s(instrument, ref.flow_ml_min) * eta;
        const double col = ref.pressure_bar - sys;
        if (col <= 0)
            throw Error(column.field + ".reference.pressure_bar",
                        format_number(ref.pressure_bar) +
                            " bar is not above the instrument's own " + format_number(sys) +
                            " bar at " + format_number(ref.flow_ml_min) + " mL/min");
        const double per_unit = bar_per_mpa_s_ml_min(column, 1.0);
        out.flow_resistance =
            col / (per_unit * eta * (1 - b.contraction_fraction) * ref.flow_ml_min);
        out.calibrated = true;
    }
    const double k_bar = bar_per_mpa_s_ml_min(column, out.flow_resistance) * m.flow_ml_min;
    const double k_system = system_bar_per_mpa_s(instrument, m.flow_ml_min);

    out.column_volume_ml = column_volume_ml(column);
    out.dwell_min = instrument.dwell_ml / m.flow_ml_min;
    out.column_min = out.column_volume_ml / m.flow_ml_min;
    out.plates_estimate = plates_estimate(column);
    out.limit = pressure_limit(column, instrument);

    // The mixer's output over one injection, on a grid of n steps.
    const double period = m.injection_min();
    const double step = std::max(step_min, period / max_trace_points);
    const int n = std::max(1, static_cast<int>(std::ceil(period / step - 1e-9)));
    const double h = period / n;
    enum { eta_c, flow_c, organic_c };
    MixerSamples mixer;
    mixer.init(n, h);
    const std::vector<Stretch> parts = stretches(m);
    std::size_t si = 0;
    LineValues p{};
    for (int j = 0; j <= n; ++j) {
        const double tau = j * h;
        while (si + 1 < parts.size() && tau > parts[si].start_min + parts[si].duration_min)
            ++si;
        const Stretch& s = parts[si];
        const double f = std::clamp((tau - s.start_min) / s.duration_min, 0.0, 1.0);
        for (int l = 0; l < max_lines; ++l)
            p[l] = s.percent_start[l] + f * (s.percent_end[l] - s.percent_start[l]);
        blend(basis, p.data(), b);
        const double eta = visc.at(b);
        mixer.value[eta_c][j] = eta;
        mixer.value[flow_c][j] = eta * (1 - b.contraction_fraction);
        mixer.value[organic_c][j] = b.organic_fraction_v;
    }
    mixer.integrate();

    // The column at time t holds the mixer's output from t − t_D − t_col to t − t_D.
    out.points.reserve(n + 1);
    for (int k = 0; k <= n; ++k) {
        const double t = k * h;
        const auto inlet = mixer.place(t - out.dwell_min);
        const auto outlet = mixer.place(t - out.dwell_min - out.column_min);
        PressurePoint pt;
        pt.t_min = t;
        pt.viscosity_mpa_s = mixer.mean(eta_c, outlet, inlet, out.column_min);
        pt.organic_fraction_v = mixer.mean(organic_c, outlet, inlet, out.column_min);
        pt.column_pressure_bar = k_bar * mixer.mean(flow_c, outlet, inlet, out.column_min);
        pt.pressure_bar = pt.column_pressure_bar + k_system * mixer.value_at(eta_c, inlet);
        // The first of equal peaks (an isocratic run's flat trace peaks at its start).
        if (k == 0 || pt.pressure_bar > out.max_pressure_bar * (1 + 1e-9)) {
            out.max_pressure_bar = pt.pressure_bar;
            out.max_at_t_min = t;
            out.organic_fraction_v_at_max = pt.organic_fraction_v;
        }
        out.max_column_pressure_bar = std::max(out.max_column_pressure_bar, pt.column_pressure_bar);
        out.points.push_back(pt);
    }
    double inlet_at_max = out.max_at_t_min - out.dwell_min;
    inlet_at_max -= std::floor(inlet_at_max / period) * period;
    for (int l = 0; l < max_lines; ++l)
        out.inlet_percent_at_max[l] = m.percent_at(l, inlet_at_max);
    return out;
}

std::vector<Finding> pressure_notes(const PressureTrace& t, const std::string& method) {
    std::vector<Finding> out;
    auto note = [&](FindingKind kind) -> Finding& {
        Finding f;
        f.kind = kind;
        f.severity = Severity::info;
        f.subject = Subject::of_method(method);
        out.push_back(std::move(f));
        return out.back();
    };
    using B = ViscosityBasis;
    if (t.viscosity_basis == B::one_point_estimate || t.viscosity_basis == B::ideal_mixing) {
        Finding& f = note(FindingKind::viscosity_estimate);
        f.text("viscosity_basis", viscosity_basis_name(t.viscosity_basis));
        for (const auto& id : t.viscosity_basis_organics)
            f.items.emplace_back(id, std::nan(""));
    }
    if (!t.calibrated)
        note(FindingKind::pressure_uncalibrated).detail("flow_resistance", t.flow_resistance);
    if (!t.limit)
        note(FindingKind::pressure_no_limit);
    return out;
}

Finding pressure_unknown(const std::string& method, const std::vector<int>& lines) {
    Finding f;
    f.kind = FindingKind::pressure_unknown;
    f.severity = Severity::info;
    f.subject = Subject::of_method(method);
    f.text("method", method);
    for (int l : lines)
        f.items.emplace_back(std::string(1, line_letter(l)), std::nan(""));
    return f;
}

} // namespace chem
