#include "app_runner.h"

#include "layout_audit.h"
#include "storage/sql_dialect.h"
#include "tablet_settings.h"
#include "workspace.h"

#include <QAccessible>
#include <QApplication>
#include <QCommandLineParser>
#include <QDir>
#include <QElapsedTimer>
#include <QEventLoop>
#include <QImage>
#include <QMutex>
#include <QPalette>
#include <QQmlApplicationEngine>
#include <QQuickStyle>
#include <QQuickWindow>
#include <QScreen>
#include <QTemporaryDir>
#include <QTimer>

#include <algorithm>
#include <cstdio>
#include <ctime>
#include <vector>

namespace phaseplan::gui {

namespace {

QElapsedTimer& clock() {
    static QElapsedTimer t;
    return t;
}

// Every warning, critical and fatal message, counted for the checking seams.
QMutex messages_mutex;
int problem_count = 0;
QtMessageHandler previous_handler = nullptr;

void counting_handler(QtMsgType type, const QMessageLogContext& ctx, const QString& msg) {
    if (type == QtWarningMsg || type == QtCriticalMsg || type == QtFatalMsg) {
        QMutexLocker lock(&messages_mutex);
        ++problem_count;
    }
    if (previous_handler)
        previous_handler(type, ctx, msg);
}

int problems() {
    QMutexLocker lock(&messages_mutex);
    return problem_count;
}

// Waits until the window has rendered a frame (or `timeout_ms` passed), then lets queued work run.
void wait_for_frame(QQuickWindow* win, int timeout_ms = 1000) {
    QEventLoop loop;
    QObject::connect(win, &QQuickWindow::frameSwapped, &loop, &QEventLoop::quit);
    QTimer::singleShot(timeout_ms, &loop, &QEventLoop::quit);
    win->requestUpdate();
    loop.exec();
    QCoreApplication::processEvents();
}

struct Orientation {
    const char* name;
    int width;
    int height;
};
constexpr Orientation orientations[] = {{"landscape", 1280, 800}, {"portrait", 800, 1280}};

// Renders every screen in both orientations; with `audit`, counts there every layout problem
// (audit_layout) and prints it.
int render_screens(QQuickWindow* win, const QString& dir, int* audit = nullptr) {
    const QStringList keys = win->property("screenKeys").toStringList();
    if (keys.isEmpty()) {
        std::fprintf(stderr, "phaseplan: the main window lists no screens (screenKeys)\n");
        return 1;
    }
    if (!dir.isEmpty() && !QDir().mkpath(dir)) {
        std::fprintf(stderr, "phaseplan: cannot create %s\n", qPrintable(dir));
        return 1;
    }
    for (const Orientation& o : orientations) {
        win->resize(o.width, o.height);
        for (int i = 0; i < keys.size(); ++i) {
            win->setProperty("currentScreen", i);
            // Two frames: the first lays out after the resize or the switch, the second settles
            // anything that depends on the first layout (list views, charts' plot area).
            wait_for_frame(win);
            wait_for_frame(win);
            if (audit) {
                const double ppmm = px_per_mm(win);
                for (const LayoutProblem& p : audit_layout(win, ppmm)) {
                    std::fprintf(stderr, "phaseplan: %s, %s: %s: %s %s\n", qPrintable(keys[i]),
                                 o.name, qPrintable(p.kind), qPrintable(p.what),
                                 qPrintable(p.detail));
                    ++*audit;
                }
            }
            if (dir.isEmpty())
                continue;
            QImage img = win->grabWindow();
            const QString file =
                QStringLiteral("%1/%2-%3.png").arg(dir, keys[i], QLatin1String(o.name));
            if (img.isNull() || !img.save(file)) {
                std::fprintf(stderr, "phaseplan: could not write %s\n", qPrintable(file));
                return 1;
            }
            std::printf("wrote %s (%dx%d)\n", qPrintable(file), img.width(), img.height());
        }
    }
    return 0;
}

/// CPU time of the whole process (every thread), in ms: what an edit costs the machine, which
/// other processes sharing the cores do not inflate the way they inflate the wall clock.
double process_cpu_ms() {
    timespec ts{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return double(ts.tv_sec) * 1e3 + double(ts.tv_nsec) / 1e6;
}

double median(std::vector<double> v) {
    if (v.empty())
        return 0;
    std::sort(v.begin(), v.end());
    return v[v.size() / 2];
}

/// Where start-up went, in ms from main() (wall clock): the phases of run_app.
struct StartupMarks {
    double open_begin = 0, open_end = 0, qml_end = 0;
    Workspace::OpenTimes open;
};

// Edits the buffer designer's target pH repeatedly and times each edit up to the next frame.
int measure(QQuickWindow* win, double startup_ms, const StartupMarks& m) {
    std::printf("start-up (main() to first frame): %.0f ms\n", startup_ms);
    std::printf("  before the database: %.0f ms; workspace open: %.0f ms (data %.0f, database "
                "open/migrate/seed %.0f, shipped library sync %.0f, merged library %.0f); QML "
                "load and first models: %.0f ms; first frame: %.0f ms\n",
                m.open_begin, m.open_end - m.open_begin, m.open.data_ms, m.open.database_ms,
                m.open.sync_ms, m.open.library_ms, m.qml_end - m.open_end, startup_ms - m.qml_end);
    QObject* designer = win->findChild<QObject*>(QStringLiteral("designer"));
    if (!designer) {
        std::fprintf(stderr, "phaseplan: no object named \"designer\" in the main window\n");
        return 1;
    }
    const QStringList keys = win->property("screenKeys").toStringList();
    win->setProperty("currentScreen", std::max(0, int(keys.indexOf(QStringLiteral("buffer")))));
    wait_for_frame(win);
    wait_for_frame(win);
    // The edits are timed once every screen is made: after the first frame, Main.qml makes the
    // others one per turn of the event loop, which is the end of start-up, not an edit.
    for (int n = 0; n < 200 && win->property("screensMade").toInt() < keys.size(); ++n)
        wait_for_frame(win, 50);
    const double ph0 = designer->property("targetPh").toDouble();
    std::vector<double> total_ms, sync_ms, deferred_ms, model_ms, idle_ms, cpu_ms;
    std::vector<double> parts_ms[3];
    for (int i = 0; i < 30; ++i) {
        // A frame with nothing changed: what the renderer costs by itself.
        QElapsedTimer t;
        t.start();
        win->update();
        wait_for_frame(win);
        idle_ms.push_back(t.nsecsElapsed() / 1e6);
    }
    for (int i = 0; i < 60; ++i) {
        QElapsedTimer t;
        t.start();
        const double cpu0 = process_cpu_ms();
        designer->setProperty("targetPh", ph0 + 0.02 * ((i % 10) - 5));
        // The edit's synchronous part: the model's recompute and every QML binding it touches.
        sync_ms.push_back(t.nsecsElapsed() / 1e6);
        // What the edit set off for the next turn of the event loop: the plan, the lines, the
        // checks, and whatever shows them on the other screens.
        QElapsedTimer d;
        d.start();
        // Timed one by one (each with the views it updates), then whatever else is queued.
        int k = 0;
        for (const char* name : {"plan", "lines", "checks"}) {
            QElapsedTimer part;
            part.start();
            if (QObject* m = win->findChild<QObject*>(QString::fromLatin1(name)))
                QMetaObject::invokeMethod(m, std::string(name) == "checks" ? "refreshNow"
                                                                           : "recomputeNow");
            parts_ms[k++].push_back(part.nsecsElapsed() / 1e6);
        }
        QCoreApplication::processEvents();
        deferred_ms.push_back(d.nsecsElapsed() / 1e6);
        wait_for_frame(win);
        total_ms.push_back(t.nsecsElapsed() / 1e6);
        cpu_ms.push_back(process_cpu_ms() - cpu0);
        model_ms.push_back(designer->property("lastRecomputeMs").toDouble());
        if (qEnvironmentVariableIsSet("PHASEPLAN_MEASURE_EACH"))
            std::printf("edit %2d: %6.2f ms, CPU %.2f ms (sync %.2f, deferred %.2f: plan %.2f, "
                        "lines %.2f, checks %.2f; frame %.2f)\n",
                        i, total_ms.back(), cpu_ms.back(), sync_ms.back(), deferred_ms.back(),
                        parts_ms[0].back(), parts_ms[1].back(), parts_ms[2].back(),
                        total_ms.back() - sync_ms.back() - deferred_ms.back());
    }
    designer->setProperty("targetPh", ph0);
    std::printf("buffer recompute in the model (median of %zu edits): %.2f ms\n", model_ms.size(),
                median(model_ms));
    std::printf("edit handled, model + QML bindings (median): %.2f ms\n", median(sync_ms));
    std::printf("deferred updates: plan, lines, checks, other screens (median): %.2f ms "
                "(plan %.2f, lines %.2f, checks %.2f, each with its views)\n",
                median(deferred_ms), median(parts_ms[0]), median(parts_ms[1]), median(parts_ms[2]));
    std::printf(
        "edit to next frame swapped, recompute + redraw (median): %.2f ms, max %.2f ms, "
        "%d of %zu edits over 16 ms\n",
        median(total_ms), *std::max_element(total_ms.begin(), total_ms.end()),
        int(std::count_if(total_ms.begin(), total_ms.end(), [](double ms) { return ms > 16; })),
        total_ms.size());
    std::printf("CPU time of the process from the edit to its frame (median): %.2f ms, max %.2f "
                "ms\n",
                median(cpu_ms), *std::max_element(cpu_ms.begin(), cpu_ms.end()));
    std::printf("a frame with nothing changed (median): %.2f ms\n", median(idle_ms));
    for (const char* name : {"plan", "lines"}) {
        if (QObject* m = win->findChild<QObject*>(QString::fromLatin1(name)))
            std::printf("%s recompute in the model (last): %.2f ms\n", name,
                        m->property("lastRecomputeMs").toDouble());
    }
    return 0;
}

// What a dark system theme hands the app: the views take every colour from the palette.
QPalette dark_palette() {
    QPalette p;
    const QColor window(0x2b, 0x2d, 0x30), base(0x1e, 0x1f, 0x22), text(0xe8, 0xe8, 0xe8);
    const QColor button(0x3a, 0x3c, 0x40), highlight(0x3d, 0x8e, 0xd8), dim(0x80, 0x80, 0x80);
    for (QPalette::ColorGroup g : {QPalette::Active, QPalette::Inactive}) {
        p.setColor(g, QPalette::Window, window);
        p.setColor(g, QPalette::WindowText, text);
        p.setColor(g, QPalette::Base, base);
        p.setColor(g, QPalette::AlternateBase, window);
        p.setColor(g, QPalette::Text, text);
        p.setColor(g, QPalette::Button, button);
        p.setColor(g, QPalette::ButtonText, text);
        p.setColor(g, QPalette::Highlight, highlight);
        p.setColor(g, QPalette::HighlightedText, Qt::white);
        p.setColor(g, QPalette::PlaceholderText, dim);
        p.setColor(g, QPalette::ToolTipBase, base);
        p.setColor(g, QPalette::ToolTipText, text);
    }
    p.setColor(QPalette::Disabled, QPalette::WindowText, dim);
    p.setColor(QPalette::Disabled, QPalette::Text, dim);
    p.setColor(QPalette::Disabled, QPalette::ButtonText, dim);
    p.setColor(QPalette::Disabled, QPalette::Window, window);
    p.setColor(QPalette::Disabled, QPalette::Base, base);
    p.setColor(QPalette::Disabled, QPalette::Button, button);
    return p;
}

} // namespace

void start_clock() {
    clock().start();
}
double elapsed_since_start_ms() {
    return clock().isValid() ? clock().nsecsElapsed() / 1e6 : 0;
}

void prepare_engine(QQmlEngine& engine) {
    // The module's files come from the resources linked into the binary.
    engine.addImportPath(QStringLiteral("qrc:/"));
}

namespace {

/// What the user chose when the lab database did not open (qml/DatabaseStart.qml).
struct StartChoice {
    QString what; ///< "password", "retry", "own-file" or "quit"
    QString password;
};

/// Asks, in a small window of its own before the main window exists, for the lab database's
/// password (`ask_password`) or what to do when it cannot be reached. The password goes only
/// into this process's memory (storage::sql::set_typed_password).
StartChoice ask_database_start(const storage::sql::PgLocation& loc, bool ask_password,
                               const QString& message) {
    QQmlApplicationEngine engine;
    prepare_engine(engine);
    engine.setInitialProperties(
        {{QStringLiteral("address"), loc.where()},
         {QStringLiteral("user"),
          loc.user.isEmpty() ? QStringLiteral("(your login name)") : loc.user},
         {QStringLiteral("askPassword"), ask_password},
         {QStringLiteral("message"), message}});
    engine.load(QUrl(QStringLiteral("qrc:/PhasePlan/DatabaseStart.qml")));
    if (engine.rootObjects().isEmpty())
        return {QStringLiteral("quit"), {}};
    QObject* win = engine.rootObjects().first();
    QEventLoop loop;
    QObject::connect(win, SIGNAL(decided()), &loop, SLOT(quit()));
    loop.exec();
    StartChoice c{win->property("choice").toString(), win->property("typed").toString()};
    win->setProperty("typed", QString());
    return c;
}

} // namespace

int run_app(QApplication& app) {
    QCoreApplication::setOrganizationName(QStringLiteral("PhasePlan"));
    QCoreApplication::setApplicationName(QStringLiteral("PhasePlan"));
    QCoreApplication::setApplicationVersion(QStringLiteral("0.1"));
    // Fusion follows the platform palette (light or dark) and draws plain, large controls.
    QQuickStyle::setStyle(QStringLiteral("Fusion"));

    QCommandLineParser parser;
    parser.setApplicationDescription(QStringLiteral("Mobile-phase and buffer preparation planner"));
    parser.addHelpOption();
    parser.addVersionOption();
    QCommandLineOption database_opt(QStringLiteral("database"),
                                    QStringLiteral("Use this SQLite file, or the lab's PostgreSQL "
                                                   "database: postgresql://user@host:port/dbname "
                                                   "(the password comes from ~/.pgpass)."),
                                    QStringLiteral("FILE|URI"));
    QCommandLineOption data_opt(QStringLiteral("data"), QStringLiteral("Reference data folder."),
                                QStringLiteral("DIR"));
    QCommandLineOption screenshot_opt(
        QStringLiteral("screenshot"),
        QStringLiteral("Render each screen in both orientations to DIR and exit."),
        QStringLiteral("DIR"));
    QCommandLineOption selftest_opt(
        QStringLiteral("self-test"),
        QStringLiteral("Load and render every screen, exit 1 on any QML warning."));
    QCommandLineOption measure_opt(
        QStringLiteral("measure"),
        QStringLiteral("Print start-up and recompute+redraw times, then exit."));
    QCommandLineOption dark_opt(
        QStringLiteral("dark"),
        QStringLiteral("Use a dark palette, as a dark system theme gives (for checking)."));
    QCommandLineOption keyboard_opt(
        QStringLiteral("keyboard"),
        QStringLiteral("On-screen keyboard on or off (kept for the next starts)."),
        QStringLiteral("on|off"));
    QCommandLineOption no_demo_opt(
        QStringLiteral("no-demo"),
        QStringLiteral("A new database starts empty (no demo, no accounts): the lab's first run."));
    parser.addOptions({database_opt, data_opt, screenshot_opt, selftest_opt, measure_opt, dark_opt,
                       keyboard_opt, no_demo_opt});
    parser.process(app);
    if (parser.isSet(dark_opt))
        QApplication::setPalette(dark_palette());

    const bool checking =
        parser.isSet(screenshot_opt) || parser.isSet(selftest_opt) || parser.isSet(measure_opt);
    if (checking)
        previous_handler = qInstallMessageHandler(counting_handler);

    // The checking seams start from a fresh database (first run: the demo) unless one is given.
    QTemporaryDir temp;
    QString db_path = parser.value(database_opt);
    if (db_path.isEmpty() && checking)
        db_path = temp.filePath(QStringLiteral("phaseplan.sqlite"));
    if (db_path.isEmpty())
        db_path = saved_database_location(); // the settings' choice; "" is this tablet's file
    set_database_in_use(db_path.isEmpty() ? storage::Database::default_path() : db_path);

    Workspace workspace;
    workspace.setDatabasePath(db_path);
    workspace.setDataDir(parser.value(data_opt));
    workspace.setSeedDemo(!parser.isSet(no_demo_opt));
    StartupMarks marks;
    marks.open_begin = elapsed_since_start_ms();
    // The lab's server may want a password that ~/.pgpass does not hold, or be out of reach:
    // ask (not in the checking seams, which run unattended) until it opens, the user turns to
    // this tablet's own file, or quits.
    while (!workspace.open()) {
        const bool lab = storage::sql::is_postgresql_uri(db_path);
        if (checking || !lab) {
            std::fprintf(stderr, "phaseplan: %s\n", qPrintable(workspace.errorMessage()));
            return 2;
        }
        const bool wants_password = workspace.errorField() == QLatin1String("database.password");
        QString why = workspace.errorSentence();
        why = why.left(1).toUpper() + why.mid(1);
        if (!why.endsWith(QLatin1Char('?')) && !why.endsWith(QLatin1Char('.')))
            why += QLatin1Char('.');
        const StartChoice c = ask_database_start(
            storage::sql::parse_postgresql_uri(db_path), wants_password,
            wants_password && !storage::sql::has_typed_password() ? QString() : why);
        if (c.what == QLatin1String("password")) {
            storage::sql::set_typed_password(c.password);
        } else if (c.what == QLatin1String("own-file")) {
            db_path = storage::Database::default_path();
            workspace.setDatabasePath(db_path);
            set_database_in_use(db_path);
        } else if (c.what != QLatin1String("retry")) {
            std::fprintf(stderr, "phaseplan: %s\n", qPrintable(workspace.errorMessage()));
            return 2;
        }
    }

    marks.open_end = elapsed_since_start_ms();
    marks.open = workspace.openTimes();

    // The self-test reads the accessible names as a screen reader would: Qt Quick controls fill
    // them in only while accessibility is active.
    if (parser.isSet(selftest_opt))
        QAccessible::setActive(true);

    QQmlApplicationEngine engine;
    prepare_engine(engine);
    engine.setInitialProperties({{QStringLiteral("workspace"), QVariant::fromValue(&workspace)}});
    double first_frame_ms = -1;
    QObject::connect(
        &engine, &QQmlApplicationEngine::objectCreated, &app, [&](QObject* obj, const QUrl&) {
            if (auto* w = qobject_cast<QQuickWindow*>(obj))
                QObject::connect(w, &QQuickWindow::frameSwapped, &app, [&first_frame_ms] {
                    if (first_frame_ms < 0)
                        first_frame_ms = elapsed_since_start_ms();
                });
        });
    engine.load(QUrl(QStringLiteral("qrc:/PhasePlan/Main.qml")));
    if (engine.rootObjects().isEmpty()) {
        std::fprintf(stderr, "phaseplan: the main window did not load\n");
        return 1;
    }
    marks.qml_end = elapsed_since_start_ms();
    auto* win = qobject_cast<QQuickWindow*>(engine.rootObjects().first());
    if (!win) {
        std::fprintf(stderr, "phaseplan: Main.qml is not a window\n");
        return 1;
    }
    if (!checking)
        return app.exec();

    win->show();
    wait_for_frame(win, 3000);
    if (first_frame_ms < 0)
        first_frame_ms = elapsed_since_start_ms();
    int status = 0;
    if (parser.isSet(measure_opt))
        status = measure(win, first_frame_ms, marks);
    else {
        int layout_problems = 0;
        status = render_screens(win, parser.value(screenshot_opt),
                                parser.isSet(selftest_opt) ? &layout_problems : nullptr);
        if (parser.isSet(selftest_opt)) {
            const QScreen* s = win->screen();
            std::printf("self-test: %lld screens in 2 orientations at %.0f dpi (%.2f px/mm), %d "
                        "layout problem(s)\n",
                        static_cast<long long>(win->property("screenKeys").toStringList().size()),
                        s ? s->physicalDotsPerInch() : 0.0, px_per_mm(win), layout_problems);
            if (layout_problems > 0)
                status = 1;
        }
    }
    const int n = problems();
    if (n > 0) {
        std::fprintf(stderr, "phaseplan: %d QML warning(s) or error(s), see above\n", n);
        status = 1;
    }
    return status;
}

} // namespace phaseplan::gui
