#pragma once
// Shared helpers for the QtTest executables: the shipped library, loaded once per process.
#include "chem/line_profiles.h" // tests/chem/line_profiles.h (this folder first)
#include "core/app_data.h"

#include <QByteArray>
#include <QFile>
#include <QJsonDocument>
#include <QJsonObject>
#include <QProcess>
#include <QString>
#include <QTest>

namespace phaseplan::testing {

inline const AppData& shipped_data() {
    static const AppData data = load_app_data(QStringLiteral(SOURCE_DIR "/data"));
    return data;
}

using chem::testing::neat_line; ///< tests/chem/line_profiles.h

inline QJsonObject read_json(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        qFatal("cannot open %s", qPrintable(path));
    return QJsonDocument::fromJson(f.readAll()).object();
}

/// Runs phaseplan-cli with `args` and `stdin_bytes`; returns exit code, stdout and stderr.
struct CliRun {
    int exit_code = -1;
    QByteArray out, err;
};
inline CliRun run_cli(const QStringList& args, const QByteArray& stdin_bytes = {}) {
    QProcess p;
    p.start(QStringLiteral(CLI_PATH), args);
    p.waitForStarted();
    if (!stdin_bytes.isEmpty())
        p.write(stdin_bytes);
    p.closeWriteChannel();
    p.waitForFinished(60000);
    CliRun r;
    r.exit_code = p.exitStatus() == QProcess::NormalExit ? p.exitCode() : -1;
    r.out = p.readAllStandardOutput();
    r.err = p.readAllStandardError();
    return r;
}

/// The bad-input rule of the command-line tool: status 2, nothing on stdout, one line on stderr
/// that starts with the field it names (and contains `contains`, when given).
inline void verify_rejected(const CliRun& r, const QString& field, const QString& contains) {
    QCOMPARE(r.exit_code, 2);
    QVERIFY2(r.out.isEmpty(), r.out.constData());
    const QString err = QString::fromUtf8(r.err).trimmed();
    QVERIFY2(!err.contains('\n'), qPrintable(err));
    QVERIFY2(err.startsWith("phaseplan-cli: " + field + ":"), qPrintable(err));
    if (!contains.isEmpty())
        QVERIFY2(err.contains(contains), qPrintable(err));
}

} // namespace phaseplan::testing
