#pragma once
// The `eluent` subcommand: the mobile phase as the column sees it at one pump composition.
// Input {"lines": {"A": {…a line…}, …}, "composition": {"A": 60, "B": 40}, "temperature_c": 35,
// "activity_model": "davies"|"sit"|"truesdell-jones"}; output organic_fraction_v, solvents (each
// with fraction_v), ph_w_w, ph_s_s, ph_s_w, delta, ionic_strength_mol_per_l,
// buffer_capacity_mol_per_l, pka [{system, step, w_w, s_s}], warnings. Field names are a fixed
// contract: extend, rename nothing.
#include "chem/eluent.h"
#include "core/commands.h"

#include <QJsonObject>

namespace phaseplan {

QJsonObject command_eluent(const AppData& data, const QJsonObject& input,
                           const CommandOptions& opt);

/// The JSON form of an eluent result (also used for the sequence's eluent trace points).
QJsonObject eluent_result_to_json(const chem::EluentResult& r);

} // namespace phaseplan
