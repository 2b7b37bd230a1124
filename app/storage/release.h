#pragma once
// A batch's release, from its electronic signatures (see core/batch_release.h for the rule).
#include "core/batch_release.h"
#include "storage/signatures.h"

#include <vector>

namespace phaseplan::storage {

/// Released when a "reviewed" signature holds and its signer is not one of the
/// people who signed the batch as prepared. `signatures` as SignatureStore::list gives them.
BatchRelease release_of(const std::vector<Signature>& signatures);

} // namespace phaseplan::storage
