#pragma once
// QR codes for labels, encoded with libqrencode and painted with QPainter.
#include <QRectF>
#include <QString>

#include <string>
#include <vector>

class QPainter;

namespace phaseplan::print {

/// The module matrix of a QR code for `text` (UTF-8, byte mode, error correction level M, the
/// smallest version that holds it), row-major, true = dark. `width` receives the modules per side.
/// Throws chem::Error(field, …) when the text cannot be encoded (empty or too long).
std::vector<bool> qr_modules(const QString& text, int* width, const std::string& field);

/// Paints the QR code of `text` in the largest square centred in `box`, on white, with the quiet
/// zone of 4 modules on every side that ISO/IEC 18004 asks for (from memory). Dark modules are
/// merged into horizontal runs so that a rendered PDF shows no seams between modules.
/// Throws chem::Error(field, …) as qr_modules.
void paint_qr_code(QPainter& painter, const QRectF& box, const QString& text,
                   const std::string& field = "batch.id");

/// Modules per side including the quiet zone, for sizing: a label must give each module enough
/// room to scan.
int qr_total_modules(const QString& text, const std::string& field = "batch.id");

} // namespace phaseplan::print
