#include "column_library.h"

#include "chem/error.h"
#include "core/date_time.h"
#include "core/failure.h"
#include "core/line_commands.h"
#include "core/pressure_commands.h"
#include "field_path.h"
#include "workspace.h"

#include <QJsonDocument>
#include <QLocale>
#include <QSqlQuery>
#include <QSqlRecord>

#include <cmath>
#include <limits>

namespace phaseplan::gui {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

/// A number as the screens show it: the locale's decimal mark, never a group separator (a "1,000
/// bar" would read as 1 bar where "," is the decimal mark).
QString num(double v) {
    QLocale l;
    l.setNumberOptions(QLocale::OmitGroupSeparator);
    return l.toString(v, 'g', 6);
}

/// The column fields as the form calls them, for a check's path ("column.particle_um" →
/// "particle_um").
std::string strip_column(const std::string& field) {
    static const std::string prefix = "column.";
    return field.rfind(prefix, 0) == 0 ? field.substr(prefix.size()) : field;
}

ColumnRecord record_from_row(const QSqlQuery& q) {
    ColumnRecord c;
    c.id = q.value(0).toLongLong();
    c.name = q.value(1).toString();
    c.document = QJsonDocument::fromJson(q.value(2).toString().toUtf8()).object();
    c.document.insert("name", c.name);
    if (q.record().count() > 6) {
        c.version = q.value(4).toLongLong();
        c.changed_by = q.value(5).toString();
        c.changed_at = q.value(6).toString();
    }
    return c;
}

storage::RowKey column_key(qint64 id) {
    return {QStringLiteral("columns"), {QStringLiteral("id")}, {id}};
}

} // namespace

void validate_column_document(const QJsonObject& column) {
    const QJsonValue n = column.value("name");
    const QString name = n.toString().trimmed();
    if (!n.isString() || name.isEmpty())
        throw chem::Error("name", "a column needs a name");
    if (name.size() > storage::max_name_chars)
        throw chem::Error("name", "a name of " + std::to_string(name.size()) +
                                      " characters is longer than the " +
                                      std::to_string(storage::max_name_chars) + " kept");
    static const std::pair<const char*, const char*> dims[] = {
        {"length_mm", "the length (mm)"},
        {"id_mm", "the inner diameter (mm)"},
        {"particle_um", "the particle size (µm)"}};
    for (const auto& [key, what] : dims)
        if (!column.contains(key) || column.value(key).isNull())
            throw chem::Error(key, std::string("a column needs ") + what);
    const QJsonObject wrap{{"column", column}};
    try {
        (void)pressure_column_from_json(wrap, "column", "");
        (void)column_from_json(wrap, "");
    } catch (const chem::Error& e) {
        throw chem::Error(strip_column(e.field()), e.message());
    }
}

QString column_summary(const QJsonObject& c) {
    QString s = QStringLiteral("%1 × %2 mm, %3 µm")
                    .arg(num(c.value("length_mm").toDouble()), num(c.value("id_mm").toDouble()),
                         num(c.value("particle_um").toDouble()));
    if (c.contains("max_pressure_bar"))
        s += QObject::tr(", up to %1 bar").arg(num(c.value("max_pressure_bar").toDouble()));
    if (c.contains("ph_min") && c.contains("ph_max"))
        s += QObject::tr(", pH %1–%2")
                 .arg(num(c.value("ph_min").toDouble()), num(c.value("ph_max").toDouble()));
    const QJsonObject r = c.value("reference").toObject();
    if (!r.isEmpty())
        s += QObject::tr(", measured %1 bar at %2 mL/min")
                 .arg(num(r.value("pressure_bar").toDouble()),
                      num(r.value("flow_ml_min").toDouble()));
    return s;
}

// ---- ColumnStore --------------------------------------------------------------------------------

