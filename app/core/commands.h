#pragma once
// The command-line subcommands as plain functions: JSON document in, JSON document out.
// Each throws chem::Error for bad input; app/cli/main.cpp catches it once, prints one line on
// stderr and exits with status 2. Tests call these in-process too.
#include "core/app_data.h"

#include <QDateTime>
#include <QJsonObject>
#include <QString>

#include <functional>

namespace phaseplan {

/// Options from the command line that are not part of the JSON document.
struct CommandOptions {
    QString output_path;  ///< -o FILE (sheet, labels)
    QString paper = "a4"; ///< --paper a4|letter|label62
    /// --follow-symlinks: -o may name a symbolic link, and its target is written.
    bool follow_symlinks = false;
    /// How clock times are worded in messages: the app passes "tomorrow 03:30"; empty gives
    /// "2026-12-02 03:12", as the command-line tool prints them.
    std::function<QString(const QDateTime&)> clock_words;
};

QJsonObject command_solve(const AppData& data, const QJsonObject& input, const CommandOptions& opt);
QJsonObject command_recipe(const AppData& data, const QJsonObject& input,
                           const CommandOptions& opt);
/// Lists the reagent library: id, name, formula, molar_mass_g_per_mol, form, ... (input ignored).
QJsonObject command_reagents(const AppData& data, const QJsonObject& input,
                             const CommandOptions& opt);

} // namespace phaseplan
