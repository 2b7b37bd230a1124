#pragma once
// Column back-pressure along a gradient, and the plates estimate.
//
// Darcy's law for a packed bed, with the Kozeny–Carman flow resistance:
//   ΔP = Φ · η · L · u_s / d_p²,   u_s = F / (π d_c² / 4)   (superficial velocity),
//   Φ = 180 (1 − ε)² / ε³           (Kozeny–Carman; ε the interparticle porosity)
// Carman, Trans. Inst. Chem. Eng. 15 (1937) 150; Bird, Stewart & Lightfoot, Transport Phenomena
// (2nd ed., 2002) §6.4. At ε = 0.40, Φ = 1012.5. `flow_resistance` overrides Φ (same definition:
// superficial velocity, nominal particle size). A measured reference pressure calibrates Φ.
//
// The composition inside the column lags the mixer by the dwell volume and spreads over the
// column's own liquid volume V_m = ε_T · π d_c²/4 · L: at time t the column holds what left the
// mixer between t − (V_D + V_m)/F and t − V_D/F, and ΔP uses the mean of η (and of the volume
// flow, which the mixing contraction lowers) over that window. Injections repeat, so the
// composition before an injection starts is the end of the previous one (its re-equilibration).
#include "chem/eluent_mix.h"
#include "chem/finding.h"
#include "chem/line.h"
#include "chem/sequence.h"
#include "chem/solvent.h"
#include "chem/viscosity.h"

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace chem {

/// A measured pump pressure on the column at a stated flow and composition (the lab's own
/// column): calibrates the flow resistance.
struct ReferencePressure {
    double pressure_bar = 0; ///< the pump's reading, system included
    double flow_ml_min = 0;
    LineValues percent{};                ///< composition, per line (sum 100), run isocratically
    std::optional<double> temperature_c; ///< default: the column's
};

struct Column {
    std::string field = "column"; ///< JSON path for errors
    double length_mm = 0;
    double id_mm = 0;
    double particle_um = 0;
    double porosity = 0.40; ///< interparticle ε, fully porous particles (common practice)
    /// Total porosity ε_T for the column's liquid volume; 0.65 matches the rule of thumb
    /// V_m ≈ 0.5 · L · d_c² (mL, cm) (common practice, no source).
    double total_porosity = 0.65;
    std::optional<double> flow_resistance; ///< Φ, dimensionless (see the header comment)
    double temperature_c = 25;
    std::optional<double> max_pressure_bar;
    std::optional<ReferencePressure> reference;
};

struct Instrument {
    std::string field = "instrument";
    std::optional<double> max_pressure_bar;
    /// The instrument's own pressure (tubing, injector, detector) without a column, measured
    /// with water at 25 °C at system_flow_ml_min; scaled with flow and viscosity (laminar flow).
    std::optional<double> system_pressure_bar;
    double system_flow_ml_min = 1.0;
    double dwell_ml = 0; ///< mixer to column inlet
};

/// Checks the fields (names "column.length_mm", …): dimensions > 0 (length ≤ 1000 mm, i.d.
/// ≤ 50 mm), particle 0.5–50 µm, porosity 0.2–0.9, total porosity above it and ≤ 0.95, flow
/// resistance 10–1e5, temperature 0–90 °C, limits 1–3000 bar, reference pressure > 0 at a flow
/// > 0. Throws chem::Error.
void validate_column(const Column& c);
void validate_instrument(const Instrument& i);

/// The column's liquid volume V_m = ε_T · π d_c²/4 · L in mL.
double column_volume_ml(const Column& c);
/// Kozeny–Carman Φ = 180 (1 − ε)² / ε³ (Carman 1937).
double kozeny_carman_resistance(double porosity);
/// Plates N ≈ 3000 · L(cm) / d_p(µm): a rule of thumb for a well-packed column of fully porous
/// particles (common practice, no source).
double plates_estimate(const Column& c);

enum class LimitSource { column, instrument };
const char* limit_source_name(LimitSource s);
struct PressureLimit {
    double bar = 0;
    LimitSource source = LimitSource::column;
};
/// The lower of the column's and the instrument's limits; none if neither is given.
std::optional<PressureLimit> pressure_limit(const Column& c, const Instrument& i);

struct PressurePoint {
    double t_min = 0;              ///< from the injection
    double organic_fraction_v = 0; ///< mean over the column, as measured before mixing
    double viscosity_mpa_s = 0;    ///< mean over the column
    double pressure_bar = 0;       ///< at the pump: column plus system
    double column_pressure_bar = 0;
};

struct PressureTrace {
    std::vector<PressurePoint> points; ///< every step_min from 0 to the injection's end
    double max_pressure_bar = 0;
    double max_at_t_min = 0;
    double max_column_pressure_bar = 0;
    double organic_fraction_v_at_max = 0; ///< mean over the column at the peak
    LineValues inlet_percent_at_max{};    ///< the pump's composition now entering the column
    double flow_resistance = 0;           ///< Φ used
    bool calibrated = false;              ///< Φ from the reference pressure
    double column_volume_ml = 0;
    double dwell_min = 0;  ///< V_D / F
    double column_min = 0; ///< V_m / F
    double plates_estimate = 0;
    std::optional<PressureLimit> limit;
    ViscosityBasis viscosity_basis = ViscosityBasis::published_correlation; ///< the weakest used
    std::vector<std::string> viscosity_basis_organics; ///< the organics with that basis
};

/// The pressure trace of one injection of `m` on the column, every step_min (at most 4000 points:
/// a longer injection gets a coarser step). `profiles` per line A–D (null: not described; such a
/// line may not run above 0 %). Validates the column, the instrument and the method (throws
/// chem::Error naming the field; "lines.B.parts" for a line without a make-up that the method
/// uses; "<column>.reference.pressure_bar" for a reference at or below the system's own pressure).
PressureTrace pressure_trace(const SolventLibrary& solvents,
                             const std::array<const LineProfile*, max_lines>& profiles,
                             const Method& m, const Column& column, const Instrument& instrument,
                             double step_min = 0.1);

/// The notes that go with a trace of `method` ("" for a one-method document), as findings
/// (chem/finding.h, worded by chem::describe), in this order: "viscosity-estimate" (info, when
/// the weakest viscosity basis is a one-point estimate or ideal mixing; text viscosity_basis,
/// items: the organics), "pressure-uncalibrated" (info, Φ not calibrated on a reference
/// pressure; detail flow_resistance), "pressure-no-limit" (info, no limit to check against).
/// The limit itself is chem::pressure_limit_warning (chem/checks.h).
std::vector<Finding> pressure_notes(const PressureTrace& trace, const std::string& method);

/// "pressure-unknown" (info): no trace for `method` (text "method"), whose lines
/// (indices 0–3, the items as letters) have no parts, so the viscosity is unknown.
Finding pressure_unknown(const std::string& method, const std::vector<int>& lines);

} // namespace chem
