#pragma once
// The lab's columns: a name and the `column` object the `pressure`, `transfer` and `sequence`
// commands read (app/core/pressure_commands.h), kept in the `columns` table (migration step 9):
//   {"name": "C18 150×4.6 mm 3.5 µm, bench 2", "length_mm": 150, "id_mm": 4.6,
//    "particle_um": 3.5, "porosity": 0.4, "max_pressure_bar": 400, "ph_min": 2, "ph_max": 8,
//    "temperature_c": 30,
//    "reference": {"pressure_bar": 180, "flow_ml_min": 1.0, "A": 50, "B": 50, "temperature_c": 30}}
// All but the name and the three dimensions are optional. A column is checked by the same code
// the command-line tool runs (pressure_column_from_json and column_from_json, so chem::
// validate_column), and a method that uses one carries a copy of it ("methods.<name>.column"), so a
// saved plan opens the same after the library row is edited or deleted.
//
// ColumnStore: every write is one transaction; read-back is bounded like the saved documents (a
// name over storage::max_name_chars or a document over the record limits is set aside at open, or
// skipped when the file is read-only), and a row that no longer passes the checks is skipped and
// named in `skipped()`.
// ColumnLibrary (QML): the list, and save/remove with every bad field's message (`errors`,
// field → message, the core's words; fields as in the document: "particle_um",
// "reference.pressure_bar").
#include "model_util.h"
#include "storage/database.h"

#include <QJsonObject>
#include <QObject>
#include <QPointer>
#include <QQmlEngine>
#include <QVariantList>
#include <QVariantMap>

#include <optional>
#include <vector>

Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

struct ColumnRecord {
    qint64 id = 0; ///< 0 for a new one
    QString name;
    QJsonObject document; ///< the column object, with "name"
    /// As stored (storage/versioning.h): the version it was loaded at (0 for a new one), who saved
    /// it last and when (UTC ISO 8601).
    qint64 version = 0;
    QString changed_by{};
    QString changed_at{};
};

/// Checks a column document (throws chem::Error with the field as in the document: "name",
/// "particle_um", "reference.flow_ml_min", "ph_max").
void validate_column_document(const QJsonObject& column);

/// A one-line description: "150 × 4.6 mm, 3.5 µm, up to 400 bar, pH 2–8".
QString column_summary(const QJsonObject& column);

class ColumnStore {
  public:
    explicit ColumnStore(storage::Database& db) : db_(db) {}
    /// Validates and inserts (id 0) or updates by id; returns the id. A name already used by
    /// another column is refused with name_taken_error (field "name", naming who saved it and
    /// when). An update with `c.version` above 0 writes only if the row is still at that version
    /// (conflict_error, field "version"); with version 0 it overwrites (the demo, tests). Recorded
    /// under the database's actor().
    qint64 save(const ColumnRecord& c);
    /// With `expected_version` above 0, only from that version (conflict_error otherwise).
    bool remove(qint64 id, qint64 expected_version = -1);
    std::optional<ColumnRecord> load(qint64 id) const;
    std::optional<ColumnRecord> find(const QString& name) const;
    /// Ordered by name.
    std::vector<ColumnRecord> list() const;
    /// Rows left out by the last list(): "“name”: why".
    const QStringList& skipped() const { return skipped_; }

  private:
    storage::Database& db_;
    mutable QStringList skipped_;
};

/// The demo columns for a new database (invented names).
void seed_demo_columns(storage::Database& db);

class ColumnLibrary : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// [{id, version, changedBy, changedAt, name, summary, document (the column object), length_mm,
    /// id_mm, particle_um,
    ///   porosity, max_pressure_bar, ph_min, ph_max, temperature_c, reference_pressure_bar,
    ///   reference_flow_ml_min, reference_percent_b, reference_temperature_c}] (NaN: not given).
    Q_PROPERTY(QVariantList columns READ columns NOTIFY columnsChanged)
    Q_PROPERTY(QStringList names READ names NOTIFY columnsChanged)
    /// Rows that could not be read back, in words; "" when none.
    Q_PROPERTY(QString skippedText READ skippedText NOTIFY columnsChanged)
    /// The last save's errors: field → message (the core's words, naming the value).
    Q_PROPERTY(QVariantMap errors READ errors NOTIFY errorsChanged)
    /// A message that belongs to no field (the database is read-only), "" when none.
    Q_PROPERTY(QString generalError READ generalError NOTIFY errorsChanged)

  public:
    explicit ColumnLibrary(QObject* parent = nullptr);

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    QVariantList columns() const { return columns_; }
    QStringList names() const;
    QString skippedText() const { return skipped_; }
    QVariantMap errors() const { return errors_; }
    QString generalError() const { return general_error_; }

    /// A draft as the form holds it: {id (0: new), name, length_mm, id_mm, particle_um, porosity,
    /// max_pressure_bar, ph_min, ph_max, temperature_c, reference_pressure_bar,
    /// reference_flow_ml_min, reference_percent_b, reference_temperature_c}; NaN or absent:
    /// not given. The reference composition is "% of line B" (the rest line A).
    /// Returns the column document it makes (not checked).
    Q_INVOKABLE QVariantMap documentFromDraft(const QVariantMap& draft) const;
    /// Checks and saves; false with `errors` (every bad field, each with its message). The draft's
    /// `version` is the one listed (absent or 0: a new column): a column changed on another bench
    /// since is refused with errors["version"] (who and when), a taken name with errors["name"].
    Q_INVOKABLE bool save(const QVariantMap& draft);
    /// Checks a draft without saving: field → message.
    Q_INVOKABLE QVariantMap check(const QVariantMap& draft) const;
    /// With `version` (as listed) above 0, only if nobody changed it since (errors["version"]).
    Q_INVOKABLE bool remove(qint64 id, qint64 version = -1);
    /// The column document of the named library column, {} when there is none.
    Q_INVOKABLE QVariantMap document(const QString& name) const;
    Q_INVOKABLE QString summary(const QVariantMap& column) const;
    Q_INVOKABLE void clearErrors();
    Q_INVOKABLE void reload();

  signals:
    void workspaceChanged();
    void columnsChanged();
    void errorsChanged();

  private:
    /// Every bad field of `doc`: validated, the faulty field replaced by a good value, again.
    QVariantMap all_errors(QJsonObject doc) const;

    QPointer<Workspace> workspace_;
    QVariantList columns_;
    QString skipped_;
    QVariantMap errors_;
    QString general_error_;
};

} // namespace phaseplan::gui
