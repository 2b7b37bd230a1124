#include "column_transfer.h"

#include "chem/finding_text.h"
#include "column_library.h"
#include "core/pressure_commands.h"
#include "field_path.h"
#include "workspace.h"

#include <QJsonArray>
#include <QLocale>

#include <algorithm>
#include <cmath>
#include <limits>

namespace phaseplan::gui {

namespace {

QString num(double v) {
    QLocale l;
    l.setNumberOptions(QLocale::OmitGroupSeparator);
    return l.toString(v, 'g', 6);
}

/// "to.particle_um" → "particle_um"; "to.flow_ml_min" → "flow_ml_min"; "injection_ul" stays.
QString view_field(const QString& f) {
    if (f.startsWith(QLatin1String("to.")))
        return f.mid(3);
    return f;
}

} // namespace

ColumnTransfer::ColumnTransfer(QObject* parent)
    : QObject(parent), flow_(std::numeric_limits<double>::quiet_NaN()) {}

void ColumnTransfer::setPlan(Plan* p) {
    if (plan_ == p)
        return;
    if (plan_)
        disconnect(plan_, nullptr, this, nullptr);
    plan_ = p;
    if (plan_)
        connect(plan_, &Plan::documentChanged, this, &ColumnTransfer::recompute);
    emit planChanged();
    recompute();
}

void ColumnTransfer::setMethod(const QString& m) {
    if (method_ == m)
        return;
    method_ = m;
    emit inputChanged();
    recompute();
}

void ColumnTransfer::setTarget(const QVariantMap& t) {
    const QJsonObject o = QJsonObject::fromVariantMap(t);
    if (o == target_)
        return;
    target_ = o;
    emit inputChanged();
    recompute();
}

void ColumnTransfer::setTargetFlowMlMin(double f) {
    if (f == flow_ || (std::isnan(f) && std::isnan(flow_)))
        return;
    flow_ = f;
    emit inputChanged();
    recompute();
}

void ColumnTransfer::setInjectionUl(double v) {
    if (v == injection_ul_)
        return;
    injection_ul_ = v;
    emit inputChanged();
    recompute();
}

QJsonObject ColumnTransfer::scaledMethod() const {
    return scaled_;
}

void ColumnTransfer::recompute() {
    QVariantMap errors, result;
    QString problem;
    QJsonObject scaled;
    bool valid = false;
    Workspace* ws = plan_ ? plan_->workspace() : nullptr;
    const QJsonObject m = plan_ ? plan_->method(method_) : QJsonObject();
    const QVariantMap from_info = plan_ ? plan_->methodColumn(method_) : QVariantMap();
    const QJsonObject from = QJsonObject::fromVariantMap(from_info.value("document").toMap());
    if (!ws || !ws->ready())
        problem = tr("The reference data are not loaded.");
    else if (m.isEmpty())
        problem = tr("Pick a method first.");
    else if (!from_info.value("has").toBool())
        problem = tr("Method “%1” has no column with its length, inner diameter and particle "
                     "size: pick its column above first.")
                      .arg(method_);
    else if (target_.isEmpty())
        problem = tr("Pick the column to move to, or type its size.");
    else {
        QJsonObject method = m;
        method.remove("column");
        QJsonObject to = target_;
        if (!std::isnan(flow_))
            to.insert("flow_ml_min", flow_);
        // The same instrument before and after: its dwell volume on both sides, so the core keeps
        // the gradient's delay in column volumes (an initial hold) or says it cannot.
        QJsonObject from_side = from;
        const QJsonValue dwell = plan_->json().value("instrument").toObject().value("dwell_ml");
        if (dwell.isDouble() && dwell.toDouble() > 0) {
            from_side.insert("dwell_ml", dwell);
            to.insert("dwell_ml", dwell);
        }
        const int night = plan_->methodInjections(method_);
        QJsonObject input{{"method", method},
                          {"from", from_side},
                          {"to", to},
                          {"sequence_injections", std::max(1, night)}};
        if (!std::isnan(injection_ul_))
            input.insert("injection_ul", injection_ul_);
        const QJsonObject doc = plan_->json();
        QJsonObject with_lines = input;
        with_lines.insert("lines", doc.value("lines"));
        if (doc.contains("instrument"))
            with_lines.insert("instrument", doc.value("instrument"));
        TransferCommandResult out;
        QString pressure_note;
        FieldError err = guarded([&] { out = transfer_result(ws->data(), with_lines); });
        const bool own_field = FieldPath::belongsToAny(
            err.field,
            {QStringLiteral("to"), QStringLiteral("from"), QStringLiteral("injection_ul"),
             QStringLiteral("method"), QStringLiteral("methods")});
        if (!err.empty() && !own_field) {
            // The lines or the instrument stop the pressure, not the move: move without them.
            pressure_note = tr("No pressure on the new column: %1").arg(err.message);
            err = guarded([&] { out = transfer_result(ws->data(), input); });
        }
        if (!err.empty()) {
            if (FieldPath::belongsToAny(err.field,
                                        {QStringLiteral("to"), QStringLiteral("injection_ul")}))
                errors.insert(view_field(err.field), err.message);
            else if (FieldPath::belongs(err.field, QStringLiteral("from")))
                problem = tr("The column of method “%1”: %2").arg(method_, err.message);
            else
                problem = err.field.isEmpty() ? err.message : err.field + ": " + err.message;
        } else {
            valid = true;
            const chem::TransferResult& r = out.result;
            const chem::Method& sm = r.method;
            QVariantList rows;
            const std::vector<chem::GradientRow>& g0 = out.request.method.gradient;
            const std::vector<chem::GradientRow>& g1 = sm.gradient;
            // The dwell correction may add a first hold row; line up from the end.
            const int extra = int(g1.size()) - int(g0.size());
            for (int i = 0; i < int(g1.size()); ++i) {
                const int j = i - extra;
                rows.append(
                    QVariantMap{{"fromMin", j >= 0 ? g0[std::size_t(j)].t_min
                                                   : std::numeric_limits<double>::quiet_NaN()},
                                {"toMin", g1[std::size_t(i)].t_min}});
            }
            QVariantList warnings;
            // Said by the view's own lines: the l/dp band, an uncalibrated resistance, no limit.
            for (const chem::Warning& w : r.warnings)
                if (!(w.finding &&
                      w.finding->kind == chem::FindingKind::outside_allowed_adjustment))
                    warnings.append(QString::fromStdString(w.message));
            for (const chem::Finding& f : out.pressure_findings)
                if (f.kind != chem::FindingKind::pressure_uncalibrated &&
                    f.kind != chem::FindingKind::pressure_no_limit)
                    warnings.append(QString::fromStdString(chem::describe(f, {})));
            const std::optional<chem::PressureTrace>& p = out.pressure;
            const QString to_name = target_.value("name").toString();
            const QString size = QStringLiteral("%1×%2 mm")
                                     .arg(num(target_.value("length_mm").toDouble()),
                                          num(target_.value("id_mm").toDouble()));
            result = QVariantMap{
                {"fromName", from.value("name").toString()},
                {"fromText", column_summary(from)},
                {"toText", column_summary(target_)},
                {"flowFromMlMin", method.value("flow_ml_min").toDouble()},
                {"flowToMlMin", r.flow_ml_min},
                {"scaledFlowMlMin", r.scaled_flow_ml_min},
                {"timeFactor", r.time_factor},
                {"rows", rows},
                {"runFromMin", method.value("run_min").toDouble()},
                {"runToMin", sm.run_min},
                {"equilibrationFromMin", method.value("equilibration_min").toDouble()},
                {"equilibrationToMin", sm.equilibration_min},
                {"injectionFromUl", injection_ul_},
                {"holdAddedMin", r.hold_added_min},
                {"injectionToUl", r.injection_ul.value_or(0.0)},
                {"solventFromMl", r.solvent_from_ml},
                {"solventToMl", r.solvent_to_ml},
                {"savingFraction", r.saving_fraction},
                {"nightInjections", night},
                {"nightFromMl", night > 0 ? r.solvent_from_sequence_ml : 0.0},
                {"nightToMl", night > 0 ? r.solvent_to_sequence_ml : 0.0},
                {"nightSavingMl",
                 night > 0 ? r.solvent_from_sequence_ml - r.solvent_to_sequence_ml : 0.0},
                {"lOverDpChange", r.l_over_dp_change},
                {"withinAllowed", r.within_allowed_adjustment},
                {"hasPressure", p.has_value()},
                {"maxBar", p ? p->max_pressure_bar : 0.0},
                {"maxAtMin", p ? p->max_at_t_min : 0.0},
                {"limitBar", p && p->limit ? p->limit->bar : 0.0},
                {"limitedBy", p && p->limit
                                  ? QString::fromUtf8(chem::limit_source_name(p->limit->source))
                                  : QString()},
                {"calibrated", p ? p->calibrated : false},
                {"pressureNote", pressure_note},
                {"warnings", warnings},
                {"defaultName", tr("%1 on %2").arg(method_, size)}};
            scaled = method_to_json(sm);
            QJsonObject col = target_;
            col.remove("flow_ml_min");
            col.remove("dwell_ml");
            if (to_name.isEmpty())
                col.insert(
                    "name",
                    tr("%1 %2 µm (typed)").arg(size, num(target_.value("particle_um").toDouble())));
            scaled.insert("column", col);
        }
    }
    // The present column is said even while the move cannot be worked out.
    if (result.isEmpty() && from_info.value("has").toBool())
        result.insert("fromText", column_summary(from));
    // Most plan changes (a buffer edit, a row) leave the move as it was: the views then keep
    // what they show.
    if (valid == valid_ && errors == errors_ && problem == problem_ && result == result_ &&
        scaled == scaled_)
        return;
    valid_ = valid;
    errors_ = errors;
    problem_ = problem;
    result_ = result;
    scaled_ = scaled;
    emit resultChanged();
}

namespace {
/// `v` to `step` (0.001 mL/min, 0.01 min): what a pump's method editor takes (common practice,
/// no source), so the screens show what is saved.
double to_step(double v, double step) {
    return std::round(v / step) * step;
}
} // namespace

QJsonObject ColumnTransfer::at_pump_resolution(const QJsonObject& method) {
    QJsonObject m = method;
    if (m.contains("flow_ml_min"))
        m["flow_ml_min"] = to_step(m["flow_ml_min"].toDouble(), 0.001);
    for (const char* key : {"run_min", "equilibration_min"})
        if (m.contains(key))
            m[key] = to_step(m[key].toDouble(), 0.01);
    QJsonArray rows = m["gradient"].toArray();
    double previous = -1;
    for (int i = 0; i < rows.size(); ++i) {
        QJsonObject row = rows[i].toObject();
        const double t = row["t_min"].toDouble();
        const double rounded = to_step(t, 0.01);
        // Rows closer than the step keep their exact times: the table must stay ascending.
        const double kept = rounded > previous ? rounded : t;
        row["t_min"] = kept;
        previous = kept;
        rows[i] = row;
    }
    if (m.contains("gradient"))
        m["gradient"] = rows;
    if (m.contains("run_min") && !rows.isEmpty())
        m["run_min"] = std::max(m["run_min"].toDouble(), previous);
    return m;
}

QString ColumnTransfer::addAsMethod(const QString& name) {
    const QString n = name.trimmed();
    if (!plan_ || !valid_ || scaled_.isEmpty())
        return tr("Nothing to add: the move is not worked out.");
    if (n.isEmpty())
        return tr("The new method needs a name.");
    if (plan_->methodNames().contains(n))
        return tr("A method is already called “%1”: pick another name.").arg(n);
    plan_->setMethod(n, at_pump_resolution(scaled_));
    return {};
}

} // namespace phaseplan::gui
