#include "storage/release.h"

#include <algorithm>

namespace phaseplan::storage {

BatchRelease release_of(const std::vector<Signature>& signatures) {
    BatchRelease out;
    for (const Signature& s : signatures)
        out.signature_lines << SignatureStore::manifestation(s);
    auto preparer = [&](const QString& login) {
        return std::any_of(signatures.begin(), signatures.end(), [&](const Signature& p) {
            return p.meaning == QLatin1String("prepared") && p.login == login;
        });
    };
    // The first holding review by a second person releases the batch.
    for (const Signature& s : signatures) {
        if (!s.holds || s.meaning != QLatin1String("reviewed") || preparer(s.login))
            continue;
        out.released_line =
            QStringLiteral("Released for use: reviewed by %1 (%2) %3 UTC")
                .arg(s.display_name, s.login,
                     s.signed_at.left(16).replace(QLatin1Char('T'), QLatin1Char(' ')));
        out.reviewed_by = QStringLiteral("%1 (%2)").arg(s.display_name, s.login);
        break;
    }
    return out;
}

} // namespace phaseplan::storage
