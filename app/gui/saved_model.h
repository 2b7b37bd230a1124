#pragma once
// Saved work: every buffer, line, method and sequence in the lab's database, newest first,
// searchable by name, kind and note.
#include "workspace.h"

#include <QAbstractListModel>
#include <QPointer>
#include <QQmlEngine>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("workspace.h")

namespace phaseplan::gui {

class Workspace;

class SavedWorkModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    Q_PROPERTY(QString search READ search WRITE setSearch NOTIFY searchChanged)
    /// "all", "buffer", "line", "method", "sequence".
    Q_PROPERTY(QString kind READ kind WRITE setKind NOTIFY searchChanged)
    Q_PROPERTY(int count READ count NOTIFY countChanged)

  public:
    enum Role {
        KindRole = Qt::UserRole + 1,
        NameRole,
        NoteRole,
        UpdatedRole,
        SummaryRole,
        ChangedRole ///< "changed by Mats Lindqvist (demo-review), 2026-12-02 19:04 UTC"; "" before
                    ///< versions or when nobody is recorded
    };
    Q_ENUM(Role)

    explicit SavedWorkModel(QObject* parent = nullptr);
    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);
    QString search() const { return search_; }
    void setSearch(const QString& s);
    QString kind() const { return kind_; }
    void setKind(const QString& k);
    int count() const { return int(rows_.size()); }

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    /// The saved document, empty when there is none.
    Q_INVOKABLE QVariantMap load(const QString& kind, const QString& name) const;
    Q_INVOKABLE bool remove(const QString& kind, const QString& name);
    Q_INVOKABLE void refresh();

  signals:
    void workspaceChanged();
    void searchChanged();
    void countChanged();

  private:
    struct Row {
        QString kind, name, note, updated, summary, changed;
    };
    QPointer<Workspace> workspace_;
    QString search_, kind_ = QStringLiteral("all");
    std::vector<Row> rows_;
};

} // namespace phaseplan::gui
