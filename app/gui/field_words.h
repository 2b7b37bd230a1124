#pragma once
// The contract's field paths ("methods.assay.gradient[1].A", "lines.B.bottle_ml") in the words
// the screens use ("Method “assay”, gradient row 2, % A", "Line B, bottle volume"). The screens
// never show a JSON path: the command-line tool keeps those.
#include <QString>
#include <QStringList>

namespace phaseplan::gui {

/// @param path a field path of a recipe, line or sequence document.
/// @param method_names the plan's method names, so that a name holding a dot is read whole.
QString field_words(const QString& path, const QStringList& method_names = {});

/// The label of one leaf key as the screen shows it ("bottle_ml" → "bottle volume"); the key
/// itself, with underscores as spaces, when it has none.
QString key_words(const QString& key);

} // namespace phaseplan::gui
