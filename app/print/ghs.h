#pragma once
// GHS hazard pictograms drawn by the program, and the hazard statements printed beside them.
//
// Pictograms: the nine symbols of the UN GHS (Globally Harmonized System of Classification and
// Labelling of Chemicals, Rev. 9, 2021, Annex 3 section 3 and Annex 1) as a black symbol on a
// white square set on a point with a red frame (from memory). The drawings here are simple
// versions made with QPainter paths, recognisable at label size; they are not copies of the
// official artwork.
#include <QRectF>
#include <QString>
#include <QStringList>

class QPainter;

namespace phaseplan::print {

/// "GHS01" … "GHS09".
bool is_ghs_pictogram(const QString& code);

/// The pictogram's usual name ("Corrosion" for GHS05), or "" for an unknown code.
QString ghs_pictogram_name(const QString& code);

/// Paints pictogram `code` (GHS01–GHS09) as a diamond filling the largest square centred in
/// `box`. An unknown code is drawn as an empty red diamond with the code written inside, so a
/// lab's own entry with a typo still shows that a hazard exists.
void paint_ghs_pictogram(QPainter& painter, const QRectF& box, const QString& code);

/// GHS hazard statement text for an H code ("H314" -> "Causes severe skin burns and eye
/// damage"), standard English wording of UN GHS Rev. 9 Annex 3 section 1 and, for EUH codes,
/// Regulation (EC) No 1272/2008 Annex II (both from memory). "" for a code not in the table:
/// callers then print the code with "see the safety data sheet".
QString hazard_statement(const QString& h_code);

/// Sorts pictogram codes (GHS01 first) and drops duplicates and blanks.
QStringList sorted_pictograms(const QStringList& codes);

/// Sorts H codes by number (H225 before H314, EUH after H) and drops duplicates and blanks.
QStringList sorted_hazard_codes(const QStringList& codes);

} // namespace phaseplan::print
