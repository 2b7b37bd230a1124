#pragma once
// The one error type of the chemistry core. Everything in chem/ that rejects an input throws
// chem::Error; app/ catches it once at the Qt boundary and shows it beside the field it names.
#include <optional>
#include <stdexcept>
#include <string>

namespace chem {

class Error : public std::runtime_error {
  public:
    /// @param field  the input at fault, in the JSON path style of the command-line contract
    ///               ("components[1].mol_per_l", "target_ph", "lines.A.bottle_ml").
    /// @param message what is wrong, naming the bad value ("-0.2 is not a positive amount").
    Error(std::string field, std::string message)
        : std::runtime_error(field + ": " + message), field_(std::move(field)),
          message_(std::move(message)) {}

    const std::string& field() const noexcept { return field_; }
    const std::string& message() const noexcept { return message_; }

    /// The same error with a prefix on the field, for nested documents
    /// (Error("mol_per_l", …).within("components[2]") names "components[2].mol_per_l").
    Error within(const std::string& parent) const {
        return Error(field_.empty() ? parent : parent + (field_.front() == '[' ? "" : ".") + field_,
                     message_);
    }

  private:
    std::string field_;
    std::string message_;
};

// ---- field paths ------------------------------------------------------------------------------
// An error's field is a path of the command-line contract: keys joined by dots, list entries in
// brackets ("lines.A.parts[0].fraction_v", "batch.actual[2].mass_g"; the batch history writes
// "actual[phosphoric-acid].lot", a reagent id in the brackets). These are the one reading of
// that syntax: the app asks them instead of matching the text itself.

/// Whether `path` is `field` or lies inside it: "lines.A.parts[0]" is within "lines.A" and
/// within "lines.A.parts", not within "lines.AB".
bool path_within(const std::string& path, const std::string& field);

/// A path that starts with `list[...]`: what is in the brackets, and what follows them (without
/// its leading '.'): "batch.actual[2].mass_g" under "batch.actual" is {"2", "mass_g"}.
struct Subscripted {
    std::string subscript;
    std::string rest;
    /// The subscript as a list index, or -1 when it is not a whole number.
    int index() const;
};
/// nullopt when `path` does not start with `list[`…`]`.
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

/// An amount to about four significant figures, as recipes and batch records print masses and
/// volumes: 123.4, 12.34, 1.234, 0.1234 (0.1 mg / 0.01 mL resolution at most); zero is "0".
/// The one amount formatter of the sheet, the labels and the batch record (the app's screens
/// format by locale in app/gui/model_util).
std::string format_amount(double value);

} // namespace chem
