#include "method_models.h"

#include "chem/error.h"
#include "field_words.h"
#include "plan.h"

#include <QJsonArray>

#include <cmath>
#include <functional>

namespace phaseplan::gui {

// ---- GradientModel ------------------------------------------------------------------------

GradientModel::GradientModel(QObject* parent) : QAbstractListModel(parent) {}

void GradientModel::setPlan(Plan* p) {
    if (p == plan_)
        return;
    if (plan_)
        disconnect(plan_, nullptr, this, nullptr);
    beginResetModel();
    plan_ = p;
    rows_ = int(method().value("gradient").toArray().size());
    endResetModel();
    if (p) {
        connect(p, &Plan::documentChanged, this, [this] {
            // An edit elsewhere in the plan (a buffer, a bottle) leaves the table as it is.
            QJsonObject now = method();
            now.insert("__lines", QJsonArray::fromStringList(letters()));
            if (now == shown_)
                return;
            shown_ = now;
            const int n = int(method().value("gradient").toArray().size());
            if (n != rows_) {
                beginResetModel();
                rows_ = n;
                endResetModel();
            } else if (n > 0) {
                // Same shape: update in place so a field being edited keeps its focus.
                emit dataChanged(index(0), index(n - 1));
            }
            emit methodChanged();
        });
        connect(p, &Plan::resultChanged, this, &GradientModel::update_error);
    }
    emit planChanged();
    emit methodChanged();
    update_error();
}

QString GradientModel::methodName() const {
    if (!plan_)
        return method_name_;
    const QStringList names = plan_->methodNames();
    if (names.contains(method_name_))
        return method_name_;
    return names.isEmpty() ? QString() : names.first();
}

void GradientModel::setMethodName(const QString& n) {
    if (n == method_name_)
        return;
    beginResetModel();
    method_name_ = n;
    rows_ = int(method().value("gradient").toArray().size());
    endResetModel();
    emit methodChanged();
    update_error();
}

QJsonObject GradientModel::method() const {
    return plan_ ? plan_->method(methodName()) : QJsonObject();
}

void GradientModel::edit(const std::function<void(QJsonObject&)>& change) {
    if (!plan_ || methodName().isEmpty())
        return;
    QJsonObject m = method();
    change(m);
    plan_->setMethod(methodName(), m);
}

double GradientModel::flowMlMin() const {
    return method().value("flow_ml_min").toDouble();
}
void GradientModel::setFlowMlMin(double v) {
    edit([&](QJsonObject& m) { m.insert("flow_ml_min", v); });
}
double GradientModel::runMin() const {
    return method().value("run_min").toDouble();
}
void GradientModel::setRunMin(double v) {
    edit([&](QJsonObject& m) { m.insert("run_min", v); });
}
double GradientModel::equilibrationMin() const {
    return method().value("equilibration_min").toDouble();
}
void GradientModel::setEquilibrationMin(double v) {
    edit([&](QJsonObject& m) { m.insert("equilibration_min", v); });
}

QStringList GradientModel::letters() const {
    return plan_ ? plan_->lineLetters() : QStringList();
}

int GradientModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : rows_;
}

QHash<int, QByteArray> GradientModel::roleNames() const {
    return {{TimeRole, "tMin"},
            {PercentsRole, "percents"},
            {SumRole, "sum"},
            {RowErrorRole, "rowError"}};
}

double GradientModel::percentAt(int row, const QString& letter) const {
    return method().value("gradient").toArray().at(row).toObject().value(letter).toDouble();
}

QVariant GradientModel::data(const QModelIndex& index, int role) const {
    const QJsonArray g = method().value("gradient").toArray();
    if (!index.isValid() || index.row() >= g.size())
        return {};
    const QJsonObject r = g.at(index.row()).toObject();
    switch (role) {
    case TimeRole:
        return r.value("t_min").toDouble();
    case PercentsRole: {
        QVariantMap m;
        for (const QString& l : letters())
            m.insert(l, r.value(l).toDouble());
        return m;
    }
    case SumRole: {
        // Shown beside the row while typing; the core's check (sum 100 ± 0.01) decides.
        double s = 0;
        for (const QString& l : letters())
            s += r.value(l).toDouble();
        return s;
    }
    case RowErrorRole:
        return index.row() == error_row_ ? error_message_ : QString();
    }
    return {};
}

void GradientModel::setTime(int row, double t_min) {
    edit([&](QJsonObject& m) {
        QJsonArray g = m.value("gradient").toArray();
        if (row < 0 || row >= g.size())
            return;
        QJsonObject r = g[row].toObject();
        r.insert("t_min", t_min);
        g[row] = r;
        m.insert("gradient", g);
    });
}