qint64 ColumnStore::save(const ColumnRecord& in) {
    QJsonObject doc = in.document;
    const QString name = (in.name.isEmpty() ? doc.value("name").toString() : in.name).trimmed();
    doc.insert("name", name);
    validate_column_document(doc);
    const bool v = db_.rows_versioned();
    storage::Database::Transaction t(db_);
    QSqlQuery taken = db_.exec(QStringLiteral("SELECT id FROM columns WHERE name = ? AND id <> ?"),
                               {name, in.id});
    if (taken.next()) {
        if (!v)
            throw chem::Error("name", "“" + name.toStdString() + "” is the name of another column");
        throw storage::name_taken_error(
            db_.connection(), QStringLiteral("column"), name,
            storage::row_stamp(db_.connection(), column_key(taken.value(0).toLongLong())));
    }
    const QString text = QString::fromUtf8(QJsonDocument(doc).toJson(QJsonDocument::Compact));
    const QString now = storage::sql::utc_now(db_.connection());
    qint64 id = in.id;
    if (id > 0 && v && in.version > 0) {
        storage::update_checked(db_.connection(), column_key(id),
                                QStringLiteral("name = ?, document = ?, updated_at = ?"),
                                {name, text, now}, in.version, db_.actor(), now,
                                QStringLiteral("Column \"%1\"").arg(name));
    } else if (id > 0) {
        QSqlQuery q =
            v ? db_.exec(QStringLiteral("UPDATE columns SET name = ?, document = ?, updated_at = ?,"
                                        " version = version + 1, changed_by = ?, changed_at = ?"
                                        " WHERE id = ?"),
                         {name, text, now, db_.actor(), now, id})
              : db_.exec(
                    QStringLiteral(
                        "UPDATE columns SET name = ?, document = ?, updated_at = ? WHERE id = ?"),
                    {name, text, now, id});
        if (q.numRowsAffected() == 0)
            throw chem::Error("id", "the column was removed meanwhile");
    } else {
        v ? db_.exec(QStringLiteral("INSERT INTO columns (name, document, created_at, updated_at,"
                                    " version, changed_by, changed_at)"
                                    " VALUES (?, ?, ?, ?, 1, ?, ?)"),
                     {name, text, now, now, db_.actor(), now})
          : db_.exec(QStringLiteral("INSERT INTO columns (name, document, created_at, "
                                    "updated_at) VALUES (?, ?, ?, ?)"),
                     {name, text, now, now});
        // The id by the name (unique): lastInsertId is not given by every driver (QPSQL).
        QSqlQuery back = db_.exec(QStringLiteral("SELECT id FROM columns WHERE name = ?"), {name});
        id = back.next() ? back.value(0).toLongLong() : 0;
    }
    t.commit();
    return id;
}

bool ColumnStore::remove(qint64 id, qint64 expected_version) {
    storage::Database::Transaction t(db_);
    bool removed = true;
    if (expected_version > 0 && db_.rows_versioned()) {
        const std::optional<ColumnRecord> c = load(id);
        storage::delete_checked(
            db_.connection(), column_key(id), expected_version,
            QStringLiteral("Column \"%1\"").arg(c ? c->name : QString::number(id)));
    } else {
        QSqlQuery q = db_.exec(QStringLiteral("DELETE FROM columns WHERE id = ?"), {id});
        removed = q.numRowsAffected() > 0;
    }
    t.commit();
    return removed;
}

std::vector<ColumnRecord> ColumnStore::list() const {
    skipped_.clear();
    std::vector<ColumnRecord> out;
    QSqlQuery q =
        db_.exec(QStringLiteral("SELECT id, name, document, length(name)%1 FROM columns"
                                " ORDER BY lower(name), id")
                     .arg(db_.rows_versioned() ? QStringLiteral(", version, changed_by, changed_at")
                                               : QString()));
    while (q.next()) {
        const QString name = q.value(1).toString();
        QString why;
        if (q.value(3).toLongLong() > storage::max_name_chars)
            why = QObject::tr("a name of %1 characters (limit %2)")
                      .arg(q.value(3).toString(), QString::number(storage::max_name_chars));
        else
            why = storage::oversize_reason(q.value(2).toString());
        ColumnRecord c;
        if (why.isEmpty()) {
            c = record_from_row(q);
            try {
                validate_column_document(c.document);
            } catch (const chem::Error& e) {
                why = QString::fromStdString(e.field() + ": " + e.message());
            }
        }
        if (!why.isEmpty()) {
            skipped_ << QStringLiteral("“%1”: %2").arg(name.left(80), why);
            continue;
        }
        out.push_back(std::move(c));
    }
    return out;
}

std::optional<ColumnRecord> ColumnStore::load(qint64 id) const {
    for (ColumnRecord& c : list())
        if (c.id == id)
            return std::move(c);
    return std::nullopt;
}

std::optional<ColumnRecord> ColumnStore::find(const QString& name) const {
    for (ColumnRecord& c : list())
        if (c.name == name.trimmed())
            return std::move(c);
    return std::nullopt;
}

