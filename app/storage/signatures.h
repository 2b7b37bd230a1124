#pragma once
// Electronic signatures on a batch (table `signatures`, schema step 10).
//
// A signature binds the signer (login and printed name), the time (UTC), the meaning (prepared,
// reviewed, approved) and the SHA-256 of the batch's content at signing (21 CFR 11.50: name, date
// and time, meaning; 11.70: linked to its record so that it cannot be moved to another). Signing
// takes the login and the password again (11.200(a)(1): two distinct components; EU GMP Annex 11
// §14). The row is never changed: a signature holds while the batch's content hash is still the
// one signed. A recorded change of the batch (edit or amendment: the revision moves on) voids
// every signature made before it, and the change writes a "void-signature" entry per signature to
// the audit trail; the batch is then signed again.
//
// Rules (chem::Error naming the field):
//   - "prepared" by a preparer, "reviewed" by a reviewer or approver, "approved" by an approver;
//     the administrator signs nothing;
//   - "reviewed" needs a holding "prepared", "approved" a holding "reviewed";
//   - nobody signs "reviewed" or "approved" a batch they prepared (created it, or signed it as
//     prepared): a second person checks (21 CFR 211.194(a)(8), from memory);
//   - the same person does not sign the same meaning twice on the same content.
//
// The content hash: lowercase hex SHA-256 of the compact JSON (keys sorted, as QJsonDocument
// writes them) of {"batch": BatchRecord::to_input(), "revision": revision}. Printing does not
// change it; any recorded change does, because the revision moves on even when a value comes back.
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/batch_store.h"

#include <QSqlDatabase>
#include <QString>

#include <vector>

namespace phaseplan::storage {

class Database;
void seed_demo_records(Database& db, const QString& data_dir);

/// The content hash of a batch as stored (see above).
QString batch_content_sha256(const BatchRecord& batch);

struct Signature {
    qint64 id = 0;
    QString batch_id;
    QString login;
    QString display_name;
    QString meaning;   ///< "prepared", "reviewed", "approved"
    QString signed_at; ///< UTC ISO 8601
    int revision = 0;  ///< the batch's revision when signed
    QString content_sha256;
    qint64 audit_seq = 0; ///< the audit entry that records it
    bool holds = false;   ///< the batch's content hash is still content_sha256
};

class SignatureStore {
  public:
    /// On a connection whose schema has step 10.
    explicit SignatureStore(QSqlDatabase db);

    /// Signs the batch as it is now. Authenticates login and password first (a wrong password
    /// counts towards the lock). Throws chem::Error: "password"/"login" (authentication),
    /// "meaning", "batch.id", "login" (role or second-person rules). With `expected_version` > 0
    /// (the version of the batch the signer was shown), throws ConflictError when the batch changed
    /// since (app/storage/versioning.h): nobody signs content they have not seen.
    Signature sign(const QString& batch_id, const QString& login, const QString& password,
                   const QString& meaning, qint64 expected_version = 0);

    /// Oldest first, each with `holds` computed against the batch as stored now.
    std::vector<Signature> list(const QString& batch_id) const;

    /// The "prepared" etc. words for the screen and the sheet: "Prepared by Ansel Marchetti
    /// (demo-prep) 2026-12-02 13:10:04 UTC", with " — void: the batch changed after signing"
    /// when it no longer holds.
    static QString manifestation(const Signature& s);

    /// Test seam: the clock (UTC ISO 8601).
    void set_clock(std::function<QString()> clock) { clock_ = std::move(clock); }

  private:
    // The first-run demo signs its batch with the demo accounts it has just stored from a fixed
    // table of logins and password hashes (storage/demo.cpp): checking those passwords again
    // would only spend three Argon2id hashes of the start-up. Every other signature goes
    // through sign().
    friend void seed_demo_records(Database& db, const QString& data_dir);
    /// sign() after authentication: `who` is the account that proved its password.
    Signature sign_as(const QString& batch_id, const Account& who, const QString& meaning,
                      qint64 expected_version);

    QSqlDatabase db_;
    std::function<QString()> clock_;
};

/// The records against their trail, after verify_audit() found the chain intact:
///   - every signature row matches the "sign" entry it names (audit_seq): batch, login, time,
///     meaning, revision, content hash and signature number; and every "sign" entry has its row;
///   - every batch equals its trail replayed (each create, edit and amend entry's "new" values,
///     field by field), and has a "create" entry;
///   - the lot shelf equals its trail (verify_lots, storage/lot_store.h).
/// So a signature or a batch changed behind the program's back, while the trail was left alone,
/// is found too. first_bad_seq names the trail entry the record disagrees with (for a batch, its
/// last entry). Read-only.
AuditVerification verify_records(QSqlDatabase db);

/// verify_audit(), then verify_records() when the chain holds: what `audit verify` runs.
AuditVerification verify_all(QSqlDatabase db);

/// The signatures of `batch` that hold on its current content (used by BatchStore before a
/// change, to void them in the same transaction).
std::vector<Signature> holding_signatures(QSqlDatabase db, const BatchRecord& batch);

} // namespace phaseplan::storage
