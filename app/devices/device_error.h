#pragma once
// The instrument layer's two errors, split as the rest of the app splits them (DEVELOPERS.md,
// "Errors"):
//  - DeviceError, a chem::Error: something the user gave or the reading that came is wrong (a
//    port setting or a line format that was typed, a reading that is negative, overloaded, in a
//    wrong unit, unreadable). It names the field (the option, "reading", "unit") and is shown
//    beside it.
//  - DeviceFailure, a phaseplan::Failure of Kind::device: the port or the instrument failed (no
//    such port, busy, unusable, the instrument went away, nothing in time). It names no field;
//    its sentence names the port as the user gave it.
// Both carry the Fault, so the app can react to the kind (the take button again after a timeout,
// "accept" after an unstable reading); each boundary catches chem::Error and Failure once.
#include "chem/error.h"
#include "core/failure.h"

#include <string>

namespace phaseplan::devices {

enum class Fault {
    port_missing, ///< no such port (unplugged, wrong name)
    port_busy,    ///< another program holds the port
    port_failed,  ///< the port exists but cannot be opened or set up (not a serial port, settings
                  ///< refused)
    disconnected, ///< the instrument went away (cable pulled, adapter gone), perhaps half-way
                  ///< through a line
    garbage,      ///< unreadable bytes or no line end: wrong baud rate, data bits or parity
    no_match,     ///< a readable line that the line format does not match
    out_of_range, ///< the instrument reports over- or underload ("+OL", "----")
    negative,     ///< a negative weight or pH
    wrong_unit,  ///< a unit the field does not take (mg where g was expected, or g from a pH meter)
    timeout,     ///< no complete reading in time
    bad_format,  ///< the line format itself is unusable (unknown preset, bad regular expression)
    bad_setting, ///< a port setting or record field is invalid (baud 0, parity "odd-ish")
};

/// "port-missing", "port-busy", … (stable codes, used in JSON and by the app).
const char* fault_code(Fault fault);

/// Whether the fault is the port's or the instrument's (port_missing, port_busy, port_failed,
/// disconnected, timeout): a DeviceFailure. Every other fault is about what was given or read: a
/// DeviceError.
bool is_port_fault(Fault fault) noexcept;

/// A setting, a line format or a reading is wrong: an input error naming its field. Never one of
/// the port faults (is_port_fault); those are DeviceFailure.
class DeviceError : public chem::Error {
  public:
    DeviceError(Fault fault, std::string field, std::string message)
        : chem::Error(std::move(field), std::move(message)), fault_(fault) {}
    Fault fault() const noexcept { return fault_; }

  private:
    Fault fault_;
};

/// The port or the instrument failed (a port fault, is_port_fault): not about the input. The
/// command-line tool prints it as "device: <sentence>"; the capture screen shows it beside the
/// reading it was for, prefixed with the instrument. `port` is the port as the user gave it
/// ("/dev/ttyUSB0", or a bare "ttyUSB0"), and the sentence names it too.
class DeviceFailure : public Failure {
  public:
    DeviceFailure(Fault fault, std::string port, std::string sentence)
        : Failure(Kind::device, std::move(sentence)), fault_(fault), port_(std::move(port)) {}
    Fault fault() const noexcept { return fault_; }
    const std::string& port() const noexcept { return port_; }

  private:
    Fault fault_;
    std::string port_;
};

} // namespace phaseplan::devices