void seed_demo_columns(storage::Database& db) {
    ColumnStore store(db);
    // Invented columns of the demo lab; the first is the one the demo plan runs on, under the
    // same name as in data/demo/overnight-sequence.json.
    store.save({0, QStringLiteral("C18, 150 x 4.6 mm, 3.5 um (invented demo column)"),
                QJsonObject{{"length_mm", 150},
                            {"id_mm", 4.6},
                            {"particle_um", 3.5},
                            {"max_pressure_bar", 400},
                            {"ph_min", 2.0},
                            {"ph_max", 8.0}}});
    store.save({0, QStringLiteral("C18, 50 x 2.1 mm, 1.7 um (invented demo column)"),
                QJsonObject{{"length_mm", 50},
                            {"id_mm", 2.1},
                            {"particle_um", 1.7},
                            {"max_pressure_bar", 1000},
                            {"ph_min", 2.0},
                            {"ph_max", 8.0}}});
}

// ---- ColumnLibrary ------------------------------------------------------------------------------

ColumnLibrary::ColumnLibrary(QObject* parent) : QObject(parent) {}

void ColumnLibrary::setWorkspace(Workspace* w) {
    if (workspace_ == w)
        return;
    if (workspace_)
        disconnect(workspace_, nullptr, this, nullptr);
    workspace_ = w;
    if (workspace_) {
        connect(workspace_, &Workspace::readyChanged, this, &ColumnLibrary::reload);
        connect(workspace_, &Workspace::columnsChanged, this, &ColumnLibrary::reload);
        // Another bench's change: the list is re-read and changes only when the rows differ.
        connect(workspace_, &Workspace::databaseChanged, this, &ColumnLibrary::reload);
    }
    emit workspaceChanged();
    reload();
}

QStringList ColumnLibrary::names() const {
    QStringList out;
    for (const QVariant& v : columns_)
        out << v.toMap().value("name").toString();
    return out;
}

void ColumnLibrary::reload() {
    QVariantList list;
    QString skipped;
    if (workspace_ && workspace_->database()) {
        ColumnStore store(*workspace_->database());
        const FieldError err = guarded([&] {
            for (const ColumnRecord& c : store.list()) {
                const QJsonObject d = c.document;
                const QJsonObject r = d.value("reference").toObject();
                auto opt = [](const QJsonObject& o, const char* k) {
                    return o.contains(k) ? o.value(k).toDouble() : nan;
                };
                list.append(QVariantMap{{"id", c.id},
                                        {"version", c.version},
                                        {"changedBy", c.changed_by},
                                        {"changedAt", c.changed_at},
                                        {"name", c.name},
                                        {"summary", column_summary(d)},
                                        {"document", d.toVariantMap()},
                                        {"length_mm", opt(d, "length_mm")},
                                        {"id_mm", opt(d, "id_mm")},
                                        {"particle_um", opt(d, "particle_um")},
                                        {"porosity", opt(d, "porosity")},
                                        {"max_pressure_bar", opt(d, "max_pressure_bar")},
                                        {"ph_min", opt(d, "ph_min")},
                                        {"ph_max", opt(d, "ph_max")},
                                        {"temperature_c", opt(d, "temperature_c")},
                                        {"reference_pressure_bar", opt(r, "pressure_bar")},
                                        {"reference_flow_ml_min", opt(r, "flow_ml_min")},
                                        {"reference_percent_b", opt(r, "B")},
                                        {"reference_temperature_c", opt(r, "temperature_c")}});
            }
            if (!store.skipped().isEmpty())
                skipped = tr("Not shown, cannot be read: %1.").arg(store.skipped().join("; "));
        });
        if (!err.empty())
            skipped = err.message;
    }
    if (list != columns_ || skipped != skipped_) {
        columns_ = list;
        skipped_ = skipped;
        emit columnsChanged();
    }
}

QVariantMap ColumnLibrary::documentFromDraft(const QVariantMap& draft) const {
    QJsonObject d;
    d.insert("name", draft.value("name").toString().trimmed());
    auto put = [&](QJsonObject& o, const char* key, const char* from) {
        const QVariant v = draft.value(QLatin1String(from));
        if (!v.isValid() || v.isNull())
            return;
        const double x = v.toDouble();
        if (!std::isnan(x))
            o.insert(key, x);
    };
    for (const char* k : {"length_mm", "id_mm", "particle_um", "porosity", "max_pressure_bar",
                          "ph_min", "ph_max", "temperature_c"})
        put(d, k, k);
    QJsonObject r;
    put(r, "pressure_bar", "reference_pressure_bar");
    put(r, "flow_ml_min", "reference_flow_ml_min");
    put(r, "temperature_c", "reference_temperature_c");
    const double b = draft.value("reference_percent_b", nan).toDouble();
    if (!r.isEmpty() || (!std::isnan(b) && draft.contains("reference_percent_b") &&
                         !draft.value("reference_percent_b").isNull())) {
        const double pb = std::isnan(b) ? 0.0 : b;
        r.insert("A", 100.0 - pb);
        r.insert("B", pb);
        d.insert("reference", r);
    }
    return d.toVariantMap();
}

