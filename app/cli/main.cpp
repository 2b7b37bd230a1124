// phaseplan-cli: one JSON document in (a path or - for stdin), one JSON document out.
// Bad input: status 2, one line on stderr naming the field, nothing on stdout.
//
// Built twice (app/CMakeLists.txt). With PHASEPLAN_CLI_FULL it is phaseplan-cli-full, which runs
// every command. Without, it is phaseplan-cli: Qt Core and phaseplan_core only, so that the JSON
// commands start without loading Qt GUI, SQL, Serial Port and their libraries; for `device`,
// `audit`, `user`, `lot`, `db`, `sheet` and `labels` it executes phaseplan-cli-full with the same
// arguments, which then writes every byte of output and gives the exit status.
#include "chem/error.h"
#include "chem/guard.h"
#include "core/app_data.h"
#include "core/commands.h"
#include "core/eluent_commands.h"
#include "core/failure.h"
#include "core/json_util.h"
#include "core/line_commands.h"
#include "core/pressure_commands.h"
#include "core/runtime_dir.h"
#ifdef PHASEPLAN_CLI_FULL
#include "devices/device_cli.h"
#include "storage/records_cli.h"
#endif

#include <QCoreApplication>
#include <QDir>
#include <QFile>
#include <QJsonDocument>
#include <QTextStream>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <functional>
#include <iostream>
#include <map>
#include <memory>

#include <stdlib.h>
#include <sys/stat.h>
#include <termios.h>
#include <unistd.h>

#if defined(PHASEPLAN_WITH_PRINT) && defined(PHASEPLAN_CLI_FULL)
#define PHASEPLAN_CLI_PDF 1
#include "print/print_commands.h"

#include <QGuiApplication>
#endif

