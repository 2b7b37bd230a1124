#include "devices/device_error.h"

namespace phaseplan::devices {

const char* fault_code(Fault fault) {
    switch (fault) {
    case Fault::port_missing:
        return "port-missing";
    case Fault::port_busy:
        return "port-busy";
    case Fault::port_failed:
        return "port-failed";
    case Fault::disconnected:
        return "disconnected";
    case Fault::garbage:
        return "garbage";
    case Fault::no_match:
        return "no-match";
    case Fault::out_of_range:
        return "out-of-range";
    case Fault::negative:
        return "negative";
    case Fault::wrong_unit:
        return "wrong-unit";
    case Fault::timeout:
        return "timeout";
    case Fault::bad_format:
        return "bad-format";
    case Fault::bad_setting:
        return "bad-setting";
    }
    return "unknown";
}

bool is_port_fault(Fault fault) noexcept {
    switch (fault) {
    case Fault::port_missing:
    case Fault::port_busy:
    case Fault::port_failed:
    case Fault::disconnected:
    case Fault::timeout:
        return true;
    default:
        return false;
    }
}

} // namespace phaseplan::devices
