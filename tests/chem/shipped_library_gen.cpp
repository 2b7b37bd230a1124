// Build-time generator for the chemistry tests (not a test): loads data/ with the app's own loader
// (app/core, the same validation the programs apply) and writes a C++ source that rebuilds the
// reagent and solvent libraries with plain chem/ calls. The tests in tests/chem/ link the generated
// source and phaseplan_chem only, so no Qt is on their way at run time.
//
// Usage: shipped_library_gen DATA_DIR OUT.cpp
#include "chem/error.h"
#include "chem/solvent.h"
#include "core/app_data.h"

#include <cstdio>
#include <fstream>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

namespace {

std::string str(const std::string& s) {
    // A raw literal whose delimiter cannot occur in the data's free text.
    return "std::string(R\"phaseplan(" + s + ")phaseplan\")";
}

std::string num(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return buf;
}

std::string nums(const std::vector<double>& v) {
    std::string out = "std::vector<double>{";
    for (size_t i = 0; i < v.size(); ++i)
        out += (i ? ", " : "") + num(v[i]);
    return out + "}";
}

std::string strs(const std::vector<std::string>& v) {
    std::string out = "std::vector<std::string>{";
    for (size_t i = 0; i < v.size(); ++i)
        out += (i ? ", " : "") + str(v[i]);
    return out + "}";
}

void write_system(std::ostream& o, const chem::AcidBaseSystem& s) {
    o << "    {\n        chem::AcidBaseSystem s;\n";
    o << "        s.id = " << str(s.id) << ";\n        s.name = " << str(s.name) << ";\n";
    o << "        s.species = " << strs(s.species) << ";\n";
    o << "        s.charge_fully_protonated = " << s.charge_fully_protonated << ";\n";
    o << "        s.pka_25c = " << nums(s.pka_25c) << ";\n";
    o << "        s.enthalpy_kj_per_mol = {";
    for (size_t i = 0; i < s.enthalpy_kj_per_mol.size(); ++i)
        o << (i ? ", " : "")
          << (s.enthalpy_kj_per_mol[i]
                  ? "std::optional<double>(" + num(*s.enthalpy_kj_per_mol[i]) + ")"
                  : std::string("std::nullopt"));
    o << "};\n";
    o << "        s.heat_capacity_j_per_mol_k = " << nums(s.heat_capacity_j_per_mol_k) << ";\n";
    o << "        s.dpka_per_k = " << nums(s.dpka_per_k) << ";\n";
    o << "        s.sources = " << strs(s.sources) << ";\n";
    for (const chem::OrganicShift& sh : s.eluent_shift) {
        o << "        s.eluent_shift.push_back({" << str(sh.organic) << ", " << nums(sh.fraction_v)
          << ", {";
        for (size_t i = 0; i < sh.dpka.size(); ++i)
            o << (i ? ", " : "") << nums(sh.dpka[i]);
        o << "}, " << str(sh.source) << "});\n";
    }
    o << "        lib.add_system(std::move(s));\n    }\n";
}

void write_reagent(std::ostream& o, const chem::Reagent& r) {
    o << "    {\n        chem::Reagent r;\n";
    o << "        r.id = " << str(r.id) << ";\n        r.name = " << str(r.name) << ";\n";
    o << "        r.formula = " << str(r.formula) << ";\n";
    o << "        r.molar_mass_g_per_mol = " << num(r.molar_mass_g_per_mol) << ";\n";
    o << "        r.form = chem::PhysicalForm::"
      << (r.form == chem::PhysicalForm::solid ? "solid" : "liquid") << ";\n";
    o << "        r.assay_fraction = " << num(r.assay_fraction) << ";\n";
    o << "        r.density_g_per_ml = " << num(r.density_g_per_ml) << ";\n";
    o << "        r.ghs_hazards = " << strs(r.ghs_hazards) << ";\n";
    o << "        r.ghs_pictograms = " << strs(r.ghs_pictograms) << ";\n";
    for (const chem::SpectatorIon& i : r.spectators)
        o << "        r.spectators.push_back({" << str(i.ion) << ", " << i.charge << ", "
          << num(i.count) << "});\n";
    for (const chem::SystemShare& s : r.systems)
        o << "        r.systems.push_back({" << str(s.system) << ", " << num(s.count) << ", "
          << num(s.protons_removed) << "});\n";
    o << "        r.sources = " << strs(r.sources) << ";\n";
    o << "        r.user_defined = " << (r.user_defined ? "true" : "false") << ";\n";
    o << "        lib.add_reagent(std::move(r));\n    }\n";
}

void write_eluent_solvent(std::ostream& o, const chem::EluentSolvent& e) {
    o << "    {\n        chem::EluentSolvent e;\n";
    o << "        e.organic = " << str(e.organic) << ";\n";
    o << "        e.permittivity_25c = " << num(e.permittivity_25c) << ";\n";
    o << "        e.permittivity_source = " << str(e.permittivity_source) << ";\n";
    o << "        e.fraction_v = " << nums(e.fraction_v) << ";\n";
    o << "        e.dpkw = " << nums(e.dpkw) << ";\n";
    o << "        e.dpkw_source = " << str(e.dpkw_source) << ";\n";
    o << "        e.delta_numerator = " << nums(e.delta_numerator) << ";\n";
    o << "        e.delta_denominator = " << nums(e.delta_denominator) << ";\n";
    o << "        e.delta_max_fraction_v = " << num(e.delta_max_fraction_v) << ";\n";
    o << "        e.delta_source = " << str(e.delta_source) << ";\n";
    o << "        lib.add_eluent_solvent(std::move(e));\n    }\n";
}

std::string opt_num(const std::optional<double>& v) {
    return v ? "std::optional<double>(" + num(*v) + ")" : std::string("std::nullopt");
}

// The enum names below are the enumerators' own (chem::amount_unit_name, miscibility_name).

void write_solvent(std::ostream& o, const chem::Solvent& v) {
    o << "    {\n        chem::Solvent v;\n";
    o << "        v.id = " << str(v.id) << ";\n        v.name = " << str(v.name) << ";\n";
    o << "        v.formula = " << str(v.formula) << ";\n";
    o << "        v.aqueous = " << (v.aqueous ? "true" : "false") << ";\n";
    o << "        v.molar_mass_g_per_mol = " << num(v.molar_mass_g_per_mol) << ";\n";
    o << "        v.density_g_per_ml = " << num(v.density_g_per_ml) << ";\n";
    o << "        v.density_temperature_c = " << num(v.density_temperature_c) << ";\n";
    o << "        v.expansion_per_k = " << num(v.expansion_per_k) << ";\n";
    o << "        v.density_from_water_model = " << (v.density_from_water_model ? "true" : "false")
      << ";\n";
    o << "        v.viscosity_mpa_s = " << num(v.viscosity_mpa_s) << ";\n";
    o << "        v.viscosity_temperature_c = " << num(v.viscosity_temperature_c) << ";\n";
    o << "        v.uv_cutoff_nm = " << num(v.uv_cutoff_nm) << ";\n";
    for (const chem::UvAbsorbancePoint& p : v.uv_absorbance)
        o << "        v.uv_absorbance.push_back({" << num(p.wavelength_nm) << ", "
          << num(p.absorbance) << "});\n";
    o << "        v.boiling_point_c = " << num(v.boiling_point_c) << ";\n";
    o << "        v.flash_point_c = " << opt_num(v.flash_point_c) << ";\n";
    o << "        v.ghs_hazards = " << strs(v.ghs_hazards) << ";\n";
    o << "        v.ghs_pictograms = " << strs(v.ghs_pictograms) << ";\n";
    for (const auto& [key, source] : v.sources)
        o << "        v.sources[" << str(key) << "] = " << str(source) << ";\n";
    o << "        v.note = " << str(v.note) << ";\n";
    o << "        lib.add_solvent(std::move(v));\n    }\n";
}

void write_additive(std::ostream& o, const chem::Additive& a) {
    o << "    {\n        chem::Additive a;\n";
    o << "        a.id = " << str(a.id) << ";\n";
    o << "        a.ms_volatile = " << (a.ms_volatile ? "true" : "false") << ";\n";
    o << "        a.volatility_source = " << str(a.volatility_source) << ";\n";
    if (a.uv) {
        o << "        a.uv = chem::UvTable{};\n";
        o << "        a.uv->unit = chem::AmountUnit::" << chem::amount_unit_name(a.uv->unit)
          << ";\n";
        for (const chem::UvPoint& p : a.uv->points)
            o << "        a.uv->points.push_back({" << num(p.amount) << ", " << num(p.cutoff_nm)
              << ", " << str(p.source) << "});\n";
    }
    o << "        a.solubility_group = " << str(a.solubility_group) << ";\n";
    o << "        a.short_lived = " << (a.short_lived ? "true" : "false") << ";\n";
    o << "        a.ms_caution = " << str(a.ms_caution) << ";\n";
    o << "        a.ms_caution_source = " << str(a.ms_caution_source) << ";\n";
    o << "        a.note = " << str(a.note) << ";\n";
    o << "        lib.add_additive(std::move(a));\n    }\n";
}

/// The solvent library (data/solvents.json), in the order the loader filled it.
void write_solvent_library(std::ostream& o, const chem::SolventLibrary& lib) {
    o << "chem::SolventLibrary build_solvents() {\n    chem::SolventLibrary lib;\n";
    for (const chem::Solvent& v : lib.solvents())
        write_solvent(o, v);
    const auto& all = lib.solvents();
    for (size_t i = 0; i < all.size(); ++i)
        for (size_t j = i + 1; j < all.size(); ++j)
            if (const auto m = lib.miscibility(all[i].id, all[j].id))
                o << "    lib.set_miscibility(" << str(all[i].id) << ", " << str(all[j].id)
                  << ", chem::Miscibility::" << chem::miscibility_name(*m) << ");\n";
    o << "    lib.set_miscibility_source(" << str(lib.miscibility_source()) << ");\n";
    for (const chem::Additive& a : lib.additives())
        write_additive(o, a);
    for (const chem::SolubilityTable& t : lib.solubility_tables()) {
        o << "    {\n        chem::SolubilityTable t{" << str(t.group) << ", " << str(t.organic)
          << ", " << str(t.basis) << ", " << str(t.source) << ", {}, {}, {}, 0};\n";
        for (const auto& [phi, limit] : t.points)
            o << "        t.points.emplace_back(" << num(phi) << ", " << num(limit) << ");\n";
        if (!t.form.empty())
            o << "        t.form = " << str(t.form) << ";\n        t.system = " << str(t.system)
              << ";\n        t.protons_removed = " << t.protons_removed << ";\n";
        o << "        lib.add_solubility(std::move(t));\n    }\n";
    }
    for (const chem::ShelfLife& s : lib.shelf_lives())
        o << "    lib.add_shelf_life({*chem::shelf_kind_from_name("
          << str(chem::shelf_kind_name(s.kind)) << "), " << num(s.hours) << ", " << str(s.source)
          << ", " << str(s.description) << "});\n";
    for (const chem::ExcessVolume& e : lib.excess_volumes())
        o << "    lib.add_excess_volume({" << str(e.aqueous) << ", " << str(e.organic) << ", "
          << num(e.temperature_c) << ", " << nums(e.rk_cm3_per_mol) << ", " << str(e.source)
          << "});\n";
    o << "    lib.check_complete();\n    return lib;\n}\n";
}

} // namespace

