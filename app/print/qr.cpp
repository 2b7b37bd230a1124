#include "print/qr.h"

#include "chem/error.h"

#include <QPainter>

#include <qrencode.h>

#include <algorithm>
#include <memory>

namespace phaseplan::print {

namespace {
constexpr int quiet_zone_modules = 4; // ISO/IEC 18004 (from memory)
}

std::vector<bool> qr_modules(const QString& text, int* width, const std::string& field) {
    if (text.isEmpty())
        throw chem::Error(field, "is empty: nothing to put in the QR code");
    const QByteArray utf8 = text.toUtf8();
    // Byte mode keeps the text exactly as given (case-sensitive ids); level M survives a
    // scuffed label.
    std::unique_ptr<QRcode, decltype(&QRcode_free)> code(
        QRcode_encodeString(utf8.constData(), 0, QR_ECLEVEL_M, QR_MODE_8, 1), &QRcode_free);
    if (!code)
        throw chem::Error(field, "\"" + text.left(40).toStdString() +
                                     "\" cannot be encoded as a QR code (" +
                                     std::to_string(utf8.size()) + " bytes)");
    const int n = code->width;
    std::vector<bool> m(static_cast<size_t>(n) * n);
    for (int i = 0; i < n * n; ++i)
        m[i] = code->data[i] & 1; // bit 0: dark module
    if (width)
        *width = n;
    return m;
}

int qr_total_modules(const QString& text, const std::string& field) {
    int n = 0;
    qr_modules(text, &n, field);
    return n + 2 * quiet_zone_modules;
}

void paint_qr_code(QPainter& painter, const QRectF& box, const QString& text,
                   const std::string& field) {
    int n = 0;
    const std::vector<bool> m = qr_modules(text, &n, field);
    const int total = n + 2 * quiet_zone_modules;
    const qreal side = std::min(box.width(), box.height());
    const qreal module = side / total;
    const QPointF origin(box.center().x() - side / 2, box.center().y() - side / 2);

    painter.save();
    painter.setRenderHint(QPainter::Antialiasing, false);
    painter.setPen(Qt::NoPen);
    painter.fillRect(QRectF(origin, QSizeF(side, side)), Qt::white);
    painter.setBrush(Qt::black);
    for (int y = 0; y < n; ++y) {
        int x = 0;
        while (x < n) {
            if (!m[static_cast<size_t>(y) * n + x]) {
                ++x;
                continue;
            }
            int run = x;
            while (run < n && m[static_cast<size_t>(y) * n + run])
                ++run;
            // a hair of overlap downwards hides seams between rows in rasterised PDFs
            painter.drawRect(QRectF(origin.x() + (quiet_zone_modules + x) * module,
                                    origin.y() + (quiet_zone_modules + y) * module,
                                    (run - x) * module, module * 1.02));
            x = run;
        }
    }
    painter.restore();
}

} // namespace phaseplan::print