void GradientModel::setPercent(int row, const QString& letter, double percent) {
    // The lines this method uses: any with a share in some row, and the one being typed.
    const QJsonArray g0 = method().value("gradient").toArray();
    QStringList used;
    for (const QString& l : letters()) {
        bool in = l == letter;
        for (const QJsonValue& r : g0)
            in = in || r.toObject().value(l).toDouble() > 0;
        if (in)
            used << l;
    }
    const QString last = used.isEmpty() ? QString() : used.last();
    const auto key = qMakePair(methodName(), row);
    if (letter == last)
        last_set_.insert(key);
    edit([&](QJsonObject& m) {
        QJsonArray g = m.value("gradient").toArray();
        if (row < 0 || row >= g.size())
            return;
        QJsonObject r = g[row].toObject();
        r.insert(letter, percent);
        if (used.size() == 2) {
            // Two lines: typing one fills the other.
            r.insert(used[0] == letter ? used[1] : used[0], std::max(0.0, 100.0 - percent));
        } else if (used.size() > 2 && letter != last && !last_set_.contains(key)) {
            // More lines: the last takes what the others leave, until it is typed in itself.
            double others = 0;
            for (const QString& l : used)
                if (l != last)
                    others += r.value(l).toDouble();
            r.insert(last, std::max(0.0, 100.0 - others));
        }
        g[row] = r;
        m.insert("gradient", g);
    });
}

void GradientModel::addRow() {
    edit([&](QJsonObject& m) {
        QJsonArray g = m.value("gradient").toArray();
        QJsonObject r = g.isEmpty() ? QJsonObject{{"t_min", 0}} : g.last().toObject();
        if (!g.isEmpty())
            r.insert("t_min", r.value("t_min").toDouble() + 5);
        else if (!letters().isEmpty())
            r.insert(letters().first(), 100);
        g.append(r);
        m.insert("gradient", g);
        if (m.value("run_min").toDouble() < r.value("t_min").toDouble())
            m.insert("run_min", r.value("t_min").toDouble());
    });
}

void GradientModel::removeRow(int row) {
    const QJsonArray g0 = method().value("gradient").toArray();
    if (row < 0 || row >= g0.size() || g0.size() <= 1)
        return;
    const Removed r{methodName(), row, g0.at(row).toObject()};
    edit([&](QJsonObject& m) {
        QJsonArray g = m.value("gradient").toArray();
        g.removeAt(row);
        m.insert("gradient", g);
    });
    set_undo(r);
}

void GradientModel::undoRemove() {
    if (!removed_ || !plan_)
        return;
    const Removed r = *removed_;
    QJsonObject m = plan_->method(r.method);
    if (!m.isEmpty()) {
        QJsonArray g = m.value("gradient").toArray();
        g.insert(std::min<qsizetype>(r.row, g.size()), r.content);
        m.insert("gradient", g);
        plan_->setMethod(r.method, m);
    }
    set_undo(std::nullopt);
}

void GradientModel::set_undo(std::optional<Removed> r) {
    removed_ = std::move(r);
    undo_text_ =
        removed_
            ? tr("Gradient row %1 of “%2” removed").arg(removed_->row + 1).arg(removed_->method)
            : QString();
    emit undoChanged();
}

void GradientModel::fillSeries(QObject* series, const QString& letter) const {
    const QJsonObject m = method();
    const QJsonArray g = m.value("gradient").toArray();
    QList<QPointF> pts;
    if (g.isEmpty()) {
        replace_series(series, pts);
        return;
    }
    // The table as drawn: a hold before the first row, the rows, the hold to run_min, then the
    // step back to the first row for re-equilibration (what the pump is told, not a computation).
    const double first = g.first().toObject().value(letter).toDouble();
    const double t0 = g.first().toObject().value("t_min").toDouble();
    if (t0 > 0)
        pts.append(QPointF(0, first));
    double last_t = 0, last_p = first;
    for (const QJsonValue& v : g) {
        last_t = v.toObject().value("t_min").toDouble();
        last_p = v.toObject().value(letter).toDouble();
        pts.append(QPointF(last_t, last_p));
    }
    const double run = std::max(runMin(), last_t);
    if (run > last_t)
        pts.append(QPointF(run, last_p));
    if (equilibrationMin() > 0) {
        pts.append(QPointF(run, first));
        pts.append(QPointF(run + equilibrationMin(), first));
    }
    replace_series(series, pts);
}

QString GradientModel::errorPlace() const {
    return field_words(error_field_);
}

void GradientModel::update_error() {
    QString field, message;
    int row = -1;
    if (plan_ && !methodName().isEmpty()) {
        const QString prefix = QStringLiteral("methods.") + methodName();
        const QString f = plan_->errorField();
        if (chem::path_within(f.toStdString(), prefix.toStdString()) &&
            !f.startsWith(prefix + '[')) {
            field = f.mid(prefix.size() + 1);
            message = plan_->errorMessage();
            if (const auto g = chem::subscript_of(field.toStdString(), "gradient"))
                row = g->index();
        }
    }
    if (field == error_field_ && message == error_message_ && row == error_row_)
        return;
    const int old_row = error_row_;
    error_field_ = field;
    error_message_ = message;
    error_row_ = row;
    for (int r : {old_row, row})
        if (r >= 0 && r < rows_)
            emit dataChanged(index(r), index(r), {RowErrorRole});
    emit errorChanged();
}

// ---- SequenceRowsModel --------------------------------------------------------------------

