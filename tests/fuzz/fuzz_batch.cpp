// libFuzzer target: the batch record ("batch": id, dates, actual amounts and lots) read alone,
// then with its recipe as `sheet` evaluates it (amounts against ±tolerance, pH as made).
#include "core/batch_document.h"
#include "fuzz_common.h"
#include "print/documents.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* bytes, std::size_t size) {
    return phaseplan::fuzz::run_json(
        bytes, size, [](const phaseplan::AppData& d, const QJsonObject& in) {
            std::optional<int> copies;
            std::optional<double> shelf_h;
            (void)phaseplan::batch_from_json(in, &copies, &shelf_h);
            if (phaseplan::batch_document_kind(in) != QLatin1String("recipe"))
                return QJsonObject{};
            return phaseplan::print::build_print_job(d, in, QStringLiteral("2026-12-01 10:00"))
                .summary;
        });
}
