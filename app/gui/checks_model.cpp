#include "checks_model.h"

#include "buffer_designer.h"
#include "field_path.h"
#include "field_words.h"
#include "lines_model.h"
#include "plan.h"
#include "workspace.h"

#include <algorithm>
#include <map>

namespace phaseplan::gui {

namespace {

int severity_rank(const QString& s) {
    if (s == QLatin1String("error"))
        return 0;
    if (s == QLatin1String("warning"))
        return 1;
    if (s == QLatin1String("caution"))
        return 2;
    return 3;
}

} // namespace

QString ChecksModel::adviceFor(const QString& code) {
    // What to do at the bench. Advice only: the numbers are in the core's message beside it.
    static const std::map<QString, const char*> advice = {
        {"input", QT_TR_NOOP("Correct the field it names; nothing is planned until it is valid.")},
        {"ph-outside-pka-range",
         QT_TR_NOOP("Choose a buffer system with a pKa within one unit of the target pH, "
                    "or accept weaker buffering and check the pH on the meter.")},
        {"low-buffer-capacity",
         QT_TR_NOOP("Raise the buffer concentration, or choose a system whose pKa lies "
                    "closer to the target pH.")},
        {"small-amount",
         QT_TR_NOOP("Make a larger volume, or prepare a stock solution and dilute it.")},
        {"titrant-volume-large",
         QT_TR_NOOP("Use a more concentrated titrant so that the final volume is "
                    "reached with water.")},
        {"ionic-strength-high",
         QT_TR_NOOP("Lower the concentration if the method allows; measure the pH of the "
                    "finished buffer with a calibrated meter.")},
        {"uv-cutoff",
         QT_TR_NOOP("Set the detector to a longer wavelength, or change to a modifier or solvent "
                    "with a lower UV cutoff.")},
        {"immiscible",
         QT_TR_NOOP("Do not let these liquids meet in one bottle or in the mixer; flush the "
                    "system with a solvent that mixes with both when changing between them.")},
        {"precipitation",
         QT_TR_NOOP("Lower the salt concentration or the highest organic percentage the "
                    "gradient reaches; wash out salt with a low-organic mixture before a "
                    "high-organic flush.")},
        {"ms-nonvolatile",
         QT_TR_NOOP("Use a volatile buffer or additive with this detector, or divert the "
                    "flow away from the source.")},
        {"column-ph",
         QT_TR_NOOP("Bring the line's pH into the column's stated range, or use a column rated "
                    "for this pH.")},
        {"shelf-life",
         QT_TR_NOOP("Prepare the buffer fresh closer to the start, or shorten the sequence.")},
        {"runs-dry",
         QT_TR_NOOP("Fill at least the suggested bottle volume before the start, or split the "
                    "sequence and plan a refill.")},
        {"waste-overflow",
         QT_TR_NOOP("Empty the waste container before the start, or use a larger one.")},
        {"buffer-range",
         QT_TR_NOOP("Choose a buffer whose pKa in the eluent lies within one unit of its pH, "
                    "or keep the organic share lower where the buffer must hold the pH.")},
        {"pressure-limit",
         QT_TR_NOOP("Lower the flow, raise the column temperature, or use a column with "
                    "larger particles or a wider bore; check the frit and guard column.")},
        {"pressure-uncalibrated",
         QT_TR_NOOP("Enter a pressure read on this column at a known flow and "
                    "composition, so the estimate is scaled to the real column.")},
        {"pressure-no-limit",
         QT_TR_NOOP("Enter the column's and the pump's pressure limits to have the "
                    "plan checked against them.")},
        {"pressure-unknown",
         QT_TR_NOOP("Enter the column's length, inner diameter and particle size to have "
                    "the pressure estimated.")},
        {"viscosity-estimate",
         QT_TR_NOOP("The viscosity of this mixture is estimated; read the pressure on "
                    "the first injection and compare.")},
        {"eluent-ph-extrapolated",
         QT_TR_NOOP("The pH in the eluent is an estimate beyond measured data; "
                    "treat it as a guide and confirm retention on a test injection.")},
        {"eluent-temperature",
         QT_TR_NOOP("The pH shift with organic is known at 25 °C only; at another "
                    "column temperature treat it as a guide.")},
        {"buffer-scaled",
         QT_TR_NOOP("The buffer was scaled to the line's volume; check the amounts on the "
                    "recipe sheet before weighing.")},
    };
    auto it = advice.find(code);
    if (it != advice.end())
        return tr(it->second);
    return tr("Read the message; if it is what you meant, nothing needs doing.");
}

QString ChecksModel::focusFor(const QString& code, const QString& line, const QVariantMap& w) {
    const QString l = line.left(1);
    if (code == QLatin1String("ph-outside-pka-range"))
        return QStringLiteral("target_ph");
    if (code == QLatin1String("low-buffer-capacity") ||
        code == QLatin1String("ionic-strength-high"))
        return QStringLiteral("concentration_mol_per_l");
    if (code == QLatin1String("small-amount"))
        return QStringLiteral("volume_ml");
    if (code == QLatin1String("titrant-volume-large"))
        return QStringLiteral("titrant_mol_per_l");
    if (code == QLatin1String("uv-cutoff"))
        return QStringLiteral("detector.wavelength_nm");
    if (code == QLatin1String("column-ph"))
        return QStringLiteral("column.ph_max");
    if (code == QLatin1String("waste-overflow"))
        return QStringLiteral("waste_ml");
    if (code == QLatin1String("buffer-range") && !l.isEmpty())
        return QStringLiteral("lines.%1.parts").arg(l);
    // A check's finding names its subject and place typed (Plan adds them: finding_references).
    const QVariantMap subject = w.value("subject").toMap();
    const QVariantMap place = w.value("place").toMap();
    const bool in_method = place.value("kind").toString() == QLatin1String("method");
    if (code == QLatin1String("pressure-limit")) {
        const QString m = subject.value("kind").toString() == QLatin1String("method")
                              ? subject.value("id").toString()
                              : w.value("method").toString();
        if (!m.isEmpty())
            return QStringLiteral("methods.%1.flow_ml_min").arg(m);
    }
    if (code == QLatin1String("runs-dry") && !l.isEmpty())
        return QStringLiteral("lines.%1.bottle_ml").arg(l);
    if (code == QLatin1String("shelf-life") && !l.isEmpty())
        return QStringLiteral("lines.%1.prepared_at").arg(l);
    if (code == QLatin1String("ms-nonvolatile") && !l.isEmpty())
        return QStringLiteral("lines.%1.parts").arg(l);
    if (code == QLatin1String("precipitation") || code == QLatin1String("immiscible")) {
        if (in_method && !place.value("id").toString().isEmpty())
            return QStringLiteral("methods.%1.gradient[0]").arg(place.value("id").toString());
        if (!l.isEmpty())
            return QStringLiteral("lines.%1.parts").arg(l);
    }
    return {};
}

ChecksModel::ChecksModel(QObject* parent) : QAbstractListModel(parent) {
    // The three sources often change together (a buffer edit changes its line and the plan):
    // gather once, on the next turn of the event loop.
    rebuild_timer_.setSingleShot(true);
    rebuild_timer_.setInterval(0);
    connect(&rebuild_timer_, &QTimer::timeout, this, &ChecksModel::rebuild);
}

void ChecksModel::setPlan(Plan* p) {
    if (p == plan_)
        return;
    if (plan_)
        disconnect(plan_, nullptr, &rebuild_timer_, nullptr);
    plan_ = p;
    if (p)
        connect(p, &Plan::resultChanged, &rebuild_timer_, qOverload<>(&QTimer::start));
    emit sourcesChanged();
    rebuild();
}

void ChecksModel::setLines(LinesModel* l) {
    if (l == lines_)
        return;
    if (lines_)
        disconnect(lines_, nullptr, &rebuild_timer_, nullptr);
    lines_ = l;
    if (l)
        connect(l, &LinesModel::computed, &rebuild_timer_, qOverload<>(&QTimer::start));
    emit sourcesChanged();
    rebuild();
}

void ChecksModel::setDesigner(BufferDesigner* d) {
    if (d == designer_)
        return;
    if (designer_)
        disconnect(designer_, nullptr, &rebuild_timer_, nullptr);
    designer_ = d;
    if (d)
        connect(d, &BufferDesigner::resultChanged, &rebuild_timer_, qOverload<>(&QTimer::start));
    emit sourcesChanged();
    rebuild();
}

int ChecksModel::warningCount() const {
    return int(std::count_if(entries_.begin(), entries_.end(), [](const Entry& e) {
        return e.severity == QLatin1String("warning") || e.severity == QLatin1String("error");
    }));
}

namespace {
/// The screen that shows the field `focus` names: a line's field ("lines.B.bottle_ml", named by
/// the night's runs-dry check) is on the Lines screen whichever list the finding came in.
QString screen_of(const QString& screen, const QString& focus) {
    return FieldPath::belongs(focus, QStringLiteral("lines")) ? QStringLiteral("lines") : screen;
}
} // namespace

void ChecksModel::rebuild() {
    std::vector<Entry> out;
    const QStringList methods = plan_ ? plan_->methodNames() : QStringList();
    auto add_list = [&](const QVariantList& list, const QString& source, const QString& screen,
                        const QString& focus_prefix) {
        for (const QVariant& v : list) {
            const QVariantMap w = v.toMap();
            const QString code = w.value("code").toString();
            const QString line = w.value("line").toString();
            QString src = source;
            if (src.isEmpty())
                src = line.isEmpty() ? tr("Sequence")
                      : line.size() > 1
                          ? tr("Lines %1")
                                .arg(line.split(QString(), Qt::SkipEmptyParts).join(tr(" and ")))
                          : tr("Line %1").arg(line);
            QString focus = focusFor(code, line, w);
            if (focus.isEmpty() && !focus_prefix.isEmpty())
                focus = focus_prefix + QStringLiteral("parts");
            out.push_back({w.value("severity").toString(), code, w.value("message").toString(),
                           adviceFor(code), src, screen_of(screen, focus), focus});
        }
    };
    auto add_error = [&](const QString& field, const QString& message, const QString& source,
                         const QString& screen, const QString& prefix) {
        if (message.isEmpty())
            return;
        const QString path = prefix + field;
        const QString place = field_words(path, methods);
        out.push_back({QStringLiteral("error"), QStringLiteral("input"),
                       place.isEmpty() ? message : place + QStringLiteral(": ") + message,
                       adviceFor("input"), source, screen_of(screen, path), path});
    };
    if (designer_) {
        const QString src = tr("Buffer “%1”").arg(designer_->bufferName());
        add_error(designer_->errorField(), designer_->errorMessage(), src, "buffer", QString());
        add_list(designer_->warnings(), src, "buffer", QString());
    }
    // The sequence's findings first: a line's own check of the same code and line says the same.
    std::vector<Entry> sequence;
    if (plan_) {
        std::vector<Entry> saved;
        std::swap(saved, out);
        add_error(plan_->errorField(), plan_->errorMessage(), tr("Sequence"), "sequence",
                  QString());
        add_list(plan_->warnings(), QString(), "sequence", QString());
        std::swap(saved, out);
        sequence = std::move(saved);
    }
    if (lines_) {
        for (int r = 0; r < lines_->rowCount(); ++r) {
            if (!lines_->current(r, LinesModel::DefinedRole).toBool())
                continue;
            const QString letter = lines_->current(r, LinesModel::LetterRole).toString();
            const QString src = tr("Line %1").arg(letter);
            add_error(lines_->current(r, LinesModel::ErrorFieldRole).toString(),
                      lines_->current(r, LinesModel::ErrorMessageRole).toString(), src, "lines",
                      QStringLiteral("lines.%1.").arg(letter));
            std::vector<Entry> own;
            std::swap(own, out);
            add_list(lines_->current(r, LinesModel::WarningsRole).toList(), src, "lines",
                     QStringLiteral("lines.%1.").arg(letter));
            std::swap(own, out);
            for (Entry& e : own) {
                const bool said =
                    std::any_of(sequence.begin(), sequence.end(), [&](const Entry& s) {
                        return s.code == e.code && s.source == e.source;
                    });
                if (!said)
                    out.push_back(std::move(e));
            }
        }
    }
    for (Entry& e : sequence)
        out.push_back(std::move(e));
    // A finding appears once.
    std::vector<Entry> unique;
    for (Entry& e : out)
        if (std::none_of(unique.begin(), unique.end(), [&](const Entry& u) {
                return u.code == e.code && u.message == e.message;
            }))
            unique.push_back(std::move(e));
    out = std::move(unique);
    std::stable_sort(out.begin(), out.end(), [](const Entry& a, const Entry& b) {
        return severity_rank(a.severity) < severity_rank(b.severity);
    });
    rebuild_timer_.stop();
    if (out == entries_)
        return; // nothing new: the list on screen stays as it is
    beginResetModel();
    entries_ = std::move(out);
    endResetModel();
    emit countChanged();
}

int ChecksModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(entries_.size());
}

QHash<int, QByteArray> ChecksModel::roleNames() const {
    return {{SeverityRole, "severity"}, {CodeRole, "code"},     {MessageRole, "message"},
            {AdviceRole, "advice"},     {SourceRole, "source"}, {ScreenRole, "screen"},
            {FocusRole, "focusPath"}};
}

QVariant ChecksModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() >= int(entries_.size()))
        return {};
    const Entry& e = entries_[index.row()];
    switch (role) {
    case SeverityRole:
        return e.severity;
    case CodeRole:
        return e.code;
    case MessageRole:
        return e.message;
    case AdviceRole:
        return e.advice;
    case SourceRole:
        return e.source;
    case ScreenRole:
        return e.screen;
    case FocusRole:
        return e.focus;
    }
    return {};
}

} // namespace phaseplan::gui
