#pragma once
// Page layout of the printed documents: a sheet (recipe sheet, line sheet, sequence sheet) as a
// list of blocks that flow over A4 or US Letter pages, and bottle labels (a sheet of several on
// A4 or Letter, or one per page at 62 mm wide for a label printer).
//
// The layout knows nothing about chemistry: app/print/documents.cpp turns a recipe, line or
// sequence with its batch into these structures. Rendering works on any QPagedPaintDevice, so the
// same code writes a PDF (QPdfWriter) and prints (QPrinter).
#include <QList>
#include <QString>
#include <QStringList>

#include <functional>
#include <string>

class QPagedPaintDevice;

namespace phaseplan::print {

enum class Paper { a4, letter, label62 };
/// "a4", "letter", "label62" -> Paper. Throws chem::Error("--paper", …) for anything else.
Paper paper_from_name(const QString& name);
QString paper_name(Paper paper);

struct KeyValue {
    QString key;
    QString value;
};

struct Table {
    QStringList headers;
    QList<qreal> weights; ///< relative column widths; empty = equal
    QList<QStringList> rows;
    QList<bool> flagged; ///< per row: drawn with a red background (out of tolerance)
};

struct WarningLine {
    QString severity; ///< "info", "caution", "warning"
    QString code;
    QString message;
};

struct HazardLine {
    QString code;      ///< "H314"
    QString statement; ///< "Causes severe skin burns and eye damage"
    QString from;      ///< the parts that carry it: "phosphoric acid, sodium hydroxide"
};

struct Block {
    enum class Kind {
        heading,
        paragraph,
        fields,
        table,
        numbered,
        bullets,
        warnings,
        hazards,
        signoff,
        notice
    };
    Kind kind = Kind::paragraph;
    QString text;           ///< heading, paragraph; hazards: the note under the pictograms;
                            ///< notice: the boxed headline (its items are listed inside the box)
    QList<KeyValue> fields; ///< fields: shown in two columns
    Table table;
    QStringList items; ///< numbered, bullets; signoff: the roles ("Prepared by", …)
    QList<WarningLine> warnings;
    QStringList pictograms;         ///< hazards: GHS01…GHS09
    QList<HazardLine> hazard_lines; ///< hazards
};

struct SheetDocument {
    QString kind_title; ///< "Buffer preparation record"
    QString title;      ///< "Phosphate buffer pH 6.80, 25 mmol/L"
    QString batch_id;   ///< in every page header and in the QR code on page 1
    QList<Block> blocks;
    QString footer; ///< small print at the bottom of every page
    /// When not empty: boxed in the running header of every page ("OUT OF TOLERANCE — …").
    QString mark;
};

struct LabelData {
    QString title;           ///< what is in the bottle
    QStringList composition; ///< one line per part: "KH2PO4 12.50 mmol/L"
    QString ph;              ///< "pH 6.80 at 25 °C" or ""
    QString batch_id;
    QString prepared_at; ///< as printed: "2026-12-01 16:30"
    QString expires_at;
    QString prepared_by;
    QStringList pictograms;
    QStringList hazard_codes;
    QString qr_text; ///< the batch id (what a scanner reads back)
    /// When not empty: boxed across the label below the title ("OUT OF TOLERANCE — …").
    QString mark;
    /// The release line ("Released: reviewed by …" or "NOT RELEASED — …", in red when not).
    QString release;
    bool released = false;
};

/// Lays out and paints `doc` on `device` (sets the page size and margins of `paper`, a4 or
/// letter). Returns the number of pages. The device must not have a painter active.
int render_sheet(QPagedPaintDevice& device, const SheetDocument& doc, Paper paper);

/// Paints labels: on a4 or letter a grid of 2 × 4 labels per page; on label62 one label per page,
/// 62 mm × 100 mm. Each entry of `labels` is repeated `copies` times. Returns the page count.
int render_labels(QPagedPaintDevice& device, const QList<LabelData>& labels, Paper paper,
                  int copies);

/// Writes a PDF atomically: to a temporary file beside `path` (QSaveFile), renamed onto `path`
/// only when `paint` returned. `paint` receives the writer and returns the page count. Throws
/// Failure(Kind::file) when the file cannot be written, chem::Error("-o", …) when the path is
/// refused (a link, not a regular file, read-only); on any exception no file is left behind.
/// Writes only to a regular file or a new path: a device node, FIFO, socket or folder is refused,
/// and so is a symbolic link unless `follow_symlinks` (then its target, which must itself be a
/// regular file or new, is written). A replaced file keeps its permission bits.
int write_pdf_atomically(const QString& path, const QString& title,
                         const std::function<int(QPagedPaintDevice&)>& paint,
                         bool follow_symlinks = false);

/// Label grid on a sheet of paper: columns, rows and the label size in mm.
struct LabelGrid {
    int columns = 2;
    int rows = 4;
    double label_width_mm = 0;
    double label_height_mm = 0;
    double margin_left_mm = 0;
    double margin_top_mm = 0;
    double gap_mm = 0;
};
LabelGrid label_grid(Paper paper);

} // namespace phaseplan::print
