#pragma once
// Shared by the libFuzzer targets (tests/fuzz/fuzz_*.cpp): the shipped data, loaded once, and the
// rule every target checks: any input either gives a result or throws chem::Error. Anything else
// (another exception, a crash, a sanitizer report) is a finding.
#include "chem/error.h"
#include "core/app_data.h"
#include "core/commands.h"
#include "core/json_util.h"

#include <QByteArray>
#include <QCoreApplication>

#include <cstdint>
#include <cstdlib>
#include <memory>

namespace phaseplan::fuzz {

inline QCoreApplication& app() {
    static int argc = 1;
    static char name[] = "fuzz";
    static char* argv[] = {name, nullptr};
    static QCoreApplication a(argc, argv);
    return a;
}

inline const AppData& data() {
    static const AppData d = [] {
        app();
        return load_app_data(QStringLiteral(PHASEPLAN_SOURCE_DATA_DIR));
    }();
    return d;
}

/// Parses the bytes as a document and runs `command` on it; chem::Error is the expected outcome
/// of bad input, and a result must pass the output guard.
template <class Command>
int run_json(const std::uint8_t* bytes, std::size_t size, Command command) {
    const AppData& d = data();
    try {
        const QJsonObject input = json::parse_document(
            QByteArray(reinterpret_cast<const char*>(bytes), static_cast<qsizetype>(size)));
        const QJsonObject out = command(d, input);
        json::check_output(out);
    } catch (const chem::Error&) {
    }
    return 0;
}

} // namespace phaseplan::fuzz