QVariantMap ColumnLibrary::all_errors(QJsonObject doc) const {
    // Good values put in place of a faulty one, so that the next check reaches the next field.
    static const std::pair<const char*, double> good[] = {
        {"length_mm", 150},        {"id_mm", 4.6}, {"particle_um", 5}, {"porosity", 0.4},
        {"max_pressure_bar", 400}, {"ph_min", 2},  {"ph_max", 12},     {"temperature_c", 30}};
    QVariantMap errors;
    for (int round = 0; round < 16; ++round) {
        const FieldError e = guarded([&] { validate_column_document(doc); });
        if (e.empty() || errors.contains(e.field))
            break;
        errors.insert(e.field, e.message);
        bool replaced = false;
        if (e.field == "name") {
            doc.insert("name", "column");
            replaced = true;
        }
        for (const auto& [key, value] : good)
            if (e.field == QLatin1String(key)) {
                doc.insert(key, value);
                if (e.field == "ph_max")
                    doc.insert("ph_min", std::min(doc.value("ph_min").toDouble(), 2.0));
                replaced = true;
            }
        if (FieldPath::belongs(e.field, QStringLiteral("reference"))) {
            QJsonObject r = doc.value("reference").toObject();
            const QString sub = e.field.mid(QStringLiteral("reference.").size());
            if (sub == "pressure_bar")
                r.insert("pressure_bar", 100);
            else if (sub == "flow_ml_min")
                r.insert("flow_ml_min", 1.0);
            else if (sub == "temperature_c")
                r.insert("temperature_c", 30);
            else
                r.insert("A", 50), r.insert("B", 50);
            doc.insert("reference", r);
            replaced = true;
        }
        if (!replaced)
            break;
    }
    return errors;
}

QVariantMap ColumnLibrary::check(const QVariantMap& draft) const {
    return all_errors(QJsonObject::fromVariantMap(documentFromDraft(draft)));
}

bool ColumnLibrary::save(const QVariantMap& draft) {
    const QJsonObject doc = QJsonObject::fromVariantMap(documentFromDraft(draft));
    QVariantMap errors = all_errors(doc);
    QString general;
    if (errors.isEmpty()) {
        const FieldError err = guarded([&] {
            if (!workspace_ || !workspace_->database())
                throw Failure(Failure::Kind::database, "the workspace is not open");
            ColumnRecord c{draft.value("id").toLongLong(), doc.value("name").toString(), doc};
            c.version = draft.value("version").toLongLong(); // as listed; 0 for a new one
            ColumnStore(*workspace_->database()).save(c);
        });
        if (err.field == "name" || err.field == "version")
            errors.insert(err.field, err.message);
        else if (!err.empty())
            general = err.message;
    }
    if (errors != errors_ || general != general_error_) {
        errors_ = errors;
        general_error_ = general;
        emit errorsChanged();
    }
    if (!errors.isEmpty() || !general.isEmpty())
        return false;
    if (workspace_)
        workspace_->notifyColumnsChanged();
    return true;
}

bool ColumnLibrary::remove(qint64 id, qint64 version) {
    bool removed = false;
    const FieldError err = guarded([&] {
        if (workspace_ && workspace_->database())
            removed = ColumnStore(*workspace_->database()).remove(id, version);
    });
    if (err.field == "version") {
        errors_ = QVariantMap{{err.field, err.message}};
        general_error_.clear();
        emit errorsChanged();
    } else if (!err.empty()) {
        general_error_ = err.message;
        emit errorsChanged();
    }
    if (removed && workspace_)
        workspace_->notifyColumnsChanged();
    return removed;
}

QVariantMap ColumnLibrary::document(const QString& name) const {
    for (const QVariant& v : columns_)
        if (v.toMap().value("name").toString() == name)
            return v.toMap().value("document").toMap();
    return {};
}

QString ColumnLibrary::summary(const QVariantMap& column) const {
    return column_summary(QJsonObject::fromVariantMap(column));
}

void ColumnLibrary::clearErrors() {
    if (errors_.isEmpty() && general_error_.isEmpty())
        return;
    errors_.clear();
    general_error_.clear();
    emit errorsChanged();
}

} // namespace phaseplan::gui
