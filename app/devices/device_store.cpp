#include "devices/device_store.h"

#include "chem/finding_text.h"
#include "core/date_time.h"
#include "core/json_util.h"
#include "core/line_commands.h"

#include <QJsonArray>
#include <QSqlQuery>
#include <QSqlRecord>

namespace phaseplan::devices {

const char* kind_name(DeviceKind kind) {
    return kind == DeviceKind::balance ? "balance" : "ph_meter";
}

Expectation DeviceRecord::expectation() const {
    Expectation e;
    e.quantity = kind == DeviceKind::balance ? Quantity::mass : Quantity::ph;
    e.unit = unit;
    return e;
}

QJsonObject DeviceRecord::to_json() const {
    QJsonObject o{{"id", id},
                  {"name", name},
                  {"kind", QLatin1String(kind_name(kind))},
                  {"port", port.port},
                  {"baud", port.baud},
                  {"data_bits", port.data_bits},
                  {"parity", port.parity},
                  {"stop_bits", port.stop_bits},
                  {"flow_control", port.flow_control},
                  {"format", format},
                  {"unit", unit}};
    o["calibration_due"] = calibration_due.isValid()
                               ? QJsonValue(calibration_due.toString(Qt::ISODate))
                               : QJsonValue(QJsonValue::Null);
    return o;
}

DeviceRecord DeviceRecord::from_json(const QJsonObject& o, const std::string& at,
                                     const FormatLibrary* formats) {
    json::reject_near_misses(o,
                             {"id", "name", "kind", "port", "baud", "data_bits", "parity",
                              "stop_bits", "flow_control", "format", "unit", "calibration_due"},
                             at);
    DeviceRecord d;
    d.id = QString::fromStdString(json::require_string(o, QStringLiteral("id"), at)).trimmed();
    if (d.id.isEmpty())
        throw chem::Error(json::path(at, QStringLiteral("id")), "an instrument needs an id");
    d.name =
        QString::fromStdString(json::optional_string(o, QStringLiteral("name"), at).value_or(""));
    const std::string kind = json::require_string(o, QStringLiteral("kind"), at);
    if (kind == "balance")
        d.kind = DeviceKind::balance;
    else if (kind == "ph_meter")
        d.kind = DeviceKind::ph_meter;
    else
        throw chem::Error(json::path(at, QStringLiteral("kind")),
                          "\"" + kind + "\" is not balance or ph_meter");
    d.port.port = QString::fromStdString(json::require_string(o, QStringLiteral("port"), at));
    if (o.contains(QLatin1String("baud")))
        d.port.baud = json::require_int(o, QStringLiteral("baud"), at, 50, 4000000);
    if (o.contains(QLatin1String("data_bits")))
        d.port.data_bits = json::require_int(o, QStringLiteral("data_bits"), at, 5, 8);
    if (auto p = json::optional_string(o, QStringLiteral("parity"), at))
        d.port.parity = QString::fromStdString(*p);
    if (o.value(QLatin1String("stop_bits")).isDouble())
        d.port.stop_bits = QString::fromStdString(
            chem::format_number(o.value(QLatin1String("stop_bits")).toDouble()));
    else if (auto s = json::optional_string(o, QStringLiteral("stop_bits"), at))
        d.port.stop_bits = QString::fromStdString(*s);
    if (auto f = json::optional_string(o, QStringLiteral("flow_control"), at))
        d.port.flow_control = QString::fromStdString(*f);
    d.port.validate(at);
    d.format = QString::fromStdString(json::require_string(o, QStringLiteral("format"), at));
    if (formats) {
        try {
            (void)resolve_format(*formats, d.format);
        } catch (const chem::Error& e) {
            throw chem::Error(json::path(at, QStringLiteral("format")), e.message());
        }
    }
    d.unit = QString::fromStdString(json::optional_string(o, QStringLiteral("unit"), at)
                                        .value_or(d.kind == DeviceKind::balance ? "g" : "pH"));
    const QStringList units =
        d.kind == DeviceKind::balance ? QStringList{"g", "mg", "kg"} : QStringList{"pH"};
    if (!units.contains(d.unit))
        throw chem::Error(json::path(at, QStringLiteral("unit")),
                          "\"" + d.unit.toStdString() + "\" is not a unit a " + kind + " sends (" +
                              units.join(QStringLiteral(", ")).toStdString() + ")");
    const QJsonValue due = o.value(QLatin1String("calibration_due"));
    if (due.isString()) {
        d.calibration_due = QDate::fromString(due.toString(), Qt::ISODate);
        if (!d.calibration_due.isValid())
            throw chem::Error(json::path(at, QStringLiteral("calibration_due")),
                              "\"" + due.toString().toStdString() +
                                  "\" is not a date (YYYY-MM-DD)");
    } else if (!due.isUndefined() && !due.isNull()) {
        throw chem::Error(json::path(at, QStringLiteral("calibration_due")),
                          json::describe(due) + " is not a date (YYYY-MM-DD)");
    }
    return d;
}

std::optional<chem::Finding> calibration_finding(const DeviceRecord& device, const QDate& today) {
    if (!device.calibration_due.isValid() || device.calibration_due > today)
        return std::nullopt;
    chem::Finding f;
    f.kind = chem::FindingKind::device_calibration_due;
    f.severity = chem::Severity::caution;
    f.subject = chem::Subject::of_device(device.id.toStdString());
    f.text("device", device.id.toStdString());
    f.text("calibration_due", device.calibration_due.toString(Qt::ISODate).toStdString());
    f.detail_text("device_kind", kind_name(device.kind));
    return f;
}

std::optional<QJsonObject> calibration_caution(const DeviceRecord& device, const QDate& today) {
    const auto f = calibration_finding(device, today);
    if (!f)
        return std::nullopt;
    return finding_to_json(*f, chem::RenderContext{}, nullptr);
}

std::vector<DeviceRecord> devices_from_json(const QByteArray& bytes, const std::string& origin,
                                            const FormatLibrary* formats) {
    try {
        const QJsonObject root = json::parse_document(bytes);
        const QJsonArray arr = json::require_array(root, QStringLiteral("devices"), "");
        std::vector<DeviceRecord> out;
        for (int i = 0; i < arr.size(); ++i) {
            const std::string at = json::path("devices", i);
            DeviceRecord d =
                DeviceRecord::from_json(json::element_object(arr, i, "devices"), at, formats);
            for (const DeviceRecord& e : out)
                if (e.id == d.id)
                    throw chem::Error(at + ".id", "\"" + d.id.toStdString() + "\" is given twice");
            out.push_back(std::move(d));
        }
        return out;
    } catch (const chem::Error& e) {
        throw chem::Error(origin + ": " + e.field(), e.message());
    }
}

// ---- DeviceStore ------------------------------------------------------------------------------

namespace {

DeviceRecord from_row(const QSqlQuery& q) {
    DeviceRecord d;
    d.id = q.value(0).toString();
    d.name = q.value(1).toString();
    d.kind = q.value(2).toString() == QLatin1String("balance") ? DeviceKind::balance
                                                               : DeviceKind::ph_meter;
    d.port.port = q.value(3).toString();
    d.port.baud = q.value(4).toInt();
    d.port.data_bits = q.value(5).toInt();
    d.port.parity = q.value(6).toString();
    d.port.stop_bits = q.value(7).toString();
    d.port.flow_control = q.value(8).toString();
    d.format = q.value(9).toString();
    d.unit = q.value(10).toString();
    if (!q.value(11).isNull())
        d.calibration_due = QDate::fromString(q.value(11).toString(), Qt::ISODate);
    if (q.record().count() > 12) {
        d.version = q.value(12).toLongLong();
        d.changed_by = q.value(13).toString();
        d.changed_at = q.value(14).toString();
    }
    return d;
}

const char* plain_columns =
    "id, name, kind, port, baud, data_bits, parity, stop_bits, flow_control, line_format,"
    " unit, calibration_due";
const char* versioned_columns =
    "id, name, kind, port, baud, data_bits, parity, stop_bits, flow_control, line_format,"
    " unit, calibration_due, version, changed_by, changed_at";

/// The columns read back: with the version once the schema has it.
QLatin1String columns(const storage::Database& db) {
    return QLatin1String(db.rows_versioned() ? versioned_columns : plain_columns);
}

storage::RowKey device_key(const QString& id) {
    return {QStringLiteral("devices"), {QStringLiteral("id")}, {id}};
}

QString device_words(const QString& id) {
    return QStringLiteral("Instrument \"%1\"").arg(id);
}

QVariantList device_values(const DeviceRecord& d) {
    return {d.name,
            QLatin1String(kind_name(d.kind)),
            d.port.port,
            d.port.baud,
            d.port.data_bits,
            d.port.parity,
            d.port.stop_bits,
            d.port.flow_control,
            d.format,
            d.unit,
            d.calibration_due.isValid() ? QVariant(d.calibration_due.toString(Qt::ISODate))
                                        : QVariant()};
}

} // namespace

void DeviceStore::upsert(const DeviceRecord& d) {
    if (d.id.trimmed().isEmpty())
        throw chem::Error("id", "an instrument needs an id");
    d.port.validate();
    const QString now = storage::sql::utc_now(db_.connection());
    const bool v = db_.rows_versioned();
    QVariantList values = QVariantList{d.id.trimmed()} + device_values(d);
    values << now << now;
    if (v)
        values << db_.actor() << now;
    db_.exec(QStringLiteral(
                 "INSERT INTO devices (%1, created_at, updated_at%2)"
                 " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?%3)"
                 " ON CONFLICT (id) DO UPDATE SET name = excluded.name, kind = excluded.kind,"
                 " port = excluded.port, baud = excluded.baud, data_bits = excluded.data_bits,"
                 " parity = excluded.parity, stop_bits = excluded.stop_bits,"
                 " flow_control = excluded.flow_control, line_format = excluded.line_format,"
                 " unit = excluded.unit, calibration_due = excluded.calibration_due,"
                 " updated_at = excluded.updated_at%4")
                 .arg(QLatin1String(plain_columns),
                      v ? QStringLiteral(", version, changed_by, changed_at") : QString(),
                      v ? QStringLiteral(", 1, ?, ?") : QString(),
                      v ? QStringLiteral(", version = devices.version + 1,"
                                         " changed_by = excluded.changed_by,"
                                         " changed_at = excluded.changed_at")
                        : QString()),
             values);
}

qint64 DeviceStore::save_checked(const DeviceRecord& device) {
    const QString id = device.id.trimmed();
    if (id.isEmpty())
        throw chem::Error("id", "an instrument needs an id");
    device.port.validate();
    if (!db_.rows_versioned()) {
        save(device);
        return 0;
    }
    storage::Database::Transaction t(db_);
    const QString now = storage::sql::utc_now(db_.connection());
    qint64 stored = 1;
    if (device.version <= 0) {
        storage::refuse_taken(db_.connection(), device_key(id), QStringLiteral("instrument"), id,
                              "id");
        upsert(device);
    } else {
        stored = storage::update_checked(
            db_.connection(), device_key(id),
            QStringLiteral("name = ?, kind = ?, port = ?, baud = ?, data_bits = ?, parity = ?,"
                           " stop_bits = ?, flow_control = ?, line_format = ?, unit = ?,"
                           " calibration_due = ?, updated_at = ?"),
            device_values(device) << now, device.version, db_.actor(), now, device_words(id));
    }
    t.commit();
    return stored;
}

void DeviceStore::save(const DeviceRecord& device) {
    storage::Database::Transaction t(db_);
    upsert(device);
    t.commit();
}

int DeviceStore::import_json(const QByteArray& bytes, const std::string& origin,
                             const FormatLibrary* formats) {
    const std::vector<DeviceRecord> all = devices_from_json(bytes, origin, formats);
    storage::Database::Transaction t(db_);
    for (const DeviceRecord& d : all)
        upsert(d);
    t.commit();
    return static_cast<int>(all.size());
}

std::optional<DeviceRecord> DeviceStore::load(const QString& id) const {
    QSqlQuery q = db_.exec(QStringLiteral("SELECT %1 FROM devices WHERE id = ?").arg(columns(db_)),
                           {id.trimmed()});
    if (!q.next())
        return std::nullopt;
    return from_row(q);
}

std::vector<DeviceRecord> DeviceStore::list() const {
    QSqlQuery q = db_.exec(QStringLiteral("SELECT %1 FROM devices ORDER BY id").arg(columns(db_)));
    std::vector<DeviceRecord> out;
    while (q.next())
        out.push_back(from_row(q));
    return out;
}

std::vector<DeviceRecord> DeviceStore::list(DeviceKind kind) const {
    std::vector<DeviceRecord> out;
    for (DeviceRecord& d : list())
        if (d.kind == kind)
            out.push_back(std::move(d));
    return out;
}

bool DeviceStore::remove(const QString& id, qint64 expected_version) {
    storage::Database::Transaction t(db_);
    bool removed = true;
    if (expected_version > 0 && db_.rows_versioned()) {
        storage::delete_checked(db_.connection(), device_key(id.trimmed()), expected_version,
                                device_words(id.trimmed()));
    } else {
        QSqlQuery q = db_.exec(QStringLiteral("DELETE FROM devices WHERE id = ?"), {id.trimmed()});
        removed = q.numRowsAffected() > 0;
    }
    t.commit();
    return removed;
}

} // namespace phaseplan::devices