int main(int argc, char** argv) {
    if (argc != 3) {
        std::fprintf(stderr, "usage: shipped_library_gen DATA_DIR OUT.cpp\n");
        return 2;
    }
    try {
        const phaseplan::AppData data = phaseplan::load_app_data(QString::fromLocal8Bit(argv[1]));
        const chem::Library& lib = data.reagents;
        std::ostringstream o;
        o << "// Generated by tests/chem/shipped_library_gen from data/: do not "
             "edit.\n"
             "#include \"shipped_library.h\"\n\n#include <optional>\n#include <string>\n"
             "#include <utility>\n#include <vector>\n\nnamespace chem::testing {\n\n"
             "namespace {\nchem::Library build() {\n    chem::Library lib;\n";
        for (const chem::AcidBaseSystem& s : lib.systems())
            write_system(o, s);
        for (const chem::Reagent& r : lib.reagents())
            write_reagent(o, r);
        for (const chem::SitEpsilon& e : lib.sit_epsilons())
            o << "    lib.add_sit_epsilon({" << str(e.cation) << ", " << str(e.anion) << ", "
              << num(e.kg_per_mol) << ", " << str(e.source) << "});\n";
        for (const chem::IonSize& e : lib.ion_sizes())
            o << "    lib.add_ion_size({" << str(e.species) << ", " << num(e.size_angstrom) << ", "
              << num(e.b_kg_per_mol) << ", " << str(e.source) << "});\n";
        for (const chem::Complex& e : lib.complexes()) {
            o << "    lib.add_complex({" << str(e.species) << ", {";
            for (const auto& [member, count] : e.formed_from)
                o << "{" << str(member) << ", " << count << "}, ";
            o << "}, " << num(e.log10_k) << ", {";
            for (chem::ActivityModel m : e.models)
                o << (m == chem::ActivityModel::sit ? "chem::ActivityModel::sit, "
                                                    : "chem::ActivityModel::truesdell_jones, ");
            o << "}, " << str(e.source) << "});\n";
        }
        for (const chem::EluentSolvent& e : lib.eluent_solvents())
            write_eluent_solvent(o, e);
        o << "    return lib;\n}\n\n";
        write_solvent_library(o, data.solvents);
        o << "} // namespace\n\n"
             "const chem::Library& shipped_library() {\n"
             "    static const chem::Library lib = build();\n    return lib;\n}\n\n"
             "const chem::SolventLibrary& shipped_solvents() {\n"
             "    static const chem::SolventLibrary lib = build_solvents();\n    return lib;\n}\n\n"
             "} // namespace chem::testing\n";
        std::ofstream f(argv[2], std::ios::binary);
        f << o.str();
        if (!f) {
            std::fprintf(stderr, "shipped_library_gen: cannot write %s\n", argv[2]);
            return 1;
        }
    } catch (const chem::Error& e) {
        std::fprintf(stderr, "shipped_library_gen: %s: %s\n", e.field().c_str(),
                     e.message().c_str());
        return 1;
    }
    return 0;
}
