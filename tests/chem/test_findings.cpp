// chem/finding and chem/finding_text: the checks return data (a kind, a typed subject, the
// numbers) and describe() words every finding in one place.
//
// What these tests hold against: the wording contract of the checks (no outside source; the
// chemistry behind each number is tested where it is computed: test_pressure, test_eluent_mix,
// tst_sequence, tst_line). A sentence must name its subject (the line by its letter and name,
// the method by its name) and state the numbers its finding carries, at the precision shown.
#include "chem/checks.h"
#include "chem/error.h"
#include "chem/finding.h"
#include "chem/finding_text.h"
#include "chem/line.h"
#include "chem/pressure.h"
#include "chem/sequence.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>
#include <map>
#include <set>
#include <string>
#include <vector>

using namespace chem;

namespace {

/// A number as the sentences print it: rounded to `decimals`, then format_number.
std::string shown(double v, int decimals) {
    const double scale = std::pow(10.0, decimals);
    return format_number(std::round(v * scale) / scale);
}

bool contains(const std::string& text, const std::string& part) {
    return text.find(part) != std::string::npos;
}

/// A small night: line A water with salts (and what a test adds), line B acetonitrile in a short
/// bottle, line C hexane for the wash; "grad" runs 95 → 5 % A, "wash" runs B with C.
class Findings : public ::testing::Test {
  protected:
    const SolventLibrary& solvents_ = chem::testing::shipped_solvents();
    const Library& reagents_ = chem::testing::shipped_library();
    std::array<LineProfile, max_lines> profiles_{};
    SequenceInput in_;
    SequencePlan plan_;
    RenderContext words_;

    LineProfile line(const std::string& solvent, std::vector<LineAdditive> additives = {}) {
        LineSpec s;
        s.name = solvent;
        LinePart p;
        p.solvent = solvent;
        p.fraction_v = 1;
        s.parts.push_back(p);
        s.additives = std::move(additives);
        return profile_line(solvents_, reagents_, s);
    }

    void SetUp() override {
        profiles_[0] =
            line("water", {{"potassium-dihydrogen-phosphate", AmountUnit::mmol_per_l, 50},
                           {"sodium-chloride", AmountUnit::mmol_per_l, 10}});
        profiles_[1] =
            line("acetonitrile", {{"heptafluorobutyric-acid", AmountUnit::percent_v, 0.1}});
        profiles_[2] = line("hexane");
        const char* names[] = {"Water with salts", "Acetonitrile", "Hexane"};
        for (int l = 0; l < 3; ++l) {
            BottleSpec b;
            b.name = names[l];
            b.bottle_ml = l == 1 ? 60 : 2000; // line B runs dry
            b.residue_ml = 20;
            b.prime_ml = 10;
            in_.lines[l] = b;
            words_.line_names[l] = names[l];
        }
        Method grad;
        grad.name = "grad";
        grad.flow_ml_min = 1;
        grad.gradient = {{0, {95, 5, 0, 0}}, {10, {5, 95, 0, 0}}};
        grad.run_min = 12;
        grad.equilibration_min = 3;
        Method wash;
        wash.name = "wash";
        wash.flow_ml_min = 1;
        wash.gradient = {{0, {0, 50, 50, 0}}};
        wash.run_min = 5;
        in_.methods = {grad, wash};
        in_.rows = {{"grad", 10, ""}, {"wash", 1, ""}};
        in_.waste_capacity_ml = 50; // overfills
        plan_ = plan_sequence(in_);
    }

    SequenceCheckInput input(const Detector& d) const {
        SequenceCheckInput c;
        c.solvents = &solvents_;
        c.input = &in_;
        c.plan = &plan_;
        for (int l = 0; l < 3; ++l)
            c.profiles[l] = &profiles_[l];
        c.prepared_at_min[0] = -50 * 60.0; // made 50 h before the start: past 48 h for water
        c.detector = d;
        c.column = ColumnLimits{8, 12, std::nullopt}; // the eluent's pH is below 8
        c.reagents = &reagents_;
        return c;
    }