namespace {

/// The data folder of an installed program, from the program's folder.
#ifdef PHASEPLAN_CLI_FULL
constexpr const char* installed_data = PHASEPLAN_CLI_FULL_TO_DATA; // from <libexecdir>/phaseplan
#else
constexpr const char* installed_data = "../share/phaseplan/data"; // from <bindir>
#endif

using Command = std::function<QJsonObject(const phaseplan::AppData&, const QJsonObject&,
                                          const phaseplan::CommandOptions&)>;

/// A command that writes its own text (the same bytes as QJsonDocument(run(…)).toJson(Indented),
/// its numbers already held to json::check_output).
using TextCommand = std::function<QByteArray(const phaseplan::AppData&, const QJsonObject&,
                                             const phaseplan::CommandOptions&)>;

struct Entry {
    Command run;
    const char* summary;
    bool needs_gui = false; ///< PDF output needs fonts and a QGuiApplication
    TextCommand text = {};  ///< when set, used instead of run
};

#ifdef PHASEPLAN_WITH_PRINT
#ifdef PHASEPLAN_CLI_PDF
const Command command_sheet = phaseplan::command_sheet;
const Command command_labels = phaseplan::command_labels;
#else
const Command command_sheet, command_labels; // none here: phaseplan-cli-full runs them
#endif
#endif

const std::map<std::string, Entry>& command_table() {
    static const std::map<std::string, Entry> table = {
        {"solve", {phaseplan::command_solve, "speciation, pH, ionic strength of a mixture"}},
        {"recipe", {phaseplan::command_recipe, "amounts to weigh or pipette for a target pH"}},
        {"reagents", {phaseplan::command_reagents, "list the reagent library (no input needed)"}},
        {"line", {phaseplan::command_line, "a mobile-phase line's parts for a bottle volume"}},
        {"sequence",
         {phaseplan::command_sequence, "solvent budget, run-dry times and checks of a sequence",
          false, phaseplan::command_sequence_text}},
        {"pressure", {phaseplan::command_pressure, "column pressure along a method's gradient"}},
        {"transfer",
         {phaseplan::command_transfer, "move a method to another column (USP <621> scaling)"}},
        {"eluent",
         {phaseplan::command_eluent,
          "pH of the water-organic eluent at a pump composition and temperature"}},
#ifdef PHASEPLAN_WITH_PRINT
        {"sheet", {command_sheet, "PDF recipe/line/sequence sheet with its batch (-o FILE)", true}},
        {"labels",
         {command_labels, "PDF bottle labels with QR code of the batch id (-o FILE)", true}},
#endif
    };
    return table;
}

int usage(std::FILE* to) {
    std::fprintf(
        to, "usage: phaseplan-cli COMMAND INPUT.json|- [-o OUT.pdf] [--paper a4|letter|label62]\n"
            "       [--follow-symlinks] [--data DIR]\ncommands:\n");
    for (const auto& [name, e] : command_table())
        std::fprintf(to, "  %-10s %s\n", name.c_str(), e.summary);
    std::fprintf(
        to, "  %-10s %s\n", "device",
        "read --port PORT --format NAME|REGEX [--baud N] [--timeout-s S] [--stable-only] [--unit "
        "U]:\n"
        "             one reading from a balance or pH meter; device formats: the line formats");
    std::fprintf(to, "  %-10s %s\n", "audit",
                 "verify --database FILE (exit 1 when the chain is broken);\n"
                 "             export --database FILE [--batch ID] [-o OUT.json|OUT.csv]");
    std::fprintf(to, "  %-10s %s\n", "user",
                 "add LOGIN --name NAME --role preparer|reviewer|approver|administrator [--as "
                 "ADMIN],\n"
                 "             list, lock|unlock LOGIN --as ADMIN, passwd LOGIN [--as ADMIN]; "
                 "--database FILE;\n"
                 "             passwords are read from standard input or a prompt");
    std::fprintf(to, "  %-10s %s\n", "lot",
                 "add --reagent ID --lot NUMBER --received-on YYYY-MM-DD --expires-on YYYY-MM-DD\n"
                 "             [--opened-on YYYY-MM-DD] [--supplier NAME] [--quantity \"500 g\"] "
                 "--as LOGIN,\n"
                 "             list [--reagent ID],\n"
                 "             open --reagent ID --lot NUMBER --opened-on YYYY-MM-DD --as LOGIN;\n"
                 "             --database FILE: the reagent-lot shelf");
    std::fprintf(to, "  %-10s %s\n", "db",
                 "demo --database NEW_FILE: a new database with the demo;\n"
                 "             copy --from FILE --to URI: a bench's file into an empty lab "
                 "database;\n"
                 "             every FILE above may be postgresql://user@host:port/dbname "
                 "(password: ~/.pgpass)");
    return to == stdout ? 0 : 2;
}

/// The error line: control characters from the input (a "\n" inside a quoted id) are escaped so
/// that the message stays on one line, as the contract promises.
void fail(const std::string& full_line) {
    // However long the input, the line stays readable: cut on a character boundary.
    const std::string line = chem::guard::cut(full_line, 2000);
    std::string one_line;
    for (unsigned char ch : line) {
        if (ch == '\n')
            one_line += "\\n";
        else if (ch == '\r')
            one_line += "\\r";
        else if (ch == '\t')
            one_line += "\\t";
        else if (ch < 0x20 || ch == 0x7f) {
            char buf[8];
            std::snprintf(buf, sizeof buf, "\\x%02x", ch);
            one_line += buf;
        } else
            one_line += static_cast<char>(ch);
    }
    std::cerr << "phaseplan-cli: " << one_line << std::endl;
}

/// Qt's own warnings (fonts, platform plugins) would add lines to stderr around the one error
/// line; they are shown only when PHASEPLAN_QT_MESSAGES is set.
void qt_message(QtMsgType type, const QMessageLogContext&, const QString& msg) {
    if (type == QtFatalMsg || qEnvironmentVariableIsSet("PHASEPLAN_QT_MESSAGES"))
        std::cerr << msg.toStdString() << std::endl;
}

#ifdef PHASEPLAN_CLI_FULL
/// `phaseplan-cli device …`: flags instead of a JSON document; every failure is status 2 and one
/// line: "field: …" for a wrong option or reading, "device: …" for the port or the instrument
/// failing (a DeviceFailure, app/devices/device_cli.h).
int run_device(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    QStringList args;
    QString data_dir;
    for (int i = 2; i < argc; ++i) {
        const QString a = QString::fromLocal8Bit(argv[i]);
        if (a == QLatin1String("--data")) {
            if (i + 1 >= argc) {
                fail("--data: needs a value");
                return 2;
            }
            data_dir = QString::fromLocal8Bit(argv[++i]);
        } else {
            args << a;
        }
    }
    try {
        const QJsonObject out = phaseplan::devices::device_command(
            args, data_dir.isEmpty() ? phaseplan::find_data_dir(installed_data) : data_dir);
        std::cout << QJsonDocument(out).toJson(QJsonDocument::Indented).toStdString();
        return 0;
    } catch (const chem::Error& e) {
        fail(e.what());
        return 2;
    } catch (const phaseplan::Failure& f) {
        fail(f.line()); // the port or the instrument: status 2, as every device failure
        return 2;
    } catch (const std::exception& e) {
        fail(std::string("internal error: ") + e.what());
        return 2;
    }
}

/// One password: a line of standard input, or typed at a prompt on stderr without echo when
/// standard input is a terminal. Never an argument (it would show in the process list).
QString read_secret(const QString& prompt) {
    const bool tty = ::isatty(STDIN_FILENO) == 1;
    termios old_mode{};
    if (tty) {
        std::cerr << prompt.toStdString() << ": " << std::flush;
        ::tcgetattr(STDIN_FILENO, &old_mode);
        termios quiet = old_mode;
        quiet.c_lflag &= ~static_cast<tcflag_t>(ECHO);
        ::tcsetattr(STDIN_FILENO, TCSAFLUSH, &quiet);
    }
    std::string line;
    const bool got = static_cast<bool>(std::getline(std::cin, line));
    if (tty) {
        ::tcsetattr(STDIN_FILENO, TCSAFLUSH, &old_mode);
        std::cerr << std::endl;
    }
    if (!line.empty() && line.back() == '\r')
        line.pop_back();
    if (!got && line.empty())
        throw chem::Error("password", "none given for the " + prompt.toStdString() +
                                          " (one line of standard input)");
    return QString::fromStdString(line);
}

/// `phaseplan-cli audit|user|lot|db …`: the lab's database (app/storage/records_cli.h). `audit
/// verify` exits 1 on a broken chain; every error is status 2 and one line.
int run_records(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    QStringList args;
    QString data_dir;
    for (int i = 2; i < argc; ++i) {
        const QString a = QString::fromLocal8Bit(argv[i]);
        if (a == QLatin1String("--data") && i + 1 < argc)
            data_dir = QString::fromLocal8Bit(argv[++i]);
        else
            args << a;
    }
    try {
        const phaseplan::storage::CliOutput out = phaseplan::storage::records_command(
            QString::fromLocal8Bit(argv[1]), args, read_secret,
            data_dir.isEmpty() ? phaseplan::find_data_dir(installed_data) : data_dir);
        std::cout.write(out.out.constData(), out.out.size());
        std::cout.flush();
        return out.status;
    } catch (const chem::Error& e) {
        fail(e.field() + ": " + e.message());
        return 2;
    } catch (const phaseplan::Failure& f) {
        fail(f.line()); // the database, as bad input: status 2 and one line, as before
        return 2;
    } catch (const std::exception& e) {
        fail(std::string("internal error: ") + e.what());
        return 2;
    }
}

#else
/// phaseplan-cli-full in place of this process, with the same arguments (the device, database and
/// PDF commands): beside this program (the build tree), else in PHASEPLAN_BIN_TO_CLI_FULL from it
/// (the installed layout). Returns only when it cannot: status 3, the installation is broken.
int run_full(char** argv) {
    std::string dir;
    char self[4096];
    const ssize_t n = ::readlink("/proc/self/exe", self, sizeof self - 1);
    if (n > 0)
        dir.assign(self, static_cast<std::size_t>(n));
    dir = dir.substr(0, dir.find_last_of('/') == std::string::npos ? 0 : dir.find_last_of('/'));
    const std::string beside = dir + "/phaseplan-cli-full";
    const std::string installed = dir + "/" PHASEPLAN_BIN_TO_CLI_FULL "/phaseplan-cli-full";
    for (const std::string& path : {beside, installed})
        if (::access(path.c_str(), X_OK) == 0) {
            ::execv(path.c_str(), argv);
            fail("command: cannot run " + path + ": " + std::strerror(errno));
            return 3;
        }
    fail(std::string("command: \"") + argv[1] + "\" is run by phaseplan-cli-full, not found at " +
         installed);
    return 3;
}
#endif

/// Reads at most json::max_document_bytes from `in`; throws Error("input", …) above that.
QByteArray read_capped(QFile& in, const std::string& shown) {
    // A pipe hands over what it has: read until the end or one byte past the cap.
    QByteArray bytes;
    while (bytes.size() <= phaseplan::json::max_document_bytes) {
        const QByteArray chunk = in.read(
            std::min<qint64>(1 << 20, phaseplan::json::max_document_bytes + 1 - bytes.size()));
        if (chunk.isEmpty())
            break; // end of input (or a read error, reported by the parser)
        bytes += chunk;
    }
    if (bytes.size() > phaseplan::json::max_document_bytes)
        throw chem::Error(
            "input",
            shown + " is larger than 16 MiB (16777216 bytes), the most one document may hold");
    return bytes;
}

/// Ends the process once its output is written, without freeing what it holds: the kernel takes
/// the memory back at once, where freeing the input document of a 10,000-row sequence alone
/// takes 6 M instructions. The checking builds (PHASEPLAN_SANITIZED) return instead, so that
/// LeakSanitizer still sees every allocation freed at exit.
int finish(int status) {
    std::cout.flush();
#ifndef PHASEPLAN_SANITIZED
    std::fflush(nullptr);
    std::_Exit(status);
#endif
    return status;
}

/// The error as one line: field and message joined here, not through what(), so a NUL in the
/// input is escaped instead of ending the line.
std::string error_line(const chem::Error& e) {
    return e.field() + ": " + e.message();
}

} // namespace

