#pragma once
// The lab's reagent-lot shelf: one row per lot of a library reagent (the lot number on the
// supplier's label, the supplier, when it came in, when it was opened, when it expires, how much
// came), table `reagent_lots` from schema step lot_schema_version. A batch's amounts pick their
// lots from here (resolve_batch_lots): the batch then carries each lot's expiry date, its use-by
// is clamped to the earliest one (chem::use_by), and a lot that expired before the day of
// preparation is refused unless an approver overrides it with a reason
// (BatchStore::override_expired_lot).
//
// Rules (chem::Error naming the field, with the value as typed):
//   - reagent and lot are required; a lot number is at most 64 characters and is on the shelf
//     once per reagent;
//   - dates are YYYY-MM-DD; the lot is opened no earlier than it was received, and expires after
//     it was received (chem::check_lot_dates);
//   - quantity, when given, is a positive amount with its unit g, kg, mL or L;
//   - lots are never removed; the administrator changes none (AccountStore::check_may_edit);
//   - every change is an entry of the audit trail (record_type "lot", record id
//     "<reagent>/<lot>") under the login that made it, in the same transaction.
#include "storage/audit_trail.h"
#include "storage/batch_store.h"
#include "storage/sql_dialect.h"

#include <QSqlDatabase>
#include <QString>
#include <QStringList>

#include <functional>
#include <optional>
#include <vector>

namespace phaseplan::storage {

/// The schema step that adds the lot shelf. The one place its number is written: the migration
/// list, the tests and the documentation refer to this constant.
inline constexpr int lot_schema_version = 12;

/// Schema step lot_schema_version: the reagent_lots table and its guards, in the back end's
/// dialect.
QStringList lot_schema_statements(sql::Dialect d);

struct ReagentLot {
    qint64 id = 0;
    QString reagent; ///< a reagent id of the library ("phosphoric-acid")
    QString lot;     ///< the lot number on the supplier's label
    QString supplier;
    QString received_on;            ///< YYYY-MM-DD
    QString opened_on;              ///< YYYY-MM-DD, "" = not opened yet
    QString expires_on;             ///< YYYY-MM-DD: usable on that day, not after
    std::optional<double> quantity; ///< how much came, in quantity_unit; absent = not recorded
    QString quantity_unit;          ///< "g", "kg", "mL" or "L"; "" when no quantity
    QString created_at;             ///< UTC
    QString created_by;             ///< login (or the name typed, before accounts)
    QString changed_at;             ///< UTC
    /// From schema step row_version_schema_version (storage/versioning.h), 0 before it: the
    /// version (1 when put on the shelf, +1 when opened) and who changed it last.
    qint64 version = 0;
    QString changed_by{};

    /// Expired on `day` (YYYY-MM-DD): its expiry date lies before that day.
    bool expired_on(const QString& day) const { return expires_on < day; }
    /// "PA-88112 (expires 2027-09-30)" and, when opened, ", opened 2026-10-02".
    QString words() const;
};

/// Checks a lot's fields as the rules above say. Throws chem::Error naming the field.
void validate_lot(const ReagentLot& lot);

/// "500 g", "2.5 L", "500g", "0,5 kg": the amount and its unit into `l` (quantity,
/// quantity_unit); "" or blanks clear them. Throws chem::Error("quantity", …) when the text is not
/// a number followed by a unit; the unit itself is checked by validate_lot.
void read_lot_quantity(const QString& text, ReagentLot& l);

class LotStore {
  public:
    /// On a connection whose schema has step lot_schema_version.
    explicit LotStore(QSqlDatabase db);

    /// Puts a lot on the shelf, recorded under `who`. Returns it as stored. Throws chem::Error:
    /// the fields as validate_lot, "lot" when the reagent has that lot already (name_taken_error:
    /// who put it there and when), "who".
    ReagentLot add(const ReagentLot& lot, const QString& who);

    /// Records the day a lot was opened ("" clears it), under `who`. Throws chem::Error("lot", …)
    /// for an unknown lot, "opened_on" as validate_lot. With `expected_version` above 0 (the
    /// version the screen showed), a lot changed since on another bench is refused with
    /// conflict_error (field "version"), in the same transaction; -1 does not check (the CLI,
    /// which reads and writes at once).
    ReagentLot set_opened(const QString& reagent, const QString& lot, const QString& opened_on,
                          const QString& who, qint64 expected_version = -1);

    /// The lots of `reagent` ("" = every reagent), by reagent, then the earliest expiry first.
    std::vector<ReagentLot> list(const QString& reagent = {}) const;
    std::optional<ReagentLot> find(const QString& reagent, const QString& lot) const;

    /// Test seam: the clock (UTC ISO 8601) for created_at, changed_at and the audit entries.
    void set_clock(std::function<QString()> clock) { clock_ = std::move(clock); }

  private:
    QString now() const;

    QSqlDatabase db_;
    std::function<QString()> clock_;
};

/// An approver's acceptance of one expired lot, attached to the batch's amount as
/// "lot_override": {"by", "name", "at", "reason"}.
struct LotOverrideGrant {
    QString reagent;
    QString lot;
    QString by;   ///< the approver's login
    QString name; ///< the approver's name
    QString at;   ///< UTC ISO 8601
    QString reason;
};

/// Ties `next`'s amounts to the shelf before the batch is stored (and before the screen shows
/// it, so both agree). For each amount with a lot:
///   - the lot as before (same reagent and lot as in `current`) keeps the expiry date and the
///     override recorded then;
///   - a new lot found on the shelf takes the shelf's expiry date ("lot_expires_on");
///   - a new lot not on the shelf is refused ("batch.actual[i].lot") when the shelf holds lots
///     of that reagent: pick one of them, or put the lot on the shelf first; when it holds none,
///     the lot stays free text, without an expiry;
///   - "lot_expires_on" and "lot_override" given by the caller are dropped: only the shelf and
///     `grant` set them.
/// `grant` attaches an approver's override to the amount it names; it throws chem::Error
/// ("lot_override", …) when that amount or lot is not in `next`, or the lot has not expired on
/// the day of preparation. Does nothing on a connection without the shelf.
void resolve_batch_lots(QSqlDatabase db, const BatchRecord* current, BatchRecord& next,
                        const LotOverrideGrant* grant = nullptr);

/// The shelf against its trail (run by verify_records, so by `audit verify`): every lot equals
/// its add-lot and open-lot entries replayed field by field, and every add-lot entry has its lot.
/// A lot changed, added or removed behind the program's back (the guards dropped) is named by the
/// entry it disagrees with. Read-only.
AuditVerification verify_lots(QSqlDatabase db);

/// The day of preparation: the date of prepared_at, else today (local), YYYY-MM-DD.
QString preparation_day(const BatchRecord& batch);

} // namespace phaseplan::storage