    /// The subject as a sentence names it.
    std::string subject_words(const Finding& f) const {
        switch (f.subject.kind) {
        case Subject::Kind::line:
            // A salt in a bottle is placed there: "in the bottle of line A".
            return f.kind == FindingKind::precipitation ? "in the bottle of line " + f.subject.id
                                                        : line_title(f.subject.id, words_);
        case Subject::Kind::line_pair:
            return "Lines " + f.subject.id + " and " + f.subject.other;
        case Subject::Kind::method:
            return f.subject.id;
        case Subject::Kind::standby:
            return "standby";
        case Subject::Kind::reagent:
        case Subject::Kind::system:
        case Subject::Kind::device:
        case Subject::Kind::batch:
            return f.subject.id;
        case Subject::Kind::none:
            return "";
        }
        return "?";
    }
};

Detector ms() {
    Detector d;
    d.type = DetectorType::ms;
    return d;
}

/// The number each kind's sentence must state: key and decimals shown (items: the first item's).
struct Shown {
    const char* key;
    int decimals;
    double scale = 1;
};
const std::map<FindingKind, Shown>& shown_numbers() {
    static const std::map<FindingKind, Shown> m = {
        {FindingKind::uv_cutoff_eluent, {"cutoff_nm", 0}},
        {FindingKind::uv_cutoff_unknown, {"wavelength_nm", 0}},
        {FindingKind::uv_cutoff_beyond_table, {"cutoff_nm", 0}},
        {FindingKind::immiscible_in_line, {"fraction_a_v", 1, 100}},
        {FindingKind::immiscible_lines, {"percent_a", 1}},
        {FindingKind::precipitation, {"mmol_per_l", 2}},
        {FindingKind::ms_nonvolatile, {"", 2}},
        {FindingKind::ms_additive, {"mmol_per_l", 2}},
        {FindingKind::ms_volatility_unknown, {"", 0}},
        {FindingKind::column_ph_eluent, {"ph", 2}},
        {FindingKind::column_ph_line, {"ph", 2}},
        {FindingKind::buffer_range, {"ph_s_s", 2}},
        {FindingKind::shelf_life, {"shelf_life_h", 0}},
        {FindingKind::runs_dry, {"required_ml", 0}},
        {FindingKind::runs_low, {"spare_ml", 0}},
        {FindingKind::waste_overflow, {"waste_ml", 0}},
        {FindingKind::waste_nearly_full, {"waste_ml", 0}},
        {FindingKind::pressure_limit, {"max_pressure_bar", 0}},
        {FindingKind::ionic_strength_high, {"ionic_strength_mol_per_l", 4}},
        {FindingKind::activity_model_differs, {"davies_ph", 3}},
        {FindingKind::ph_outside_pka_range, {"gap", 2}},
        {FindingKind::low_buffer_capacity, {"buffer_capacity_mol_per_l", 2, 1000}},
        {FindingKind::small_amount, {"mass_g", 2, 1000}},
        {FindingKind::titrant_volume_large, {"volume_ml", 1}},
        {FindingKind::amount_out_of_tolerance, {"deviation_fraction", 1, 100}},
        {FindingKind::amount_not_entered, {"target", 1}},
    };
    return m;
}

/// Every finding's sentence is not empty, names its subject and states its number.
void expect_worded(const Finding& f, const std::string& subject, const RenderContext& words) {
    const std::string s = describe(f, words);
    SCOPED_TRACE(std::string(f.code()) + ": " + s);
    EXPECT_FALSE(s.empty());
    EXPECT_TRUE(contains(s, subject)) << "subject " << subject;
    const Shown& n = shown_numbers().at(f.kind);
    if (n.key[0]) {
        EXPECT_TRUE(contains(s, shown(n.scale * f.number_of(n.key), n.decimals))) << n.key;
    } else if (!f.items.empty() && !std::isnan(f.items[0].second)) {
        EXPECT_TRUE(contains(s, shown(f.items[0].second, n.decimals) + " mmol/L"));
    } else if (!f.items.empty()) {
        EXPECT_TRUE(contains(s, f.items[0].first));
    }
}

} // namespace

// The UV finding is about the line that brings most of the absorbance: line B at 95 %, whose
// 0.1 % heptafluorobutyric acid (cutoff 210 nm in data/solvents.json) absorbs more at 195 nm
// than its acetonitrile (190 nm).
TEST_F(Findings, UvCutoffSubjectIsLineB) {
    const auto found = check_uv_cutoff(input({DetectorType::uv, 195.0, 10}));
    ASSERT_FALSE(found.empty());
    const Finding& f = found.front();
    EXPECT_EQ(f.kind, FindingKind::uv_cutoff_eluent);
    EXPECT_EQ(std::string(f.code()), "uv-cutoff");
    EXPECT_EQ(f.subject, Subject::of_line(1));
    EXPECT_EQ(f.subject.kind, Subject::Kind::line);
    EXPECT_EQ(f.subject.id, "B");
    EXPECT_EQ(f.where, Subject::of_method("grad"));
    const std::string s = describe(f, words_);
    EXPECT_TRUE(contains(s, "Line B (Acetonitrile)")) << s;
    EXPECT_TRUE(contains(s, "in method grad")) << s;
    EXPECT_TRUE(contains(s, "195 nm")) << s;
    // The name lookup words the part; the ids stay in the data.
    RenderContext named = words_;
    named.name_of = [](const std::string& id) {
        return id == "heptafluorobutyric-acid" ? "HFBA" : id;
    };
    EXPECT_TRUE(contains(describe(f, named), "mostly from HFBA in Line B")) << describe(f, named);
    EXPECT_EQ(f.text_of("limited_by"), "heptafluorobutyric-acid");
}