SequenceRowsModel::SequenceRowsModel(QObject* parent) : QAbstractListModel(parent) {}

void SequenceRowsModel::setPlan(Plan* p) {
    if (p == plan_)
        return;
    if (plan_)
        disconnect(plan_, nullptr, this, nullptr);
    plan_ = p;
    reset();
    if (p) {
        connect(p, &Plan::documentChanged, this, [this] {
            if (plan_->rows() == shown_)
                return;
            shown_ = plan_->rows();
            const int n = int(plan_->rows().size());
            if (n != rows_)
                reset();
            else if (n > 0)
                emit dataChanged(index(0), index(n - 1));
            emit changed();
        });
        connect(p, &Plan::resultChanged, this, [this] {
            const QString e = plan_->errorField() + '\n' + plan_->errorMessage();
            if (e == shown_error_)
                return;
            shown_error_ = e;
            if (rows_ > 0)
                emit dataChanged(index(0), index(rows_ - 1), {RowErrorRole, RowErrorFieldRole});
        });
    }
    emit planChanged();
    emit changed();
}

void SequenceRowsModel::reset() {
    beginResetModel();
    rows_ = plan_ ? int(plan_->rows().size()) : 0;
    endResetModel();
}

int SequenceRowsModel::totalInjections() const {
    int n = 0;
    if (plan_)
        for (const QJsonValue& r : plan_->rows())
            n += r.toObject().value("injections").toInt();
    return n;
}

int SequenceRowsModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : rows_;
}

QHash<int, QByteArray> SequenceRowsModel::roleNames() const {
    return {{MethodRole, "method"},
            {InjectionsRole, "injections"},
            {LabelRole, "label"},
            {RowErrorRole, "rowError"},
            {RowErrorFieldRole, "rowErrorField"}};
}

QVariant SequenceRowsModel::data(const QModelIndex& index, int role) const {
    if (!plan_ || !index.isValid())
        return {};
    const QJsonArray rows = plan_->rows();
    if (index.row() >= rows.size())
        return {};
    const QJsonObject r = rows.at(index.row()).toObject();
    const QString prefix = QStringLiteral("sequence[%1]").arg(index.row());
    const bool mine = plan_->errorUnder(prefix);
    switch (role) {
    case MethodRole:
        return r.value("method").toString();
    case InjectionsRole:
        return r.value("injections").toInt();
    case LabelRole:
        return r.value("label").toString();
    case RowErrorRole:
        return mine ? plan_->errorMessage() : QString();
    case RowErrorFieldRole:
        return mine ? plan_->errorField().mid(prefix.size() + 1) : QString();
    }
    return {};
}

void SequenceRowsModel::edit(int row, const char* key, const QJsonValue& v) {
    if (!plan_)
        return;
    QJsonArray rows = plan_->rows();
    if (row < 0 || row >= rows.size())
        return;
    QJsonObject r = rows[row].toObject();
    r.insert(QLatin1String(key), v);
    rows[row] = r;
    plan_->setRows(rows);
}

void SequenceRowsModel::setMethod(int row, const QString& method) {
    edit(row, "method", method);
}
void SequenceRowsModel::setInjections(int row, int injections) {
    edit(row, "injections", injections);
}
void SequenceRowsModel::setLabel(int row, const QString& label) {
    edit(row, "label", label);
}

void SequenceRowsModel::addRow() {
    if (!plan_)
        return;
    QJsonArray rows = plan_->rows();
    QJsonObject r = rows.isEmpty()
                        ? QJsonObject{{"method", plan_->methodNames().value(0)}, {"injections", 1}}
                        : rows.last().toObject();
    r.insert("label", tr("row %1").arg(rows.size() + 1));
    rows.append(r);
    plan_->setRows(rows);
}

void SequenceRowsModel::removeRow(int row) {
    if (!plan_)
        return;
    QJsonArray rows = plan_->rows();
    if (row < 0 || row >= rows.size())
        return;
    const QJsonObject gone = rows.at(row).toObject();
    rows.removeAt(row);
    plan_->setRows(rows);
    removed_ = std::make_pair(row, gone);
    const QString label = gone.value("label").toString();
    undo_text_ = label.isEmpty() ? tr("Sequence row %1 removed").arg(row + 1)
                                 : tr("Sequence row %1 (“%2”) removed").arg(row + 1).arg(label);
    emit undoChanged();
}

void SequenceRowsModel::undoRemove() {
    if (!plan_ || !removed_)
        return;
    QJsonArray rows = plan_->rows();
    rows.insert(std::min<qsizetype>(removed_->first, rows.size()), removed_->second);
    plan_->setRows(rows);
    removed_.reset();
    undo_text_.clear();
    emit undoChanged();
}

void SequenceRowsModel::moveRow(int from, int to) {
    if (!plan_)
        return;
    QJsonArray rows = plan_->rows();
    if (from < 0 || from >= rows.size() || to < 0 || to >= rows.size() || from == to)
        return;
    const QJsonValue v = rows.takeAt(from);
    rows.insert(to, v);
    plan_->setRows(rows);
}

} // namespace phaseplan::gui
