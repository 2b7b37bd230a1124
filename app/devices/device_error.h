#pragma once
// The one error of the instrument layer: a chem::Error (field, message) that also says which fault
// it is, so the app can react to the kind (offer "try again" after a timeout, "accept" after an
// unstable reading) while the CLI and the models still catch chem::Error in their one place.
#include "chem/error.h"

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

class DeviceError : public chem::Error {
  public:
    DeviceError(Fault fault, std::string field, std::string message)
        : chem::Error(std::move(field), std::move(message)), fault_(fault) {}
    Fault fault() const noexcept { return fault_; }

  private:
    Fault fault_;
};

} // namespace phaseplan::devices
