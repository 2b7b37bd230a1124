#pragma once
// The pieces the printed sheets are built from, internal to app/print: blocks (headings, field
// lists, tables, hazards, sign-off), the batch's fields and checks, and the line helpers. The
// sheets themselves are built in recipe_sheet.cpp, line_sheet.cpp and sequence_sheet.cpp;
// documents.cpp picks one (build_print_job).
#include "chem/batch.h"
#include "chem/line.h"
#include "chem/recipe.h"
#include "core/app_data.h"
#include "core/batch_document.h"
#include "core/batch_release.h"
#include "print/documents.h"
#include "print/ghs.h"
#include "print/sheet.h"

#include <QJsonObject>
#include <QList>
#include <QString>
#include <QStringList>

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace phaseplan::print::sheet_parts {

QString qs(const std::string& s);

struct HazardSet;

/// A print job with its sheet's head filled in: kind, copies, title ("… — batch <id>"), the
/// sheet's kind title, title, batch id and footer (printed at, and the hazard note).
PrintJob start_job(const BatchDocument& doc, const QString& kind, const QString& kind_title,
                   const QString& printed_at);
/// The "Batch" heading and its fields: the batch's own (who, when, shelf life, tolerance), then
/// what was measured at the bench against `target_ph`.
void add_batch_blocks(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                      std::optional<double> target_ph, SheetDocument& d);
/// A bottle label's batch part: id (and QR), prepared and expiry times, who, the hazards of
/// `hz`, the sheet's out-of-tolerance `mark` and the release.
void fill_label_batch(const BatchDocument& doc, const HazardSet& hz, const QString& mark,
                      const BatchRelease& release, LabelData& label);

/// Pictograms and H statements of the parts, each statement naming the parts that carry it.
struct HazardSet {
    QStringList pictograms;
    std::map<QString, QStringList> from; ///< H code -> part names
    void add(const QString& part, const std::vector<std::string>& hazards,
             const std::vector<std::string>& pictos) {
        for (const auto& p : pictos)
            pictograms << qs(p);
        for (const auto& h : hazards) {
            QStringList& l = from[qs(h)];
            if (!l.contains(part))
                l << part;
        }
    }
    QStringList codes() const {
        QStringList c;
        for (const auto& [k, v] : from)
            c << k;
        return sorted_hazard_codes(c);
    }
    Block block() const {
        Block b;
        b.kind = Block::Kind::hazards;
        b.pictograms = sorted_pictograms(pictograms);
        for (const QString& code : codes())
            b.hazard_lines << HazardLine{code, hazard_statement(code), from.at(code).join(", ")};
        if (b.pictograms.isEmpty() && b.hazard_lines.isEmpty())
            b.text = QStringLiteral(
                "No GHS hazard codes are recorded in the library for these parts. That is not a "
                "statement that the preparation is without hazard: check each safety data sheet.");
        else
            b.text =
                QStringLiteral("Hazard statements: UN GHS wording (from memory); the safety data "
                               "sheet of the product in hand is the authority.");
        return b;
    }
};

/// The formula of what is dissolved: a hydrate's water is just water once in solution.
QString dissolved_formula(const chem::Reagent& r);

QString route_text(const chem::RecipeRequest& q);

QString form_text(const chem::Reagent& r, const chem::RecipeItem& it, const chem::RecipeRequest& q);

Block heading(const QString& text);

Block fields_block(const QList<KeyValue>& kv);

QStringList cautions_with_standard(const std::vector<std::string>& own);

QList<KeyValue> batch_fields(const chem::Batch& b, const QString& recipe, const QString& purpose,
                             const QString& expires, const QString& shelf_note);

/// "48 h (2 days), an aqueous buffer — <source>": the shelf life applied, the kind in words
/// (chem::shelf_kind_words) and where the figure comes from.
QString shelf_note_text(double hours, std::optional<chem::ShelfKind> kind, const QString& source,
                        bool given);

QString tolerance_text(const chem::Batch& b);

QString check_text(const chem::AmountCheck& c);

/// "± 2 %" and the band ("1.24–1.28 mL"), with its target's decimals (chem::format_measure_band).
QString band_text(const chem::AmountCheck& c, const chem::Batch& b);

/// The reagents table of a recipe with its batch: target, tolerance, actual, lot, check.
/// The actual amount and where it came from: "3.161 g\nfrom balance BAL-03" or "…\ntyped".
QString actual_text(const chem::AmountCheck& c, const QJsonObject& captures);

/// A lot as the tables print it: "PA-88112", with "exp. 2027-09-30" below when the lot shelf
/// gave its expiry, and "EXPIRED: override" when an approver accepted it expired.
QString lot_text(const chem::AmountCheck& c);

Block reagent_table(const chem::Library& lib, const chem::Recipe& recipe,
                    const chem::BatchResult& res, const chem::Batch& batch,
                    const QJsonObject& captures);

/// pH, ionic strength, β and the composition: as planned and from the actual amounts.
Block predicted_table(const chem::Recipe& recipe, const chem::BatchResult& res,
                      const QString& what);

/// The warnings of a BatchDocument as a block.
Block warnings_block(const QJsonArray& warnings);

Block numbered(const QStringList& items);

Block bullets(const QStringList& items);

/// The paper sign-off: "Checked by" is the releasing reviewer when the batch is released.
Block signoff(const chem::Batch& batch, const BatchRelease& release);
/// The electronic signatures and the release, below the wet-ink sign-off: each signature in the
/// record's words, then the release, or a boxed notice that the batch is not released.
QList<Block> release_blocks(const BatchRelease& release);
/// The release line of a label: the reviewer and date, or "NOT RELEASED — awaiting review".
void set_release(LabelData& label, const BatchRelease& release);

QString purpose_of(const QJsonObject& input);

QString percent_text(double fraction);

/// The mark, the reasons, the deviation note (who, when) and the suggested correction.
void add_deviation_blocks(const AppData& data, const BatchDocument& doc, SheetDocument& d);

/// Measured at the bench: the pH meter's reading, the instruments and a comment.
QList<KeyValue> bench_fields(const chem::Batch& b, std::optional<double> target_ph,
                             const QJsonObject& ph_capture);

/// Pictograms and H codes of a line's parts: its solvents, additives and buffer reagents.
void add_line_hazards(const AppData& data, const chem::LineSpec& spec, HazardSet& hz);

/// "Acetonitrile 90 % v/v" lines and dissolved reagents in mmol/L, for a label.
QStringList line_composition(const AppData& data, const chem::LineProfile& p);

} // namespace phaseplan::print::sheet_parts

namespace phaseplan::print {

// One builder per sheet: recipe_sheet.cpp, line_sheet.cpp, sequence_sheet.cpp.
PrintJob recipe_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                    const QString& printed_at, const BatchRelease& release);
PrintJob line_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                  const QString& printed_at, const BatchRelease& release);
PrintJob sequence_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                      const QString& printed_at, const BatchRelease& release);

} // namespace phaseplan::print
