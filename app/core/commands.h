#pragma once
// The command-line subcommands as plain functions: JSON document in, JSON document out.
// Each throws chem::Error for bad input; app/cli/main.cpp catches it once, prints one line on
// stderr and exits with status 2. Tests call these in-process too.
#include "core/app_data.h"

#include <QDateTime>
#include <QJsonObject>
#include <QString>

#include <functional>
#include <memory>
#include <string>
#include <utility>
#include <vector>

namespace chem {
class EluentPoints;
}

namespace phaseplan {

/// The eluent points a sequence's checks solved (chem::EluentPoints), kept for the next run over
/// the same eluent: the app's plan model recomputes on every edit, and most edits (times, rows,
/// bottles) leave the eluent as it was. Entries are keyed on everything the points depend on: the
/// lines' make-up, the column temperature and the library, which the caller names by
/// `library_revision` (raise it whenever the library changes).
struct EluentMemo {
    int library_revision = 0;
    std::vector<std::pair<std::string, std::shared_ptr<chem::EluentPoints>>>
        entries; ///< newest last
};

/// Options from the command line that are not part of the JSON document.
struct CommandOptions {
    QString output_path;  ///< -o FILE (sheet, labels)
    QString paper = "a4"; ///< --paper a4|letter|label62
    /// --follow-symlinks: -o may name a symbolic link, and its target is written.
    bool follow_symlinks = false;
    /// How clock times are worded in messages: the app passes "tomorrow 03:30"; empty gives
    /// "2026-12-02 03:12", as the command-line tool prints them.
    std::function<QString(const QDateTime&)> clock_words;
    /// Solved eluent points to reuse and keep (the app's plan model); none: solved afresh.
    EluentMemo* eluent_memo = nullptr;
};

QJsonObject command_solve(const AppData& data, const QJsonObject& input, const CommandOptions& opt);
QJsonObject command_recipe(const AppData& data, const QJsonObject& input,
                           const CommandOptions& opt);
/// Lists the reagent library: id, name, formula, molar_mass_g_per_mol, form, ... (input ignored).
QJsonObject command_reagents(const AppData& data, const QJsonObject& input,
                             const CommandOptions& opt);

} // namespace phaseplan
