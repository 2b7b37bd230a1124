#pragma once
// The demo's people and its one finished batch, seeded into a new database so that the audit
// trail, the signatures and `phaseplan-cli audit verify|export` have something to show from the
// first start. Invented people of the invented lab (Halden Ridge Analytical); their passwords are
// listed in README.md and are for the demo only.
#include <QDate>
#include <QString>

#include <vector>

namespace phaseplan::storage {

class Database;

struct DemoUser {
    const char* login;
    const char* display_name;
    const char* role;
    const char* password; ///< demo only: listed in README.md
    /// crypto_pwhash_str of the password, computed once (Argon2id, interactive limits), so that a
    /// new database does not spend a second hashing; tst_audit checks that each matches.
    const char* argon2id_hash;
};
/// demo-admin (administrator), demo-prep (preparer), demo-review (reviewer), demo-approve
/// (approver).
const std::vector<DemoUser>& demo_users();

/// "Overnight demo": the name of the demo sequence.
QString demo_sequence_name();

/// Everything a new database gets: the demo sequence (data/demo/overnight-sequence.json) with its
/// methods, lines and buffers saved by name, then seed_demo_records().
void seed_demo(Database& db, const QString& data_dir);

/// The demo batch's id: "HR-QC117-A-0041".
QString demo_batch_id();

/// Adds the demo users and the demo batch, made from data/demo/batch-line-a-buffer.json with the
/// id demo_batch_id(), with its whole history: created by demo-prep, printed, amended with a
/// reason (a lot number corrected), printed again, signed as prepared by demo-prep and as reviewed
/// by demo-review; then the demo lots on the shelf (seed_demo_lots). Throws chem::Error when the
/// file cannot be read or the database refuses. Meant for a new database (inside the transaction
/// that creates it).
void seed_demo_records(Database& db, const QString& data_dir);

/// One invented lot of the demo shelf; its dates are days from the day the database is made, so
/// the demo shows the same on any day.
struct DemoLot {
    const char* reagent;
    const char* lot;
    const char* supplier;
    int received_days; ///< days from today (negative: in the past)
    int opened_days;   ///< 0 = not opened
    int expires_days;
    double quantity;
    const char* quantity_unit;
};
/// The demo's shelf: two lots of phosphoric acid, three of sodium dihydrogen phosphate
/// monohydrate (SP-1987 expired five days before the database was made, SP-2207 expires the day
/// after).
const std::vector<DemoLot>& demo_lots();

/// Puts demo_lots() on the shelf, dated from `today`, recorded under demo-prep (the last step of
/// seed_demo_records, after the demo batch: its history is unchanged).
void seed_demo_lots(Database& db, const QDate& today);

} // namespace phaseplan::storage
