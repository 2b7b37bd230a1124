// libFuzzer target: the document of `sheet` and `labels` (a recipe, line or sequence document with
// its batch), up to the print job both render: everything but the painting.
#include "fuzz_common.h"
#include "print/documents.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* bytes, std::size_t size) {
    return phaseplan::fuzz::run_json(
        bytes, size, [](const phaseplan::AppData& d, const QJsonObject& in) {
            const phaseplan::print::PrintJob job =
                phaseplan::print::build_print_job(d, in, QStringLiteral("2026-12-01 10:00"));
            return job.summary;
        });
}
