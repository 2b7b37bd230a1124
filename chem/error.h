#pragma once
// The one error type of the chemistry core. Everything in chem/ that rejects an input throws
// chem::Error; app/ catches it once at the Qt boundary and shows it beside the field it names.
// Failures that are not about the input (database, printer, file, port) are the app's
// (app/core/failure.h), never a chem::Error.
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace chem {

// ---- field paths ------------------------------------------------------------------------------
// An error names the input at fault by a path of the command-line contract: keys joined by dots,
// list entries in brackets ("lines.A.parts[0].fraction_v", "batch.actual[2].mass_g"; the batch
// history writes "actual[phosphoric-acid].lot", a reagent id in the brackets). Path is that path
// as segments; Path::parse is the one reading of the text form, and Path::text() writes it back.
// The app asks these instead of matching the text itself.

/// One step of a path: a key ("lines"), a list index ("[2]") or a bracket subscript that is not
/// a whole number ("[phosphoric-acid]", a reagent id).
struct PathSegment {
    enum class Kind { key, index, subscript };
    Kind kind = Kind::key;
    /// The key, the index's decimal digits, or the subscript as written (may hold '.').
    std::string text;

    static PathSegment key(std::string name) { return {Kind::key, std::move(name)}; }
    static PathSegment index(std::size_t i) { return {Kind::index, std::to_string(i)}; }
    /// A bracket subscript; a whole number of up to 9 digits is an index ("2" is index 2).
    static PathSegment subscript(std::string text);
    /// The list index, or -1 for a key or a subscript that is not a whole number.
    int as_index() const;
    bool operator==(const PathSegment& o) const { return kind == o.kind && text == o.text; }
    bool operator!=(const PathSegment& o) const { return !(*this == o); }

  private:
    int as_index_text() const;
};

class Path {
  public:
    Path() = default;
    explicit Path(std::vector<PathSegment> segments) : segments_(std::move(segments)) {}
    /// Reads the text form: "a.b[2].c[x.y]" is key a, key b, index 2, key c, subscript "x.y".
    /// Text inside brackets is taken whole up to the next ']'; a '[' without its ']' stays part
    /// of the key. A well-formed path writes back as the same text (text()).
    static Path parse(std::string_view text);

    const std::vector<PathSegment>& segments() const noexcept { return segments_; }
    bool empty() const noexcept { return segments_.empty(); }
    std::size_t size() const noexcept { return segments_.size(); }
    /// The text form: keys joined by '.', indices and subscripts in brackets.
    std::string text() const;

    /// Whether this path is `parent` or lies inside it (segment by segment: "lines.A.parts[0]" is
    /// within "lines.A" and "lines.A.parts", not within "lines.AB"). Everything is within the
    /// empty path.
    bool within(const Path& parent) const;
    /// `parent` followed by this path.
    Path under(const Path& parent) const;
    /// The segments from `first` on.
    Path tail(std::size_t first) const;

    Path& operator/=(PathSegment s) {
        segments_.push_back(std::move(s));
        return *this;
    }
    bool operator==(const Path& o) const { return segments_ == o.segments_; }
    bool operator!=(const Path& o) const { return !(*this == o); }

  private:
    std::vector<PathSegment> segments_;
};

/// The one error type of the chemistry core (see the top of this file).
class Error : public std::runtime_error {
  public:
    /// @param field  the input at fault, in the path text of the command-line contract
    ///               ("components[1].mol_per_l", "target_ph", "lines.A.bottle_ml"); parsed once
    ///               here into path().
    /// @param message what is wrong, naming the bad value ("-0.2 is not a positive amount").
    Error(std::string field, std::string message)
        : std::runtime_error(field + ": " + message), path_(Path::parse(field)),
          field_(std::move(field)), message_(std::move(message)) {}
    /// The same from segments (a key may then hold '.' or '['; field() writes it as it is).
    Error(const Path& path, std::string message)
        : Error(path.text(), Path(path), std::move(message)) {}

    /// The path as text, exactly as the command-line tool prints it.
    const std::string& field() const noexcept { return field_; }
    const Path& path() const noexcept { return path_; }
    const std::string& message() const noexcept { return message_; }

    /// The same error with a prefix on the field, for nested documents
    /// (Error("mol_per_l", …).within("components[2]") names "components[2].mol_per_l").
    Error within(const std::string& parent) const {
        return Error(field_.empty() ? parent : parent + (field_.front() == '[' ? "" : ".") + field_,
                     path_.under(Path::parse(parent)), message_);
    }
    Error within(const Path& parent) const { return within(parent.text()); }

  private:
    Error(std::string field, Path path, std::string message)
        : std::runtime_error(field + ": " + message), path_(std::move(path)),
          field_(std::move(field)), message_(std::move(message)) {}

    Path path_;
    std::string field_;
    std::string message_;
};

/// Whether `path` is `field` or lies inside it (Path::within on the parsed texts).
bool path_within(const std::string& path, const std::string& field);

/// A path that starts with `list` and then an index or subscript: what is in the brackets, and
/// what follows them: "batch.actual[2].mass_g" under "batch.actual" is {"2", "mass_g"}.
struct Subscripted {
    std::string subscript;
    std::string rest; ///< the rest as text, without its leading '.'
    Path rest_path;   ///< the rest as segments
    /// The subscript as a list index, or -1 when it is not a whole number.
    int index() const;
};
/// nullopt when `path` does not start with `list` followed by a bracket segment.
std::optional<Subscripted> subscript_of(const Path& path, const Path& list);
std::optional<Subscripted> subscript_of(const std::string& path, const std::string& list);

/// Throws Error(field, "must be a finite number") for NaN or infinity.
void require_finite(double v, const std::string& field);
/// Throws Error(field, "<v> is outside <lo> to <hi> <what>") unless lo ≤ v ≤ hi.
void require_range(double v, double lo, double hi, const std::string& field, const char* what);
/// Throws unless 0 < v ≤ hi: "<v> <unit> is not positive" / "is above the limit of <hi>".
void require_positive(double v, double hi, const std::string& field, const char* unit);

/// Formats a number for an error message: up to 6 significant digits, no trailing zeros.
std::string format_number(double value);

/// Formats a number with a fixed count of decimals ("2.50"), independent of the C locale
/// (printf's %.2f would write "2,50" under a decimal-comma locale once Qt has called setlocale).
std::string format_fixed(double value, int decimals);
/// format_fixed, but an exact tie rounds away from zero ("2.5" → "3", "0.25" → "0.3" at one
/// decimal), as QString::number(value, 'f', decimals) does, where format_fixed rounds it to even.
/// Ties are detected exactly for up to 4 decimals; more decimals round as format_fixed.
std::string format_fixed_ties_away(double value, int decimals);

/// An amount to about four significant figures, as recipes and batch records print masses and
/// volumes: 123.4, 12.34, 1.234, 0.1234 (0.1 mg / 0.01 mL resolution at most); zero is "0".
/// The one amount formatter of the sheet, the labels and the batch record (the app's screens
/// format by locale in app/gui/model_util).
std::string format_amount(double value);

/// What an amount to weigh or measure is read on: a balance (g) or a pipette, burette or
/// cylinder (mL).
enum class MeasureUnit { g, ml };

/// The decimals an amount to weigh or measure is written with: the resolution of what measures
/// it at the bench (DEVELOPERS.md, "Amounts to weigh and measure").
///   g:  below 1 g 4 (0.1 mg, analytical balance); below 100 g 3 (1 mg); else 2 (0.01 g,
///       precision top-pan balance).
///   mL: below 1 mL 3 (1 µL, a 100–1000 µL pipette's step); below 10 mL 2 (10 µL, a 1–10 mL
///       pipette); below 100 mL 1 (0.1 mL, a graduated pipette or burette); else 0 (1 mL, a
///       graduated cylinder).
/// The one rule of the steps (recipe and line), the buffer and line cards, and the sheets'
/// target amounts; the screens apply it with the locale's decimal mark (gui::measure_text).
int measure_decimals(double value, MeasureUnit unit);

/// `value` with measure_decimals, "." as the decimal mark, no unit: "0.756", "2.400", "500".
std::string format_measure(double value, MeasureUnit unit);

/// An amount someone recorded (typed, or read from a balance): with at least measure_decimals,
/// and with more where the recorded value has them, up to 6 decimals, so a record never shows
/// fewer digits than were entered nor invents a trailing zero: 1.27 mL reads "1.27" (not
/// "1.270"), a balance's 2.9813 g reads "2.9813". "." as the decimal mark, no unit.
std::string format_recorded(double value, MeasureUnit unit);

} // namespace chem
