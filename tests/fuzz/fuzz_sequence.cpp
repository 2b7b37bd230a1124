// libFuzzer target: the `sequence` command's JSON document (README, "The command-line tool").
#include "core/line_commands.h"
#include "fuzz_common.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* bytes, std::size_t size) {
    return phaseplan::fuzz::run_json(bytes, size,
                                     [](const phaseplan::AppData& d, const QJsonObject& in) {
                                         return phaseplan::command_sequence(d, in, {});
                                     });
}