// The whole night under a UV and under an MS detector: every finding is typed and worded.
TEST_F(Findings, EverySequenceFindingNamesItsSubjectAndNumbers) {
    std::set<std::string> codes;
    for (const Detector& d : {Detector{DetectorType::uv, 195.0, 10}, ms()}) {
        for (const Finding& f : check_sequence(input(d))) {
            codes.insert(f.code());
            expect_worded(f, subject_words(f), words_);
            // The contract's "line" field comes from the typed subject.
            if (f.subject.kind == Subject::Kind::line) {
                EXPECT_EQ(f.subject.line_letters().size(), 1u);
            }
        }
    }
    for (const char* code : {"uv-cutoff", "immiscible", "precipitation", "ms-nonvolatile",
                             "column-ph", "shelf-life", "runs-dry", "waste-overflow"})
        EXPECT_TRUE(codes.count(code)) << code;
}

// Typed subjects of the night: the shelf life and the bottle are line A's and B's, the meeting
// in the wash is the pair B and C, the column's pH is the method's, the waste is nobody's.
TEST_F(Findings, SubjectsAreTyped) {
    std::map<FindingKind, Finding> by_kind;
    for (const Finding& f : check_sequence(input(ms())))
        by_kind.emplace(f.kind, f);
    ASSERT_TRUE(by_kind.count(FindingKind::shelf_life));
    EXPECT_EQ(by_kind[FindingKind::shelf_life].subject, Subject::of_line(0));
    ASSERT_TRUE(by_kind.count(FindingKind::runs_dry));
    EXPECT_EQ(by_kind[FindingKind::runs_dry].subject, Subject::of_line(1));
    ASSERT_TRUE(by_kind.count(FindingKind::immiscible_lines));
    EXPECT_EQ(by_kind[FindingKind::immiscible_lines].subject, Subject::of_lines(1, 2));
    EXPECT_EQ(by_kind[FindingKind::immiscible_lines].subject.line_letters(), "BC");
    EXPECT_EQ(by_kind[FindingKind::immiscible_lines].where, Subject::of_method("wash"));
    ASSERT_TRUE(by_kind.count(FindingKind::column_ph_eluent));
    EXPECT_EQ(by_kind[FindingKind::column_ph_eluent].subject.kind, Subject::Kind::method);
    ASSERT_TRUE(by_kind.count(FindingKind::waste_overflow));
    EXPECT_EQ(by_kind[FindingKind::waste_overflow].subject.kind, Subject::Kind::none);
    ASSERT_TRUE(by_kind.count(FindingKind::ms_nonvolatile));
    EXPECT_EQ(by_kind[FindingKind::ms_nonvolatile].subject, Subject::of_line(0));
    ASSERT_TRUE(by_kind.count(FindingKind::ms_additive));
    EXPECT_EQ(by_kind[FindingKind::ms_additive].subject, Subject::of_line(1));
}

// Times are worded at render time by the context's clock, not by the check.
TEST_F(Findings, ClockIsTheRenderers) {
    Finding dry;
    for (const Finding& f : check_runs_dry(input(ms())))
        if (f.kind == FindingKind::runs_dry)
            dry = f;
    ASSERT_TRUE(dry.has_number("dry_at_min"));
    EXPECT_TRUE(contains(describe(dry, words_), default_clock(dry.number_of("dry_at_min"))));
    RenderContext at_six = words_;
    at_six.clock = [](double) { return std::string("18:42"); };
    EXPECT_TRUE(contains(describe(dry, at_six), ", at 18:42")) << describe(dry, at_six);
}

// The solver's warnings carry their finding: 0.3 mol/L sodium chloride puts I above 0.1 mol/L,
// where the solver cautions that Davies loses accuracy (its documented threshold,
// chem/equilibrium.h); the message is describe() of that finding.
TEST(FindingsWarnings, SolverWarningCarriesItsFinding) {
    const Library& reagents = chem::testing::shipped_library();
    const Speciation sp = solve(reagents, {{&reagents.reagent("sodium-chloride"), 0.3}}, 25);
    const Warning* high = nullptr;
    for (const Warning& w : sp.warnings)
        if (w.code == "ionic-strength-high")
            high = &w;
    ASSERT_NE(high, nullptr);
    ASSERT_TRUE(high->finding.has_value());
    EXPECT_EQ(high->finding->kind, FindingKind::ionic_strength_high);
    EXPECT_EQ(high->severity, Severity::caution);
    EXPECT_NEAR(high->finding->number_of("ionic_strength_mol_per_l"), 0.3, 1e-6);
    EXPECT_EQ(high->message, describe(*high->finding, RenderContext{}));
    EXPECT_TRUE(contains(high->message, "Ionic strength 0.3")) << high->message;
}

