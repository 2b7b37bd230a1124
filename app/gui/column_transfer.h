#pragma once
// "Run it on a smaller column": the plan's method moved to another column by the `transfer`
// command of the core (phaseplan::command_transfer, the USP <621> geometric rules of
// chem/transfer.h), with the pressure on the new column from the plan's lines and instrument.
//
// In: plan, method, target (a column object: a library column's document or typed dimensions),
// targetFlowMlMin (NaN: the flow by the rule), injectionUl (on the present column).
// Out: `result` (see below), `errors` (field → message: "length_mm", "id_mm", "particle_um",
// "max_pressure_bar", "flow_ml_min", "injection_ul"), `problem` (what stops it that is not a
// field of this view, "" when none). addAsMethod(name) puts the scaled method into the plan with a
// copy of the target column.
#include "model_util.h"
#include "plan.h"

#include <QJsonObject>
#include <QObject>
#include <QPointer>
#include <QQmlEngine>
#include <QVariantList>
#include <QVariantMap>

Q_MOC_INCLUDE("plan.h")

namespace phaseplan::gui {

class ColumnTransfer : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Plan* plan READ plan WRITE setPlan NOTIFY planChanged)
    Q_PROPERTY(QString method READ method WRITE setMethod NOTIFY inputChanged)
    /// The column to move to: {name?, length_mm, id_mm, particle_um, max_pressure_bar?, …}.
    Q_PROPERTY(QVariantMap target READ target WRITE setTarget NOTIFY inputChanged)
    /// The flow chosen on the new column, mL/min; NaN for the flow by the rule.
    Q_PROPERTY(
        double targetFlowMlMin READ targetFlowMlMin WRITE setTargetFlowMlMin NOTIFY inputChanged)
    /// The injection volume on the present column, µL.
    Q_PROPERTY(double injectionUl READ injectionUl WRITE setInjectionUl NOTIFY inputChanged)
    Q_PROPERTY(bool valid READ valid NOTIFY resultChanged)
    Q_PROPERTY(QVariantMap errors READ errors NOTIFY resultChanged)
    Q_PROPERTY(QString problem READ problem NOTIFY resultChanged)
    /// {fromName, fromText (also when the move is not worked out), toText, flowFromMlMin,
    /// flowToMlMin, scaledFlowMlMin, timeFactor,
    ///  rows: [{fromMin, toMin}], runFromMin, runToMin, equilibrationFromMin,
    ///  equilibrationToMin, injectionFromUl, injectionToUl, holdAddedMin (an initial hold
    ///  that keeps the instrument's dwell delay in column volumes), solventFromMl, solventToMl (per
    ///  injection), savingFraction, nightInjections, nightFromMl, nightToMl, nightSavingMl,
    ///  lOverDpChange (fraction), withinAllowed, hasPressure, maxBar, maxAtMin, limitBar (0: none),
    ///  limitedBy ("column", "instrument"), pressureNote, warnings: [message], defaultName}
    Q_PROPERTY(QVariantMap result READ result NOTIFY resultChanged)

  public:
    explicit ColumnTransfer(QObject* parent = nullptr);

    Plan* plan() const { return plan_; }
    void setPlan(Plan* p);
    QString method() const { return method_; }
    void setMethod(const QString& m);
    QVariantMap target() const { return target_.toVariantMap(); }
    void setTarget(const QVariantMap& t);
    double targetFlowMlMin() const { return flow_; }
    void setTargetFlowMlMin(double f);
    double injectionUl() const { return injection_ul_; }
    void setInjectionUl(double v);
    bool valid() const { return valid_; }
    QVariantMap errors() const { return errors_; }
    QString problem() const { return problem_; }
    QVariantMap result() const { return result_; }
    /// The scaled method as the `sequence` document holds it (with its "column"), {} when invalid.
    QJsonObject scaledMethod() const;

    /// Adds the scaled method to the plan as `name`; returns "" or why not (no name, taken,
    /// nothing to add).
    Q_INVOKABLE QString addAsMethod(const QString& name);
    /// The scaled method as a pump takes it: flow to 0.001 mL/min, times to 0.01 min (rows
    /// closer than that keep their exact times, so the table stays ascending).
    static QJsonObject at_pump_resolution(const QJsonObject& method);
    Q_INVOKABLE void recompute();

  signals:
    void planChanged();
    void inputChanged();
    void resultChanged();

  private:
    QPointer<Plan> plan_;
    QString method_;
    QJsonObject target_;
    double flow_;
    double injection_ul_ = 10;
    bool valid_ = false;
    QVariantMap errors_;
    QString problem_;
    QVariantMap result_;
    QJsonObject scaled_;
};

} // namespace phaseplan::gui