int main(int argc, char** argv) {
    qInstallMessageHandler(qt_message);
#ifdef PHASEPLAN_CLI_FULL
    if (argc > 1 && std::string(argv[1]) == "device")
        return run_device(argc, argv);
    if (argc > 1 && (std::string(argv[1]) == "audit" || std::string(argv[1]) == "user" ||
                     std::string(argv[1]) == "lot" || std::string(argv[1]) == "db"))
        return run_records(argc, argv);
#else
    if (argc > 1 && (std::string(argv[1]) == "device" || std::string(argv[1]) == "audit" ||
                     std::string(argv[1]) == "user" || std::string(argv[1]) == "lot" ||
                     std::string(argv[1]) == "db"))
        return run_full(argv);
#endif
    std::string command;
    QString input_path;
    QString data_dir;
    phaseplan::CommandOptions opt;
    for (int i = 1; i < argc; ++i) {
        std::string a = argv[i];
        auto value = [&](const char* flag) -> std::string {
            if (i + 1 >= argc) {
                fail(std::string(flag) + ": needs a value");
                std::exit(2);
            }
            return argv[++i];
        };
        if (a == "-h" || a == "--help")
            return usage(stdout);
        if (a == "-o" || a == "--output")
            opt.output_path = QString::fromStdString(value("-o"));
        else if (a == "--follow-symlinks")
            opt.follow_symlinks = true;
        else if (a == "--paper")
            opt.paper = QString::fromStdString(value("--paper"));
        else if (a == "--data")
            data_dir = QString::fromStdString(value("--data"));
        else if (command.empty())
            command = a;
        else if (input_path.isEmpty())
            input_path = QString::fromStdString(a);
        else {
            fail("input: unexpected argument \"" + a + "\" (one input document only)");
            return 2;
        }
    }
    if (command.empty())
        return usage(stderr);
    auto it = command_table().find(command);
    if (it == command_table().end()) {
        fail("command: unknown command \"" + command + "\" (try --help)");
        return 2;
    }
#ifndef PHASEPLAN_CLI_FULL
    if (!it->second.run && !it->second.text)
        return run_full(argv); // the PDF commands
#endif

    // PDF commands need fonts; run them on the offscreen platform unless one is set.
    std::unique_ptr<QCoreApplication> app;
#ifdef PHASEPLAN_CLI_PDF
    std::unique_ptr<phaseplan::PrivateRuntimeDir> runtime_dir;
    if (it->second.needs_gui) {
        if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM"))
            qputenv("QT_QPA_PLATFORM", "offscreen");
        // A private runtime folder keeps Qt from warning on stderr (one line only on error).
        runtime_dir = std::make_unique<phaseplan::PrivateRuntimeDir>();
        app = std::make_unique<QGuiApplication>(argc, argv);
    }
#endif
    if (!app)
        app = std::make_unique<QCoreApplication>(argc, argv);

    if (command != "reagents" && input_path.isEmpty()) {
        fail("input: give a JSON file path or - for standard input");
        return 2;
    }

    phaseplan::AppData data;
    try {
        data = phaseplan::load_app_data(
            data_dir.isEmpty() ? phaseplan::find_data_dir(installed_data) : data_dir);
    } catch (const chem::Error& e) {
        fail("data: " + error_line(e));
        return 3; // the installation is broken, not the input
    }

    try {
        QByteArray bytes;
        if (command != "reagents") {
            const std::string shown = input_path == "-"
                                          ? std::string("standard input")
                                          : chem::guard::quote_id(input_path.toStdString());
            QFile in;
            if (input_path != "-")
                in.setFileName(input_path);
            if (input_path == "-" ? !in.open(stdin, QIODevice::ReadOnly)
                                  : !in.open(QIODevice::ReadOnly))
                throw chem::Error("input",
                                  "cannot open " + shown + ": " + in.errorString().toStdString());
            bytes = read_capped(in, shown);
        }
        QJsonObject input = command == "reagents" && bytes.isEmpty()
                                ? QJsonObject{}
                                : phaseplan::json::parse_document(bytes);
        if (it->second.text) {
            const QByteArray text = it->second.text(data, input, opt);
            std::cout.write(text.constData(), text.size());
            return finish(0);
        }
        QJsonObject out = it->second.run(data, input, opt);
        phaseplan::json::check_output(out);
        const QByteArray text = QJsonDocument(out).toJson(QJsonDocument::Indented);
        std::cout.write(text.constData(), text.size()); // no second copy of a large result
        std::cout.flush();
        return 0;
    } catch (const chem::Error& e) {
        fail(error_line(e));
        return 2;
    } catch (const phaseplan::Failure& f) {
        fail(f.line()); // the PDF file could not be written: status 2, one line, as before
        return 2;
    } catch (const std::bad_alloc&) {
        fail("input: not enough memory to read and work on this document");
        return 2;
    } catch (const std::exception& e) {
        // Not expected: chem/ throws only chem::Error. Still no crash and no partial output.
        fail(std::string("internal error: ") + e.what());
        return 2;
    }
}
