#include "storage/lot_store.h"

#include "chem/batch.h"
#include "chem/error.h"
#include "chem/guard.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/sql_util.h"
#include "storage/versioning.h"

#include <QDate>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QRegularExpression>
#include <QSqlQuery>
#include <QSqlRecord>

#include <cmath>
#include <map>
#include <set>

namespace phaseplan::storage {

namespace {

using sql::run;

std::string str(const QString& s) {
    return s.toStdString();
}
std::string quoted(const QString& s) {
    return chem::guard::quote_id(str(s));
}

const char* lot_columns = "id, reagent, lot, supplier, received_on, opened_on, expires_on, "
                          "quantity, quantity_unit, created_at, created_by, changed_at";
const char* versioned_lot_columns =
    "id, reagent, lot, supplier, received_on, opened_on, expires_on, quantity, quantity_unit, "
    "created_at, created_by, changed_at, version, changed_by";

/// The columns read back: with the version once the schema has it.
QLatin1String columns_of(QSqlDatabase db) {
    return QLatin1String(has_row_version(db, QStringLiteral("reagent_lots")) ? versioned_lot_columns
                                                                             : lot_columns);
}

RowKey lot_key(const QString& reagent, const QString& lot) {
    return {QStringLiteral("reagent_lots"),
            {QStringLiteral("reagent"), QStringLiteral("lot")},
            {reagent, lot}};
}

QString lot_words(const QString& reagent, const QString& lot) {
    return QStringLiteral("Lot \"%1\" of %2").arg(lot, reagent);
}

ReagentLot lot_from(const QSqlQuery& q) {
    ReagentLot l;
    l.id = q.value(0).toLongLong();
    l.reagent = q.value(1).toString();
    l.lot = q.value(2).toString();
    l.supplier = q.value(3).toString();
    l.received_on = q.value(4).toString();
    l.opened_on = q.value(5).toString();
    l.expires_on = q.value(6).toString();
    if (!q.value(7).isNull())
        l.quantity = q.value(7).toDouble();
    l.quantity_unit = q.value(8).toString();
    l.created_at = q.value(9).toString();
    l.created_by = q.value(10).toString();
    l.changed_at = q.value(11).toString();
    if (q.record().count() > 12) {
        l.version = q.value(12).toLongLong();
        l.changed_by = q.value(13).toString();
    }
    return l;
}

QString record_id(const ReagentLot& l) {
    return l.reagent + QLatin1Char('/') + l.lot;
}

/// The lot's fields as the audit trail records them (unset ones absent).
QJsonObject lot_fields(const ReagentLot& l) {
    QJsonObject o{{"reagent", l.reagent},
                  {"lot", l.lot},
                  {"received_on", l.received_on},
                  {"expires_on", l.expires_on}};
    if (!l.supplier.isEmpty())
        o["supplier"] = l.supplier;
    if (!l.opened_on.isEmpty())
        o["opened_on"] = l.opened_on;
    if (l.quantity) {
        o["quantity"] = *l.quantity;
        o["quantity_unit"] = l.quantity_unit;
    }
    return o;
}

} // namespace

QStringList lot_schema_statements(sql::Dialect d) {
    QStringList s = {sql::render_ddl(
        d, "CREATE TABLE reagent_lots ("
           " id {rowid_pk},"
           " reagent TEXT NOT NULL CHECK (length(reagent) > 0),"
           " lot TEXT NOT NULL CHECK (length(lot) > 0),"
           " supplier TEXT NOT NULL DEFAULT '',"
           " received_on TEXT NOT NULL CHECK (length(received_on) = 10),"
           " opened_on TEXT NOT NULL DEFAULT '' CHECK (opened_on = '' OR length(opened_on) = 10),"
           " expires_on TEXT NOT NULL CHECK (length(expires_on) = 10),"
           " quantity {real} CHECK (quantity IS NULL OR quantity > 0),"
           " quantity_unit TEXT NOT NULL DEFAULT '' CHECK (quantity_unit IN ('', 'g', 'kg', 'mL', "
           "'L')),"
           " created_at TEXT NOT NULL,"
           " created_by TEXT NOT NULL CHECK (length(created_by) > 0),"
           " changed_at TEXT NOT NULL,"
           " UNIQUE (reagent, lot),"
           // ISO dates compare as text.
           " CHECK (opened_on = '' OR opened_on >= received_on),"
           " CHECK (expires_on > received_on))")};
    s << QStringLiteral("CREATE INDEX reagent_lots_reagent ON reagent_lots (reagent, expires_on)");
    const sql::Guard guards[] = {
        {"reagent_lots_no_delete", "reagent_lots", "DELETE", {}, "lots are never removed"},
        // Only the day of opening changes (LotStore::set_opened); the rest is as received.
        {"reagent_lots_fixed", "reagent_lots", "UPDATE",
         "NEW.reagent IS NOT OLD.reagent OR NEW.lot IS NOT OLD.lot"
         " OR NEW.supplier IS NOT OLD.supplier OR NEW.received_on IS NOT OLD.received_on"
         " OR NEW.expires_on IS NOT OLD.expires_on OR NEW.quantity IS NOT OLD.quantity"
         " OR NEW.quantity_unit IS NOT OLD.quantity_unit"
         " OR NEW.created_at IS NOT OLD.created_at OR NEW.created_by IS NOT OLD.created_by",
         "a lot on the shelf changes only by the day it is opened"},
    };
    for (const sql::Guard& g : guards)
        s << sql::guard_statements(d, g);
    return s;
}

void read_lot_quantity(const QString& text, ReagentLot& l) {
    if (text.trimmed().isEmpty()) {
        l.quantity.reset();
        l.quantity_unit.clear();
        return;
    }
    static const QRegularExpression form(
        QStringLiteral("^\\s*([0-9]+(?:[.,][0-9]+)?)\\s*([A-Za-z]+)\\s*$"));
    const QRegularExpressionMatch m = form.match(text);
    if (!m.hasMatch())
        throw chem::Error("quantity",
                          quoted(text) + " is not an amount with its unit, like 500 g or 2.5 L");
    QString number = m.captured(1);
    l.quantity = number.replace(QLatin1Char(','), QLatin1Char('.')).toDouble();
    l.quantity_unit = m.captured(2);
}

QString ReagentLot::words() const {
    QString s = QStringLiteral("%1 (expires %2").arg(lot, expires_on);
    if (!opened_on.isEmpty())
        s += QStringLiteral(", opened %1").arg(opened_on);
    return s + QLatin1Char(')');
}

void validate_lot(const ReagentLot& l) {
    if (l.reagent.trimmed().isEmpty())
        throw chem::Error("reagent", "is required: the library reagent the lot is of");
    if (l.reagent.size() > qsizetype(chem::guard::max_id_chars))
        throw chem::Error("reagent", quoted(l.reagent) + " is longer than 64 characters");
    if (l.lot.trimmed().isEmpty())
        throw chem::Error("lot", "is required: the lot number on the supplier's label");
    if (l.lot.size() > qsizetype(chem::guard::max_id_chars))
        throw chem::Error("lot", quoted(l.lot) + " is longer than 64 characters");
    for (const QChar ch : l.lot + l.supplier)
        if (ch.unicode() < 0x20 || ch.unicode() == 0x7f)
            throw chem::Error(l.lot.contains(ch) ? "lot" : "supplier",
                              "contains a control character");
    if (l.supplier.size() > 200)
        throw chem::Error("supplier", "is longer than 200 characters");
    chem::check_lot_dates(str(l.received_on), str(l.opened_on), str(l.expires_on));
    if (l.quantity) {
        if (!std::isfinite(*l.quantity) || *l.quantity <= 0 || *l.quantity > 1.0e6)
            throw chem::Error("quantity", chem::format_number(*l.quantity) +
                                              " is not an amount between 0 and 1000000");
        static const QStringList units = {"g", "kg", "mL", "L"};
        if (!units.contains(l.quantity_unit))
            throw chem::Error("quantity_unit",
                              quoted(l.quantity_unit) + " is not a unit of g, kg, mL or L");
    } else if (!l.quantity_unit.isEmpty()) {
        throw chem::Error("quantity", "is required with a unit (" + str(l.quantity_unit) + ")");
    }
}

LotStore::LotStore(QSqlDatabase db) : db_(db) {}

QString LotStore::now() const {
    return clock_ ? clock_() : sql::utc_now(db_);
}

ReagentLot LotStore::add(const ReagentLot& in, const QString& who) {
    if (who.trimmed().isEmpty())
        throw chem::Error("who", "is required: the shelf records who put each lot on it");
    ReagentLot l = in;
    l.reagent = l.reagent.trimmed();
    l.lot = l.lot.trimmed();
    l.supplier = l.supplier.trimmed();
    validate_lot(l);
    sql::WriteTransaction tx(db_);
    AccountStore::check_may_edit(db_, who.trimmed());
    const bool versioned = has_row_version(db_, QStringLiteral("reagent_lots"));
    if (versioned)
        refuse_taken(db_, lot_key(l.reagent, l.lot), QStringLiteral("lot of %1").arg(l.reagent),
                     l.lot, "lot");
    else if (const auto there = find(l.reagent, l.lot))
        throw chem::Error("lot", "lot " + quoted(l.lot) + " of " + quoted(l.reagent) +
                                     " is on the shelf already (received " +
                                     str(there->received_on) + ")");
    l.created_at = l.changed_at = now();
    l.created_by = who.trimmed();
    QVariantList values = {l.reagent,
                           l.lot,
                           l.supplier,
                           l.received_on,
                           l.opened_on,
                           l.expires_on,
                           l.quantity ? QVariant(*l.quantity)
                                      : QVariant(QMetaType(QMetaType::Double)),
                           l.quantity_unit,
                           l.created_at,
                           l.created_by,
                           l.changed_at};
    if (versioned)
        values << l.created_by;
    run(db_,
        QStringLiteral(
            "INSERT INTO reagent_lots (reagent, lot, supplier, received_on, opened_on, expires_on,"
            " quantity, quantity_unit, created_at, created_by, changed_at%1)"
            " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?%2)")
            .arg(versioned ? QStringLiteral(", changed_by") : QString(),
                 versioned ? QStringLiteral(", ?") : QString()),
        values);
    QJsonObject changes;
    const QJsonObject fields = lot_fields(l);
    for (auto it = fields.begin(); it != fields.end(); ++it)
        changes.insert(it.key(), QJsonObject{{"old", QJsonValue::Null}, {"new", it.value()}});
    append_audit(db_, l.created_at, l.created_by, "add-lot", "lot", record_id(l), {}, changes);
    tx.commit();
    return *find(l.reagent, l.lot);
}

ReagentLot LotStore::set_opened(const QString& reagent, const QString& lot,
                                const QString& opened_on, const QString& who,
                                qint64 expected_version) {
    if (who.trimmed().isEmpty())
        throw chem::Error("who", "is required: the shelf records who changed each lot");
    sql::WriteTransaction tx(db_);
    AccountStore::check_may_edit(db_, who.trimmed());
    const std::optional<ReagentLot> cur = find(reagent.trimmed(), lot.trimmed());
    if (!cur)
        throw chem::Error("lot",
                          "no lot " + quoted(lot) + " of " + quoted(reagent) + " on the shelf");
    const bool versioned = cur->version > 0;
    const bool checked = versioned && expected_version > 0;
    if (checked && cur->version != expected_version)
        throw conflict_error(db_, lot_words(cur->reagent, cur->lot),
                             {cur->version, cur->changed_by, cur->changed_at});
    ReagentLot next = *cur;
    next.opened_on = opened_on.trimmed();
    validate_lot(next);
    if (next.opened_on == cur->opened_on)
        return *cur;
    next.changed_at = now();
    if (versioned) {
        next.version = update_checked(
            db_, lot_key(cur->reagent, cur->lot), QStringLiteral("opened_on = ?"), {next.opened_on},
            cur->version, who.trimmed(), next.changed_at, lot_words(cur->reagent, cur->lot));
        next.changed_by = who.trimmed();
    } else {
        run(db_, "UPDATE reagent_lots SET opened_on = ?, changed_at = ? WHERE id = ?",
            {next.opened_on, next.changed_at, cur->id});
    }
    append_audit(db_, next.changed_at, who.trimmed(), "open-lot", "lot", record_id(next), {},
                 audit_change("opened_on",
                              cur->opened_on.isEmpty() ? QJsonValue(QJsonValue::Null)
                                                       : QJsonValue(cur->opened_on),
                              next.opened_on.isEmpty() ? QJsonValue(QJsonValue::Null)
                                                       : QJsonValue(next.opened_on)));
    tx.commit();
    return next;
}

std::vector<ReagentLot> LotStore::list(const QString& reagent) const {
    QSqlQuery q =
        reagent.isEmpty()
            ? run(db_, QStringLiteral("SELECT %1 FROM reagent_lots ORDER BY reagent, expires_on, "
                                      "lot LIMIT 5000")
                           .arg(columns_of(db_)))
            : run(db_,
                  QStringLiteral("SELECT %1 FROM reagent_lots WHERE reagent = ?"
                                 " ORDER BY expires_on, lot LIMIT 5000")
                      .arg(columns_of(db_)),
                  {reagent});
    std::vector<ReagentLot> out;
    while (q.next())
        out.push_back(lot_from(q));
    return out;
}

std::optional<ReagentLot> LotStore::find(const QString& reagent, const QString& lot) const {
    QSqlQuery q = run(db_,
                      QStringLiteral("SELECT %1 FROM reagent_lots WHERE reagent = ? AND lot = ?")
                          .arg(columns_of(db_)),
                      {reagent, lot});
    if (!q.next())
        return std::nullopt;
    return lot_from(q);
}

AuditVerification verify_lots(QSqlDatabase db) {
    AuditVerification v;
    if (!sql::table_exists(db, QStringLiteral("reagent_lots")))
        return v;
    std::map<QString, QJsonObject> replayed;
    std::map<QString, qint64> last_seq;
    for (const AuditEntry& e : audit_entries(db, {QStringLiteral("lot"), {}})) {
        ++v.entries;
        if (e.action == QLatin1String("add-lot"))
            replayed[e.record_id] = {};
        else if (!replayed.count(e.record_id))
            return v.broken_at(e.seq, QStringLiteral("entry %1 changes lot \"%2\" before any "
                                                     "entry puts it on the shelf")
                                          .arg(e.seq)
                                          .arg(e.record_id.left(130)));
        last_seq[e.record_id] = e.seq;
        QJsonObject& fields = replayed[e.record_id];
        const QJsonObject c = QJsonDocument::fromJson(e.changes.toUtf8()).object();
        for (auto it = c.begin(); it != c.end(); ++it) {
            const QJsonValue nv = it.value().toObject().value(QLatin1String("new"));
            if (nv.isNull() || nv.isUndefined())
                fields.remove(it.key());
            else
                fields[it.key()] = nv;
        }
    }
    QSqlQuery q = run(
        db,
        QStringLiteral("SELECT %1 FROM reagent_lots ORDER BY id").arg(QLatin1String(lot_columns)));
    std::set<QString> seen;
    while (q.next()) {
        const ReagentLot l = lot_from(q);
        const QString id = record_id(l);
        seen.insert(id);
        if (!replayed.count(id))
            return v.broken_at(v.entries + 1,
                               QStringLiteral("lot \"%1\" is on the shelf without an entry that "
                                              "puts it there")
                                   .arg(id.left(130)));
        const QJsonObject now = lot_fields(l);
        const QJsonObject& trail = replayed[id];
        QStringList differs;
        for (auto it = now.begin(); it != now.end(); ++it)
            if (trail.value(it.key()) != it.value())
                differs << it.key();
        for (auto it = trail.begin(); it != trail.end(); ++it)
            if (!now.contains(it.key()))
                differs << it.key();
        if (!differs.isEmpty())
            return v.broken_at(last_seq[id],
                               QStringLiteral("lot \"%1\" differs from its trail (last entry %2) "
                                              "in %3")
                                   .arg(id.left(130))
                                   .arg(last_seq[id])
                                   .arg(differs.join(QStringLiteral(", "))));
    }
    for (const auto& [id, fields] : replayed)
        if (!seen.count(id))
            return v.broken_at(last_seq[id],
                               QStringLiteral("entry %1 puts lot \"%2\" on the shelf, which does "
                                              "not hold it")
                                   .arg(last_seq[id])
                                   .arg(id.left(130)));
    return v;
}

QString preparation_day(const BatchRecord& b) {
    if (b.prepared_at.size() >= 10)
        return b.prepared_at.left(10);
    return QDate::currentDate().toString(Qt::ISODate);
}

void resolve_batch_lots(QSqlDatabase db, const BatchRecord* current, BatchRecord& next,
                        const LotOverrideGrant* grant) {
    if (!sql::table_exists(db, QStringLiteral("reagent_lots")))
        return;
    const LotStore shelf(db);
    bool granted = false;
    for (int i = 0; i < next.actual.size(); ++i) {
        QJsonObject e = next.actual[i].toObject();
        const QString reagent = e.value("reagent").toString();
        const QString lot = e.value("lot").toString().trimmed();
        e.remove("lot_expires_on");
        e.remove("lot_override");
        const std::string at = "batch.actual[" + std::to_string(i) + "].lot";
        if (!lot.isEmpty()) {
            e["lot"] = lot;
            QJsonObject before;
            if (current)
                for (const QJsonValue& v : current->actual)
                    if (v.toObject().value("reagent").toString() == reagent)
                        before = v.toObject();
            if (!before.isEmpty() && before.value("lot").toString() == lot) {
                for (const char* k : {"lot_expires_on", "lot_override"})
                    if (before.contains(k))
                        e[k] = before.value(k);
            } else if (const auto found = shelf.find(reagent, lot)) {
                e["lot_expires_on"] = found->expires_on;
            } else {
                // The shelf's reagent id may carry a "buffer." prefix in a line's amounts.
                const QString id = reagent.startsWith("buffer.") ? reagent.mid(7) : reagent;
                const auto alt = id != reagent ? shelf.find(id, lot) : std::nullopt;
                if (alt) {
                    e["lot_expires_on"] = alt->expires_on;
                } else {
                    const std::vector<ReagentLot> there = shelf.list(id);
                    if (!there.empty()) {
                        QStringList numbers;
                        for (const ReagentLot& l : there)
                            numbers << l.lot;
                        throw chem::Error(at, "lot " + quoted(lot) +
                                                  " is not on the shelf: pick one of its lots (" +
                                                  str(numbers.mid(0, 8).join(", ")) +
                                                  (numbers.size() > 8 ? ", …" : "") +
                                                  "), or put the lot on the shelf first");
                    }
                }
            }
            if (grant && grant->reagent == reagent && grant->lot == lot) {
                const QString day = preparation_day(next);
                const QString expires = e.value("lot_expires_on").toString();
                if (expires.isEmpty())
                    throw chem::Error("lot_override",
                                      "lot " + quoted(lot) +
                                          " is not on the shelf, so its expiry is not known: "
                                          "there is nothing to override");
                if (!(expires < day))
                    throw chem::Error("lot_override", "lot " + quoted(lot) + " expires on " +
                                                          str(expires) +
                                                          " and the batch is prepared on " +
                                                          str(day) + ": no override is needed");
                e["lot_override"] = QJsonObject{{"by", grant->by},
                                                {"name", grant->name},
                                                {"at", grant->at},
                                                {"reason", grant->reason}};
                granted = true;
            }
        }
        next.actual[i] = e;
    }
    if (grant && !granted)
        throw chem::Error("lot_override", "the batch has no amount with lot " + quoted(grant->lot) +
                                              " of " + quoted(grant->reagent) +
                                              ": enter the amount first, then override");
}

} // namespace phaseplan::storage