// A line on its own (the line command) is named by its name, with no letter.
TEST(FindingsAlone, LoneLineNamedByItsName) {
    const SolventLibrary& solvents = chem::testing::shipped_solvents();
    const Library& reagents = chem::testing::shipped_library();
    LineSpec s;
    s.name = "Wash";
    s.parts = {{"water", std::nullopt, 0.5}, {"hexane", std::nullopt, 0.5}};
    const LineProfile p = profile_line(solvents, reagents, s);
    const auto found = check_line(solvents, p, "Wash", std::nullopt, std::nullopt, &reagents);
    ASSERT_FALSE(found.empty());
    const Finding& f = found.front();
    EXPECT_EQ(f.kind, FindingKind::immiscible_in_line);
    EXPECT_TRUE(f.alone);
    EXPECT_EQ(f.subject, Subject::of_line(0));
    RenderContext words;
    words.line_names[0] = "Wash";
    const std::string text = describe(f, words);
    EXPECT_EQ(text.rfind("The line Wash mixes hexane (50 %) with water (50 %)", 0), 0u) << text;
}

// Every kind has its sentence: a hand-made finding of each, with the numbers the sentence reads.
TEST(FindingsEveryKind, EachKindRendersItsSubjectAndNumber) {
    RenderContext words;
    words.line_names = {"Buffer", "Organic", "", ""};
    for (const auto& [kind, shown_n] : shown_numbers()) {
        Finding f;
        f.kind = kind;
        f.severity = Finding::Severity::warning;
        const bool about_reagent = kind == FindingKind::small_amount ||
                                   kind == FindingKind::amount_out_of_tolerance ||
                                   kind == FindingKind::amount_not_entered;
        const bool about_solution = kind == FindingKind::ionic_strength_high ||
                                    kind == FindingKind::activity_model_differs ||
                                    kind == FindingKind::low_buffer_capacity ||
                                    kind == FindingKind::titrant_volume_large;
        f.subject = about_reagent ? Subject::of_reagent("sodium-chloride")
                    : kind == FindingKind::ph_outside_pka_range ? Subject::of_system("phosphate")
                    : about_solution                            ? Subject{}
                    : kind == FindingKind::immiscible_lines     ? Subject::of_lines(0, 1)
                    : kind == FindingKind::pressure_limit || kind == FindingKind::buffer_range ||
                            kind == FindingKind::column_ph_eluent
                        ? Subject::of_method("assay")
                    : kind == FindingKind::waste_overflow || kind == FindingKind::waste_nearly_full
                        ? Subject{}
                        : Subject::of_line(0);
        f.where =
            kind == FindingKind::precipitation ? Subject::of_line(0) : Subject::of_method("assay");
        if (shown_n.key[0])
            f.number(shown_n.key, 12.3456);
        f.number("required_ml", 500);
        f.number("limit_bar", 400);
        f.number("capacity_ml", 100);
        f.text("miscibility", "immiscible");
        f.text("phase", "injection");
        f.number("dry_after_injection", 3);
        f.detail("injections", 20);
        f.items = {{"sodium-chloride", kind == FindingKind::ms_nonvolatile ? 10.0 : std::nan("")}};
        const std::string subject = about_reagent                               ? "sodium-chloride"
                                    : kind == FindingKind::ph_outside_pka_range ? "phosphate"
                                    : kind == FindingKind::titrant_volume_large ? "The titrant"
                                    : kind == FindingKind::low_buffer_capacity  ? "Buffer capacity"
                                    : kind == FindingKind::ionic_strength_high  ? "Ionic strength"
                                    : kind == FindingKind::activity_model_differs
                                        ? "The Davies model"
                                    : kind == FindingKind::precipitation ? "in the bottle of line A"
                                    : f.subject.kind == Subject::Kind::line      ? "Line A (Buffer)"
                                    : f.subject.kind == Subject::Kind::method    ? "assay"
                                    : f.subject.kind == Subject::Kind::line_pair ? "Lines A and B"
                                                                                 : "";
        expect_worded(f, subject, words);
        EXPECT_STRNE(f.code(), "?");
    }
}
