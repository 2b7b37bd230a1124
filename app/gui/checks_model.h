#pragma once
// Every warning of the plan in one list: the buffer designer's recipe, each line's recipe, and
// the sequence checks, worst first, each with what to do about it. The warnings themselves come
// from the core; this model gathers them and adds the advice for each warning code.
#include "buffer_designer.h"
#include "lines_model.h"

#include <QAbstractListModel>
#include <QPointer>
#include <QQmlEngine>
#include <QTimer>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("buffer_designer.h")
Q_MOC_INCLUDE("plan.h")
Q_MOC_INCLUDE("lines_model.h")

namespace phaseplan::gui {

class BufferDesigner;
class Plan;
class LinesModel;

class ChecksModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY sourcesChanged)
    Q_PROPERTY(phaseplan::gui::LinesModel* lines READ lines WRITE setLines NOTIFY sourcesChanged)
    Q_PROPERTY(phaseplan::gui::BufferDesigner* designer READ designer WRITE setDesigner NOTIFY
                   sourcesChanged)
    Q_PROPERTY(int count READ count NOTIFY countChanged)
    /// Number of entries of severity "warning" (the ones that stop a night's run).
    Q_PROPERTY(int warningCount READ warningCount NOTIFY countChanged)

  public:
    enum Role {
        SeverityRole =
            Qt::UserRole + 1, ///< "warning", "caution", "info", or "error" (input refused)
        CodeRole,
        MessageRole,
        AdviceRole,
        SourceRole, ///< "Buffer", "Line A", "Sequence"
        ScreenRole, ///< the screen key to open: "buffer", "lines", "sequence"
        FocusRole,  ///< the field to focus there, as a contract path ("lines.B.bottle_ml")
    };
    Q_ENUM(Role)

    explicit ChecksModel(QObject* parent = nullptr);
    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    LinesModel* lines() const { return lines_; }
    void setLines(LinesModel* l);
    BufferDesigner* designer() const { return designer_; }
    void setDesigner(BufferDesigner* d);
    int count() const { return int(entries_.size()); }
    int warningCount() const;

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    /// Gathers now instead of on the next turn of the event loop (tests).
    Q_INVOKABLE void refreshNow() { rebuild(); }

    /// What to do about a warning code (a sentence for the bench); a general line for unknown
    /// codes.
    Q_INVOKABLE static QString adviceFor(const QString& code);
    /// The field a warning is best fixed at, as a contract path ("lines.B.bottle_ml" for a bottle
    /// that runs dry, "target_ph" for a buffer outside its pKa range).
    static QString focusFor(const QString& code, const QString& line, const QVariantMap& warning);

  signals:
    void sourcesChanged();
    void countChanged();

  private:
    struct Entry {
        QString severity, code, message, advice, source, screen, focus;
        bool operator==(const Entry&) const = default;
    };
    void rebuild();
    QTimer rebuild_timer_;
    QPointer<Plan> plan_;
    QPointer<LinesModel> lines_;
    QPointer<BufferDesigner> designer_;
    std::vector<Entry> entries_;
};

} // namespace phaseplan::gui
