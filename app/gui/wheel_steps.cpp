#include "wheel_steps.h"

namespace phaseplan::gui {

int turn_wheel(int value, int notches, int count, int stride) {
    if (count <= 0)
        return value;
    auto wrap = [count](long long v) { return int(((v % count) + count) % count); };
    if (stride < 2 || count % stride != 0)
        return wrap(static_cast<long long>(value) + notches);
    long long v = wrap(value);
    if (notches == 0)
        return int(v);
    // The first notch reaches the neighbouring stop; each further notch is one stride.
    const long long off = v % stride;
    if (notches > 0)
        v += (stride - off) + static_cast<long long>(notches - 1) * stride;
    else
        v -= (off == 0 ? stride : off) + static_cast<long long>(-notches - 1) * stride;
    return wrap(v);
}

} // namespace phaseplan::gui
