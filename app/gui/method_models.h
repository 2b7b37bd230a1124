#pragma once
// The method and sequence editors: a method's gradient table (rows of time and % of each line)
// and the sequence rows (method, injections, label), both views onto the Plan's document. The
// core validates them (times ascending, rows summing to 100 %, …) when the plan recomputes; the
// error it names ("methods.assay.gradient[2].t_min") is mapped back to the row and column here.
#include "model_util.h"
#include "plan.h"

#include <QAbstractListModel>
#include <QJsonArray>
#include <QJsonObject>
#include <QPointer>
#include <QQmlEngine>

#include <QPair>
#include <QSet>

#include <functional>
#include <optional>

// Complete types for the pointer properties, for moc only.
Q_MOC_INCLUDE("plan.h")

namespace phaseplan::gui {

class Plan;

class GradientModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY planChanged)
    /// The method edited; the first of the plan's methods when empty or unknown.
    Q_PROPERTY(QString methodName READ methodName WRITE setMethodName NOTIFY methodChanged)
    Q_PROPERTY(double flowMlMin READ flowMlMin WRITE setFlowMlMin NOTIFY methodChanged)
    Q_PROPERTY(double runMin READ runMin WRITE setRunMin NOTIFY methodChanged)
    Q_PROPERTY(double equilibrationMin READ equilibrationMin WRITE setEquilibrationMin NOTIFY
                   methodChanged)
    /// Lines shown as columns (the plan's defined lines).
    Q_PROPERTY(QStringList letters READ letters NOTIFY methodChanged)
    /// The plan's error when it lies in this method, relative to it ("gradient[2].t_min").
    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)
    /// The field at fault in the screen's words ("Gradient row 2, % A").
    Q_PROPERTY(QString errorPlace READ errorPlace NOTIFY errorChanged)
    /// Row the error names, −1 when none.
    Q_PROPERTY(int errorRow READ errorRow NOTIFY errorChanged)
    /// What the last removal took away ("Gradient row 3 of “assay” removed"), "" when nothing
    /// can be undone.
    Q_PROPERTY(QString undoText READ undoText NOTIFY undoChanged)

  public:
    enum Role { TimeRole = Qt::UserRole + 1, PercentsRole, SumRole, RowErrorRole };
    Q_ENUM(Role)

    explicit GradientModel(QObject* parent = nullptr);
    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    QString methodName() const;
    void setMethodName(const QString& n);
    double flowMlMin() const;
    void setFlowMlMin(double v);
    double runMin() const;
    void setRunMin(double v);
    double equilibrationMin() const;
    void setEquilibrationMin(double v);
    QStringList letters() const;
    QString errorField() const { return error_field_; }
    QString errorMessage() const { return error_message_; }
    QString errorPlace() const;
    int errorRow() const { return error_row_; }

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    Q_INVOKABLE void setTime(int row, double t_min);
    /// Sets one line's % in a row. When the method uses two lines (a share in some row), the other
    /// takes the rest (100 − %). With more, the last of them takes the remainder until it is typed
    /// in itself.
    Q_INVOKABLE void setPercent(int row, const QString& letter, double percent);
    /// Appends a row after the last (its time + 5 min, same composition).
    Q_INVOKABLE void addRow();
    /// Removes a row (never the last one left); undoRemove() puts it back.
    Q_INVOKABLE void removeRow(int row);
    Q_INVOKABLE void undoRemove();
    QString undoText() const { return undo_text_; }
    /// Fills a LineSeries with line `letter`'s % against time over one injection: the table, the
    /// hold to run_min, then re-equilibration at the first row.
    Q_INVOKABLE void fillSeries(QObject* series, const QString& letter) const;
    /// Time axis end: run + equilibration, in min.
    Q_INVOKABLE double injectionMin() const { return runMin() + equilibrationMin(); }
    Q_INVOKABLE double percentAt(int row, const QString& letter) const;

  signals:
    void planChanged();
    void methodChanged();
    void errorChanged();
    void undoChanged();

  private:
    QJsonObject method() const;
    /// (method, row) pairs whose last line was typed in: it no longer takes the remainder.
    QSet<QPair<QString, int>> last_set_;
    struct Removed {
        QString method;
        int row = -1;
        QJsonObject content;
    };
    std::optional<Removed> removed_;
    QString undo_text_;
    void set_undo(std::optional<Removed> r);
    void edit(const std::function<void(QJsonObject&)>& change);
    void update_error();
    QPointer<Plan> plan_;
    QString method_name_;
    QString error_field_, error_message_;
    int error_row_ = -1;
    int rows_ = 0;
    QJsonObject shown_; ///< the method as last shown, with the lines: unchanged → no signal
};

class SequenceRowsModel : public QAbstractListModel {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY planChanged)
    Q_PROPERTY(int totalInjections READ totalInjections NOTIFY changed)
    /// "Sequence row 3 (“samples”) removed", "" when nothing can be undone.
    Q_PROPERTY(QString undoText READ undoText NOTIFY undoChanged)

  public:
    enum Role {
        MethodRole = Qt::UserRole + 1,
        InjectionsRole,
        LabelRole,
        RowErrorRole,
        RowErrorFieldRole
    };
    Q_ENUM(Role)

    explicit SequenceRowsModel(QObject* parent = nullptr);
    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    int totalInjections() const;

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role) const override;
    QHash<int, QByteArray> roleNames() const override;

    Q_INVOKABLE void setMethod(int row, const QString& method);
    Q_INVOKABLE void setInjections(int row, int injections);
    Q_INVOKABLE void setLabel(int row, const QString& label);
    Q_INVOKABLE void addRow();
    /// Removes a row; undoRemove() puts it back where it was.
    Q_INVOKABLE void removeRow(int row);
    Q_INVOKABLE void undoRemove();
    Q_INVOKABLE void moveRow(int from, int to);
    QString undoText() const { return undo_text_; }

  signals:
    void planChanged();
    void changed();
    void undoChanged();

  private:
    std::optional<std::pair<int, QJsonObject>> removed_;
    QString undo_text_;
    void edit(int row, const char* key, const QJsonValue& v);
    void reset();
    QPointer<Plan> plan_;
    int rows_ = 0;
    QJsonArray shown_;    ///< the rows as last shown: unchanged → no signal
    QString shown_error_; ///< the plan's error as last shown on the rows
};

} // namespace phaseplan::gui
