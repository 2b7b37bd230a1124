#pragma once
// The app's error for failures that are not about the input: the database (cannot open, locked,
// not PhasePlan's, a statement refused, the lab server's connection lost), the printer, writing
// the PDF file, an instrument's port. chem::Error names an input field and is shown beside it;
// a Failure names no field: it is one sentence for the user (never SQL text), shown as a notice
// (the app's storage banner, the print card's message) and as one line by the command-line tool.
//
// Each boundary catches both, once: the CLI's main() and its records/device commands, the
// models' guarded() (app/gui/model_util.h), Workspace, Session and the PrintController.
#include <initializer_list>
#include <stdexcept>
#include <string>

namespace phaseplan {

class Failure : public std::runtime_error {
  public:
    enum class Kind {
        database,        ///< the database file or server: open, lock, schema, a statement
        connection_lost, ///< the lab server's connection went away (the app retries every 5 s)
        printer,         ///< no printer, an unknown or unusable one
        file,            ///< a PDF (sheet, labels) could not be written where asked
        device,          ///< an instrument or its port (missing, busy, unusable, gone, silent:
                         ///< devices::DeviceFailure)
    };

    Failure(Kind kind, std::string sentence)
        : std::runtime_error(std::string(subject_of(kind)) + ": " + sentence), kind_(kind),
          sentence_(std::move(sentence)) {}

    Kind kind() const noexcept { return kind_; }
    /// What went wrong, for the user ("the lab database at db.example:5432 cannot be reached:
    /// is the server running?").
    const std::string& sentence() const noexcept { return sentence_; }
    /// What failed, as the command-line tool names it before the colon of its one line:
    /// "database", "database.connection", "printer", "-o" (the PDF file), "device".
    const char* subject() const noexcept { return subject_of(kind_); }
    /// The command-line tool's one line: "database: …".
    std::string line() const { return std::string(subject()) + ": " + sentence_; }

    static const char* subject_of(Kind kind) noexcept {
        switch (kind) {
        case Kind::database:
            return "database";
        case Kind::connection_lost:
            return "database.connection";
        case Kind::printer:
            return "printer";
        case Kind::file:
            return "-o";
        case Kind::device:
            return "device";
        }
        return "failure";
    }

    /// Whether `field` is one of the subjects above (a model's error field that is a Failure).
    static bool is_subject(const std::string& field) noexcept {
        for (Kind k :
             {Kind::database, Kind::connection_lost, Kind::printer, Kind::file, Kind::device})
            if (field == subject_of(k))
                return true;
        return false;
    }

  private:
    Kind kind_;
    std::string sentence_;
};

} // namespace phaseplan
