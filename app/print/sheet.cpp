#include "print/sheet.h"

#include "chem/guard.h"

#include <QFileInfo>

#include <cerrno>
#include <climits>
#include <cstring>

#include <stdlib.h>
#include <sys/stat.h>
#include <unistd.h>

#include "chem/error.h"
#include "core/failure.h"
#include "print/ghs.h"
#include "print/qr.h"

#include <QFontMetricsF>
#include <QPageLayout>
#include <QPageSize>
#include <QPagedPaintDevice>
#include <QPainter>
#include <QPdfWriter>
#include <QSaveFile>

#include <algorithm>
#include <cmath>

namespace phaseplan::print {

namespace {

constexpr int pdf_dpi = 300;           ///< device pixels per inch of the PDF writer
constexpr double sheet_margin_mm = 15; ///< left/right margin of sheets
constexpr double header_top_mm = 9;    ///< baseline area of the running header
constexpr double body_top_mm = 21;
constexpr double body_bottom_gap_mm = 20; ///< space kept for the footer
constexpr double label62_width_mm = 62;   ///< a common continuous label-roll width
constexpr double label62_height_mm = 100;

const char* font_family =
    "DejaVu Sans"; ///< fonts-dejavu-core: in the package list, full Unicode (β, ±, °)

const QColor ink(0x11, 0x11, 0x11);
const QColor muted(0x55, 0x55, 0x55);
const QColor rule(0x99, 0x99, 0x99);
const QColor header_fill(0xEC, 0xEC, 0xEC);
const QColor flag_fill(0xFD, 0xDE, 0xDE);
const QColor warning_red(0xB0, 0x10, 0x10);
const QColor caution_amber(0xA0, 0x60, 0x00);

QPageSize page_size(Paper paper) {
    switch (paper) {
    case Paper::a4:
        return QPageSize(QPageSize::A4);
    case Paper::letter:
        return QPageSize(QPageSize::Letter);
    case Paper::label62:
        return QPageSize(QSizeF(label62_width_mm, label62_height_mm), QPageSize::Millimeter,
                         QStringLiteral("Label 62 mm"));
    }
    return QPageSize(QPageSize::A4);
}

void set_page(QPagedPaintDevice& device, Paper paper) {
    // Zero device margins: the layout keeps its own, so PDF and printer output match.
    device.setPageLayout(QPageLayout(page_size(paper), QPageLayout::Portrait, QMarginsF(0, 0, 0, 0),
                                     QPageLayout::Millimeter));
}

QFont make_font(qreal points, bool bold = false) {
    QFont f(QString::fromLatin1(font_family));
    f.setPointSizeF(points);
    f.setBold(bold);
    f.setStyleHint(QFont::SansSerif);
    // No ligatures: "ff" stays two letters, so the PDF's text is searchable as typed.
    f.setStyleStrategy(QFont::PreferNoShaping);
    return f;
}

/// Painting with a dry-run mode: the first pass measures and counts pages (no painter), the
/// second paints with the page count known ("page 2 of 3").
class Canvas {
  public:
    Canvas(QPagedPaintDevice& device, QPainter* painter) : device_(device), p_(painter) {
        px_per_mm_ = device.logicalDpiX() / 25.4;
    }
    qreal mm(qreal v) const { return v * px_per_mm_; }
    bool dry() const { return p_ == nullptr; }
    QPainter* painter() { return p_; }
    QPagedPaintDevice& device() { return device_; }
    qreal page_width() const { return device_.width(); }
    qreal page_height() const { return device_.height(); }

    qreal height_of(const QFont& font, qreal width, const QString& text,
                    int flags = Qt::TextWordWrap) const {
        if (text.isEmpty())
            return QFontMetricsF(font, &device_).height();
        QFontMetricsF fm(font, &device_);
        return fm.boundingRect(QRectF(0, 0, width, 1e7), flags | Qt::AlignLeft | Qt::AlignTop, text)
            .height();
    }
    qreal line_height(const QFont& font) const { return QFontMetricsF(font, &device_).height(); }
    qreal width_of(const QFont& font, const QString& text) const {
        return QFontMetricsF(font, &device_).horizontalAdvance(text);
    }

    void text(const QRectF& r, const QFont& font, const QString& s, int flags = Qt::TextWordWrap,
              const QColor& color = ink) {
        if (!p_)
            return;
        p_->setFont(font);
        p_->setPen(color);
        p_->drawText(r,
                     flags | ((flags & Qt::AlignHorizontal_Mask) ? 0 : Qt::AlignLeft) |
                         ((flags & Qt::AlignVertical_Mask) ? 0 : Qt::AlignTop),
                     s);
    }
    void fill(const QRectF& r, const QColor& c) {
        if (p_)
            p_->fillRect(r, c);
    }
    void line(QPointF a, QPointF b, const QColor& c = rule, qreal width_mm = 0.2) {
        if (!p_)
            return;
        p_->setPen(QPen(c, mm(width_mm)));
        p_->drawLine(a, b);
    }
    void box(const QRectF& r, const QColor& c = rule, qreal width_mm = 0.2) {
        if (!p_)
            return;
        p_->setPen(QPen(c, mm(width_mm)));
        p_->setBrush(Qt::NoBrush);
        p_->drawRect(r);
    }

  private:
    QPagedPaintDevice& device_;
    QPainter* p_;
    qreal px_per_mm_ = 1;
};

// ---- sheets ----------------------------------------------------------------------------------

class SheetFlow {
  public:
    SheetFlow(Canvas& c, const SheetDocument& doc, int total_pages)
        : c_(c), doc_(doc), total_(total_pages) {
        left_ = c.mm(sheet_margin_mm);
        width_ = c.page_width() - 2 * left_;
        top_ = c.mm(body_top_mm);
        bottom_ = c.page_height() - c.mm(body_bottom_gap_mm);
    }

    int run() {
        begin_page();
        title_block();
        for (int i = 0; i < doc_.blocks.size(); ++i) {
            const Block& b = doc_.blocks[i];
            if (b.kind == Block::Kind::heading)
                heading(b.text, i + 1 < doc_.blocks.size() ? start_height(doc_.blocks[i + 1]) : 0);
            else
                block(b);
        }
        return page_;
    }

  private:
    void begin_page() {
        y_ = top_;
        const QFont small = make_font(7.5);
        const QRectF head(left_, c_.mm(header_top_mm), width_, c_.line_height(small));
        c_.text(head, small, "PhasePlan · " + doc_.kind_title, Qt::AlignLeft, muted);
        c_.text(head, small,
                "Batch " + doc_.batch_id + " · page " + QString::number(page_) + " of " +
                    QString::number(std::max(total_, page_)),
                Qt::AlignRight, muted);
        c_.line(QPointF(left_, head.bottom() + c_.mm(1)),
                QPointF(left_ + width_, head.bottom() + c_.mm(1)));
        const QFont foot = make_font(6.5);
        const qreal fh = c_.height_of(foot, width_, doc_.footer);
        const qreal fy = c_.page_height() - c_.mm(8) - fh;
        c_.line(QPointF(left_, fy - c_.mm(1.5)), QPointF(left_ + width_, fy - c_.mm(1.5)));
        c_.text(QRectF(left_, fy, width_, fh), foot, doc_.footer, Qt::TextWordWrap, muted);
        if (!doc_.mark.isEmpty()) {
            // Every page of an out-of-tolerance record carries the mark, boxed, above the body.
            const QFont mf = make_font(9.5, true);
            const qreal pad = c_.mm(1.2);
            const qreal mh = c_.height_of(mf, width_ - 2 * pad, doc_.mark) + 2 * pad;
            const QRectF box(left_, y_, width_, mh);
            c_.box(box, warning_red, 0.6);
            c_.text(box.adjusted(pad, pad, -pad, -pad), mf, doc_.mark,
                    Qt::AlignHCenter | Qt::TextWordWrap, warning_red);
            y_ += mh + c_.mm(2.5);
        }
        page_top_ = y_;
    }

    void new_page() {
        if (!c_.dry())
            c_.device().newPage();
        ++page_;
        begin_page();
    }

    /// Starts a new page unless `h` fits below the cursor (or the page is still empty).
    void need(qreal h) {
        if (y_ + h > bottom_ && y_ > page_top_ + 1)
            new_page();
    }

    void title_block() {
        const qreal qr_side = c_.mm(26);
        const qreal text_w = width_ - qr_side - c_.mm(6);
        const QFont kind = make_font(9, true);
        const QFont title = make_font(15, true);
        qreal y = y_;
        const qreal kh = c_.height_of(kind, text_w, doc_.kind_title);
        c_.text(QRectF(left_, y, text_w, kh), kind, doc_.kind_title.toUpper(), Qt::TextWordWrap,
                muted);
        y += kh + c_.mm(1);
        const qreal th = c_.height_of(title, text_w, doc_.title);
        c_.text(QRectF(left_, y, text_w, th), title, doc_.title);
        y += th;
        if (!doc_.batch_id.isEmpty()) {
            const QRectF qr(left_ + width_ - qr_side, y_ - c_.mm(1), qr_side, qr_side);
            if (QPainter* p = c_.painter())
                paint_qr_code(*p, qr, doc_.batch_id);
            const QFont idf = make_font(7);
            c_.text(QRectF(qr.left() - c_.mm(10), qr.bottom(), qr_side + c_.mm(10),
                           c_.line_height(idf)),
                    idf, doc_.batch_id, Qt::AlignRight, muted);
            y = std::max(y, qr.bottom() + c_.line_height(idf));
        }
        y_ = y + c_.mm(3);
    }

    void block(const Block& b) {
        switch (b.kind) {
        case Block::Kind::heading:
            heading(b.text, 0);
            break;
        case Block::Kind::paragraph:
            paragraph(b.text);
            break;
        case Block::Kind::fields:
            fields(b.fields);
            break;
        case Block::Kind::table:
            table(b.table);
            break;
        case Block::Kind::numbered:
            list(b.items, true);
            break;
        case Block::Kind::bullets:
            list(b.items, false);
            break;
        case Block::Kind::warnings:
            warnings(b.warnings);
            break;
        case Block::Kind::hazards:
            hazards(b);
            break;
        case Block::Kind::signoff:
            signoff(b.fields);
            break;
        case Block::Kind::notice:
            notice(b);
            break;
        }
    }

    /// How much of a block must fit below its heading: a short table whole, a long one its
    /// header and first row, anything else about two lines.
    qreal start_height(const Block& b) const {
        if (b.kind != Block::Kind::table)
            return c_.mm(14);
        const QList<qreal> widths = column_widths(b.table);
        const QFont hf = make_font(7.5, true);
        const QFont cf = make_font(8.2);
        const qreal min_row = c_.mm(7.5);
        qreal total = measure_row(b.table.headers, widths, hf, 0);
        const qreal first =
            total +
            (b.table.rows.isEmpty() ? 0 : measure_row(b.table.rows[0], widths, cf, min_row));
        for (const QStringList& row : b.table.rows)
            total += measure_row(row, widths, cf, min_row);
        return total < 0.4 * (bottom_ - top_) ? total : first;
    }

    qreal measure_row(const QStringList& cells, const QList<qreal>& widths, const QFont& f,
                      qreal min_h) const {
        const qreal pad = c_.mm(1.2);
        qreal h = min_h;
        for (int i = 0; i < widths.size(); ++i)
            h = std::max(h, c_.height_of(f, widths[i] - 2 * pad, cells.value(i)) + 2 * pad);
        return h;
    }

    void heading(const QString& s, qreal keep_with) {
        const QFont f = make_font(11, true);
        const qreal h = c_.height_of(f, width_, s);
        need(h + c_.mm(5) +
             std::max(keep_with, c_.mm(14))); // keep the heading with the start of its block
        y_ += c_.mm(2.5);
        c_.text(QRectF(left_, y_, width_, h), f, s);
        y_ += h + c_.mm(0.6);
        c_.line(QPointF(left_, y_), QPointF(left_ + width_, y_), ink, 0.3);
        y_ += c_.mm(1.8);
    }

    void paragraph(const QString& s) {
        const QFont f = make_font(8.5);
        const qreal h = c_.height_of(f, width_, s);
        need(h);
        c_.text(QRectF(left_, y_, width_, h), f, s);
        y_ += h + c_.mm(1.5);
    }

    void fields(const QList<KeyValue>& kv) {
        const QFont kf = make_font(6.8);
        const QFont vf = make_font(9.5);
        const qreal gap = c_.mm(4);
        const qreal col_w = (width_ - gap) / 2;
        for (int i = 0; i < kv.size(); i += 2) {
            qreal h = 0;
            for (int j = i; j < std::min<int>(i + 2, kv.size()); ++j)
                h = std::max(h, c_.line_height(kf) + c_.height_of(vf, col_w, kv[j].value));
            h += c_.mm(1.6);
            need(h);
            for (int j = i; j < std::min<int>(i + 2, kv.size()); ++j) {
                const qreal x = left_ + (j - i) * (col_w + gap);
                c_.text(QRectF(x, y_, col_w, c_.line_height(kf)), kf, kv[j].key.toUpper(),
                        Qt::AlignLeft, muted);
                const QString v = kv[j].value.isEmpty() ? QString() : kv[j].value;
                c_.text(QRectF(x, y_ + c_.line_height(kf), col_w, h), vf, v);
                c_.line(QPointF(x, y_ + h - c_.mm(0.6)), QPointF(x + col_w, y_ + h - c_.mm(0.6)),
                        QColor(0xCC, 0xCC, 0xCC), 0.15);
            }
            y_ += h;
        }
        y_ += c_.mm(1.5);
    }

    QList<qreal> column_widths(const Table& t) const {
        const int n = t.headers.size();
        QList<qreal> w;
        qreal sum = 0;
        for (int i = 0; i < n; ++i) {
            const qreal wi = i < t.weights.size() ? t.weights[i] : 1.0;
            w << wi;
            sum += wi;
        }
        for (qreal& x : w)
            x = x / sum * width_;
        return w;
    }

    qreal table_row(const QStringList& cells, const QList<qreal>& widths, const QFont& f,
                    bool dry_measure, const QColor& fill_color, qreal min_h) {
        const qreal pad = c_.mm(1.2);
        qreal h = min_h;
        for (int i = 0; i < widths.size(); ++i)
            h = std::max(h, c_.height_of(f, widths[i] - 2 * pad, cells.value(i)) + 2 * pad);
        if (dry_measure)
            return h;
        qreal x = left_;
        if (fill_color.isValid())
            c_.fill(QRectF(left_, y_, width_, h), fill_color);
        for (int i = 0; i < widths.size(); ++i) {
            c_.text(QRectF(x + pad, y_ + pad, widths[i] - 2 * pad, h - 2 * pad), f, cells.value(i));
            c_.box(QRectF(x, y_, widths[i], h));
            x += widths[i];
        }
        return h;
    }

    void table(const Table& t) {
        const QList<qreal> widths = column_widths(t);
        const QFont hf = make_font(7.5, true);
        const QFont cf = make_font(8.2);
        const qreal min_row = c_.mm(7.5); // room to write an amount by hand
        auto header = [&] { y_ += table_row(t.headers, widths, hf, false, header_fill, 0); };
        const qreal hh = table_row(t.headers, widths, hf, true, {}, 0);
        const qreal first =
            t.rows.isEmpty() ? 0 : table_row(t.rows[0], widths, cf, true, {}, min_row);
        qreal total = hh;
        for (const QStringList& row : t.rows)
            total += table_row(row, widths, cf, true, {}, min_row);
        // A short table stays on one page; a long one starts where it is and repeats its header.
        need(total < 0.4 * (bottom_ - top_) ? total : hh + first);
        header();
        for (int r = 0; r < t.rows.size(); ++r) {
            const qreal h = table_row(t.rows[r], widths, cf, true, {}, min_row);
            if (y_ + h > bottom_) {
                new_page();
                header();
            }
            const bool flag = r < t.flagged.size() && t.flagged[r];
            table_row(t.rows[r], widths, cf, false, flag ? flag_fill : QColor(), min_row);
            y_ += h;
        }
        y_ += c_.mm(2.5);
    }

    void list(const QStringList& items, bool numbered) {
        const QFont f = make_font(8.8);
        const qreal gutter = c_.mm(numbered ? 7 : 4.5);
        const qreal tick = numbered ? c_.mm(4) : 0; // a box to tick each step done
        const qreal text_w = width_ - gutter - (numbered ? tick + c_.mm(3) : 0);
        for (int i = 0; i < items.size(); ++i) {
            const qreal h = std::max(c_.height_of(f, text_w, items[i]), numbered ? tick : 0.0);
            need(h);
            c_.text(QRectF(left_, y_, gutter, h), f, numbered ? QString::number(i + 1) + "." : "•");
            c_.text(QRectF(left_ + gutter, y_, text_w, h), f, items[i]);
            if (numbered)
                c_.box(QRectF(left_ + width_ - tick, y_, tick, tick), muted, 0.25);
            y_ += h + c_.mm(1.4);
        }
        y_ += c_.mm(1);
    }

    void warnings(const QList<WarningLine>& ws) {
        const QFont tag = make_font(7, true);
        const QFont f = make_font(8.5);
        const QFont code = make_font(7);
        const qreal gutter = c_.mm(19);
        const qreal text_w = width_ - gutter;
        if (ws.isEmpty()) {
            paragraph(QStringLiteral("No warnings from the checks."));
            return;
        }
        for (const WarningLine& w : ws) {
            const QString body = w.message;
            const qreal h = c_.height_of(f, text_w, body) + c_.line_height(code);
            need(h);
            const QColor col = w.severity == "warning"   ? warning_red
                               : w.severity == "caution" ? caution_amber
                                                         : muted;
            c_.text(QRectF(left_, y_ + c_.mm(0.3), gutter, h), tag, w.severity.toUpper(),
                    Qt::AlignLeft, col);
            c_.text(QRectF(left_ + gutter, y_, text_w, h), f, body);
            c_.text(
                QRectF(left_ + gutter, y_ + h - c_.line_height(code), text_w, c_.line_height(code)),
                code, w.code, Qt::AlignLeft, muted);
            y_ += h + c_.mm(1.4);
        }
        y_ += c_.mm(1);
    }

    void hazards(const Block& b) {
        const QStringList pics = sorted_pictograms(b.pictograms);
        if (!pics.isEmpty()) {
            const qreal side = c_.mm(19);
            const qreal cell = c_.mm(21.5);
            const QFont cap = make_font(6.2);
            const qreal cap_h = 3 * c_.line_height(cap);
            const int per_row = std::max(1, int(width_ / cell));
            for (int i = 0; i < pics.size(); i += per_row) {
                need(side + cap_h + c_.mm(1));
                for (int j = i; j < std::min<int>(i + per_row, pics.size()); ++j) {
                    const qreal x = left_ + (j - i) * cell;
                    if (QPainter* p = c_.painter())
                        paint_ghs_pictogram(*p, QRectF(x, y_, side, side), pics[j]);
                    c_.text(QRectF(x - c_.mm(1), y_ + side, side + c_.mm(2), cap_h), cap,
                            pics[j] + "\n" + ghs_pictogram_name(pics[j]),
                            Qt::AlignHCenter | Qt::TextWordWrap, muted);
                }
                y_ += side + cap_h + c_.mm(1.5);
            }
        }
        const QFont cf = make_font(8.5, true);
        const QFont f = make_font(8.5);
        const qreal gutter = c_.mm(17);
        for (const HazardLine& h : b.hazard_lines) {
            const QString s =
                (h.statement.isEmpty()
                     ? QStringLiteral("(not in this program's table: see the safety data sheet)")
                     : h.statement) +
                (h.from.isEmpty() ? QString() : QStringLiteral(" — ") + h.from);
            const qreal hh = c_.height_of(f, width_ - gutter, s);
            need(hh);
            c_.text(QRectF(left_, y_, gutter, hh), cf, h.code);
            c_.text(QRectF(left_ + gutter, y_, width_ - gutter, hh), f, s);
            y_ += hh + c_.mm(0.8);
        }
        if (!b.text.isEmpty()) {
            y_ += c_.mm(1);
            paragraph(b.text);
        }
        y_ += c_.mm(1);
    }

    /// A boxed notice: the headline in bold, then one line per item, inside a heavy red frame.
    void notice(const Block& b) {
        const QFont hf = make_font(12, true);
        const QFont f = make_font(9);
        const qreal pad = c_.mm(2.5);
        const qreal inner_w = width_ - 2 * pad;
        qreal h = c_.height_of(hf, inner_w, b.text) + c_.mm(1.5);
        for (const QString& item : b.items)
            h += c_.height_of(f, inner_w - c_.mm(4), item) + c_.mm(0.8);
        h += 2 * pad;
        need(h);
        const QRectF box(left_, y_, width_, h);
        c_.box(box, warning_red, 0.8);
        qreal y = y_ + pad;
        const qreal th = c_.height_of(hf, inner_w, b.text);
        c_.text(QRectF(left_ + pad, y, inner_w, th), hf, b.text, Qt::TextWordWrap, warning_red);
        y += th + c_.mm(1.5);
        for (const QString& item : b.items) {
            const qreal ih = c_.height_of(f, inner_w - c_.mm(4), item);
            c_.text(QRectF(left_ + pad, y, c_.mm(4), ih), f, QStringLiteral("•"));
            c_.text(QRectF(left_ + pad + c_.mm(4), y, inner_w - c_.mm(4), ih), f, item);
            y += ih + c_.mm(0.8);
        }
        y_ += h + c_.mm(3);
    }

    void signoff(const QList<KeyValue>& roles) {
        const QFont kf = make_font(6.8);
        const QFont vf = make_font(9.5);
        const QList<qreal> widths = {width_ * 0.2, width_ * 0.3, width_ * 0.28, width_ * 0.22};
        const QStringList heads = {"", "Name", "Signature", "Date and time"};
        const qreal h = c_.mm(13);
        need(h * roles.size());
        for (const KeyValue& r : roles) {
            qreal x = left_;
            for (int i = 0; i < widths.size(); ++i) {
                c_.box(QRectF(x, y_, widths[i], h), muted, 0.25);
                const QRectF inner(x + c_.mm(1.2), y_ + c_.mm(1), widths[i] - c_.mm(2.4),
                                   h - c_.mm(2));
                if (i == 0)
                    c_.text(inner, make_font(9, true), r.key);
                else
                    c_.text(inner, kf, heads[i].toUpper(), Qt::AlignLeft, muted);
                if (i == 1 && !r.value.isEmpty())
                    c_.text(QRectF(inner.left(), inner.top() + c_.line_height(kf), inner.width(),
                                   inner.height() - c_.line_height(kf)),
                            vf, r.value);
                x += widths[i];
            }
            y_ += h;
        }
        y_ += c_.mm(2);
    }

    Canvas& c_;
    const SheetDocument& doc_;
    int total_ = 0;
    int page_ = 1;
    qreal left_ = 0, width_ = 0, top_ = 0, bottom_ = 0, y_ = 0;
    qreal page_top_ = 0; ///< where the body starts on this page (below the mark)
};

// ---- labels ----------------------------------------------------------------------------------

struct TextItem {
    QFont font;
    QString text;
    QColor color = ink;
    bool boxed = false; ///< framed (the out-of-tolerance mark)
};

constexpr double box_pad_mm = 0.8;

qreal item_height(Canvas& c, const TextItem& t, qreal width) {
    if (!t.boxed)
        return c.height_of(t.font, width, t.text);
    return c.height_of(t.font, width - 2 * c.mm(box_pad_mm), t.text,
                       Qt::TextWordWrap | Qt::AlignHCenter) +
           2 * c.mm(box_pad_mm);
}

qreal stack_height(Canvas& c, const QList<TextItem>& items, qreal width) {
    qreal h = 0;
    for (const TextItem& t : items)
        if (!t.text.isEmpty())
            h += item_height(c, t, width) + c.mm(0.4);
    return h;
}

qreal paint_stack(Canvas& c, const QList<TextItem>& items, qreal x, qreal y, qreal width) {
    for (const TextItem& t : items) {
        if (t.text.isEmpty())
            continue;
        const qreal h = item_height(c, t, width);
        if (t.boxed) {
            const qreal pad = c.mm(box_pad_mm);
            c.box(QRectF(x, y, width, h), t.color, 0.5);
            c.text(QRectF(x + pad, y + pad, width - 2 * pad, h - 2 * pad), t.font, t.text,
                   Qt::TextWordWrap | Qt::AlignHCenter, t.color);
        } else {
            c.text(QRectF(x, y, width, h), t.font, t.text, Qt::TextWordWrap, t.color);
        }
        y += h + c.mm(0.4);
    }
    return y;
}

QString or_blank(const QString& s) {
    return s.isEmpty() ? QStringLiteral("__________") : s;
}

QString hazard_codes_text(const LabelData& d) {
    QString s = sorted_hazard_codes(d.hazard_codes).join(' ');
    if (!s.isEmpty())
        s += QStringLiteral(" · ");
    s += QStringLiteral("Hazards of the parts as supplied; read the safety data sheets.");
    return s;
}

/// Paints one label in `r` (device pixels): contents, composition, pH, batch id, dates,
/// preparer, pictograms and the QR code of the batch id. Shrinks the text until it fits.
void paint_label(Canvas& c, const QRectF& r, const LabelData& d) {
    const qreal pad = c.mm(2.5);
    const QRectF in = r.adjusted(pad, pad, -pad, -pad);
    const bool wide = r.width() > r.height();
    const qreal qr_side = std::min(c.mm(24), wide ? in.height() * 0.5 : in.width() * 0.42);
    const QStringList pics = sorted_pictograms(d.pictograms);
    const qreal pic_step =
        pics.isEmpty() ? 0.0 : std::min(c.mm(wide ? 11.5 : 11), in.width() * 0.95 / pics.size());
    const qreal pic_side = pic_step * 0.95;
    const QString codes = hazard_codes_text(d);
    const QString qr_text = d.qr_text.isEmpty() ? d.batch_id : d.qr_text;

    auto build = [&](qreal s, QList<TextItem>& side, QList<TextItem>& full, TextItem& title) {
        title = {make_font(9.5 * s, true), d.title};
        const TextItem ph{make_font(9 * s, true), d.ph};
        const TextItem batch{make_font(7.5 * s, true), "Batch " + d.batch_id};
        const TextItem comp{make_font(6.8 * s), d.composition.join('\n')};
        const TextItem prepared{make_font(7 * s), "Prepared " + or_blank(d.prepared_at) + " by " +
                                                      or_blank(d.prepared_by)};
        const TextItem expires{make_font(7.5 * s, true), "Expires " + or_blank(d.expires_at)};
        const TextItem mark{make_font(7.5 * s, true), d.mark, warning_red, true};
        const TextItem release{make_font(7 * s, true), d.release, d.released ? ink : warning_red};
        side.clear();
        full.clear();
        if (wide) {
            side = {title, mark, ph, comp, batch, prepared, expires, release};
        } else {
            // Narrow column beside the QR code: the pH large, its temperature below; the batch
            // id goes full width so that it never breaks across lines.
            const int at = d.ph.indexOf(QStringLiteral(" at "));
            if (at > 0)
                side = {TextItem{make_font(11 * s, true), d.ph.left(at)},
                        TextItem{make_font(7.5 * s), d.ph.mid(at + 1)}};
            else
                side = {ph};
            full = {mark, batch, prepared, expires, release, comp};
        }
    };

    // Largest text first (readable at arm's length), smaller until everything fits.
    qreal scale = 1.4;
    QList<TextItem> side, full;
    TextItem title;
    const qreal side_w = in.width() - qr_side - c.mm(2);
    for (; scale > 0.5; scale -= 0.05) {
        build(scale, side, full, title);
        const QFont small = make_font(5.8 * scale);
        const qreal bottom_h = pic_side + c.mm(0.5) + c.height_of(small, in.width(), codes);
        qreal h = 0;
        if (wide) {
            h = std::max(stack_height(c, side, side_w), qr_side + c.line_height(small));
        } else {
            h = c.height_of(title.font, in.width(), title.text) + c.mm(1) +
                std::max(stack_height(c, side, side_w), qr_side) + c.mm(1) +
                stack_height(c, full, in.width());
        }
        if (h + bottom_h + c.mm(1) <= in.height())
            break;
    }
    QPainter* p = c.painter();
    if (!p)
        return;
    const QFont small = make_font(5.8 * scale);

    c.box(r, QColor(0xBB, 0xBB, 0xBB), 0.15); // cut line
    if (wide) {
        paint_stack(c, side, in.left(), in.top(), side_w);
        const QRectF qr(in.right() - qr_side, in.top(), qr_side, qr_side);
        paint_qr_code(*p, qr, qr_text);
        c.text(QRectF(qr.left() - c.mm(6), qr.bottom(), qr_side + c.mm(6), c.line_height(small)),
               small, qr_text, Qt::AlignRight, muted);
    } else {
        qreal y = paint_stack(c, {title}, in.left(), in.top(), in.width()) + c.mm(0.6);
        const QRectF qr(in.right() - qr_side, y, qr_side, qr_side);
        paint_qr_code(*p, qr, qr_text);
        const qreal ly = paint_stack(c, side, in.left(), y, side_w);
        y = std::max(ly, qr.bottom()) + c.mm(1);
        paint_stack(c, full, in.left(), y, in.width());
    }
    // Pictograms and hazard codes along the bottom edge.
    const qreal codes_h = c.height_of(small, in.width(), codes);
    const qreal pic_y = in.bottom() - codes_h - c.mm(0.5) - pic_side;
    for (int i = 0; i < pics.size(); ++i)
        paint_ghs_pictogram(*p, QRectF(in.left() + i * pic_step, pic_y, pic_side, pic_side),
                            pics[i]);
    c.text(QRectF(in.left(), in.bottom() - codes_h, in.width(), codes_h), small, codes,
           Qt::TextWordWrap, muted);
}

} // namespace

Paper paper_from_name(const QString& name) {
    const QString n = name.trimmed().toLower();
    if (n == "a4")
        return Paper::a4;
    if (n == "letter")
        return Paper::letter;
    if (n == "label62")
        return Paper::label62;
    throw chem::Error("--paper",
                      "\"" + name.toStdString() + "\" is not one of a4, letter, label62");
}

QString paper_name(Paper paper) {
    switch (paper) {
    case Paper::a4:
        return "a4";
    case Paper::letter:
        return "letter";
    case Paper::label62:
        return "label62";
    }
    return "a4";
}

LabelGrid label_grid(Paper paper) {
    LabelGrid g;
    if (paper == Paper::label62) {
        g.columns = g.rows = 1;
        g.label_width_mm = label62_width_mm;
        g.label_height_mm = label62_height_mm;
        return g;
    }
    // 2 × 4 labels with 8 mm page margins and 4 mm gaps (no particular label stock).
    const QSizeF page = page_size(paper).size(QPageSize::Millimeter);
    g.margin_left_mm = 8;
    g.margin_top_mm = 10;
    g.gap_mm = 4;
    g.label_width_mm =
        (page.width() - 2 * g.margin_left_mm - (g.columns - 1) * g.gap_mm) / g.columns;
    g.label_height_mm = (page.height() - 2 * g.margin_top_mm - (g.rows - 1) * g.gap_mm) / g.rows;
    return g;
}

int render_sheet(QPagedPaintDevice& device, const SheetDocument& doc, Paper paper) {
    if (paper == Paper::label62)
        throw chem::Error("--paper", "label62 is a label size; a sheet prints on a4 or letter");
    set_page(device, paper);
    int pages = 0;
    {
        Canvas dry(device, nullptr);
        pages = SheetFlow(dry, doc, 0).run();
    }
    QPainter painter;
    if (!painter.begin(&device))
        throw Failure(Failure::Kind::file, "cannot paint on the output device");
    painter.setRenderHint(QPainter::Antialiasing, true);
    Canvas c(device, &painter);
    const int painted = SheetFlow(c, doc, pages).run();
    painter.end();
    return painted;
}

int render_labels(QPagedPaintDevice& device, const QList<LabelData>& labels, Paper paper,
                  int copies) {
    set_page(device, paper);
    const LabelGrid g = label_grid(paper);
    QList<const LabelData*> all;
    for (const LabelData& l : labels)
        for (int i = 0; i < copies; ++i)
            all << &l;
    if (all.isEmpty())
        throw chem::Error("batch", "there is nothing to put on a label");
    QPainter painter;
    if (!painter.begin(&device))
        throw Failure(Failure::Kind::file, "cannot paint on the output device");
    painter.setRenderHint(QPainter::Antialiasing, true);
    Canvas c(device, &painter);
    const int per_page = g.columns * g.rows;
    int pages = 1;
    for (int i = 0; i < all.size(); ++i) {
        if (i > 0 && i % per_page == 0) {
            device.newPage();
            ++pages;
        }
        const int k = i % per_page;
        const int col = k % g.columns, row = k / g.columns;
        const QRectF r(c.mm(g.margin_left_mm + col * (g.label_width_mm + g.gap_mm)),
                       c.mm(g.margin_top_mm + row * (g.label_height_mm + g.gap_mm)),
                       c.mm(g.label_width_mm), c.mm(g.label_height_mm));
        paint_label(c, r, *all[i]);
    }
    painter.end();
    return pages;
}

namespace {

/// The file to write for `-o path`, after lstat: the path itself when it is new or a regular file;
/// a symlink's final target only with follow_symlinks. `mode` gets the old file's permission bits
/// (-1 when new).
QString checked_output_path(const QString& path, bool follow_symlinks, int& mode) {
    const std::string shown = chem::guard::quote_id(path.toStdString());
    QByteArray target = QFile::encodeName(path);
    struct stat st {};
    mode = -1;
    if (::lstat(target.constData(), &st) != 0) {
        if (errno == ENOENT)
            return path; // a new file
        throw Failure(Failure::Kind::file, "cannot write " + shown + ": " + std::strerror(errno));
    }
    if (S_ISLNK(st.st_mode)) {
        if (!follow_symlinks)
            throw chem::Error("-o", shown +
                                        " is a symbolic link; PhasePlan does not write through one"
                                        " (give --follow-symlinks to write to its target)");
        char resolved[PATH_MAX];
        if (!::realpath(target.constData(), resolved)) {
            // A dangling link: its target does not exist yet; write the link's own target path.
            const QString t = QFileInfo(path).symLinkTarget();
            if (t.isEmpty())
                throw Failure(Failure::Kind::file, "cannot resolve the link " + shown);
            target = QFile::encodeName(t);
            if (::lstat(target.constData(), &st) != 0)
                return t;
        } else {
            target = resolved;
            if (::lstat(target.constData(), &st) != 0)
                return QFile::decodeName(target);
        }
    }
    if (!S_ISREG(st.st_mode))
        throw chem::Error("-o", shown + " is not a regular file (a device, FIFO, socket or folder);"
                                        " give the path of a PDF file");
    if (::access(target.constData(), W_OK) != 0)
        throw chem::Error("-o", shown + " is read-only; PhasePlan does not replace it");
    mode = static_cast<int>(st.st_mode & 07777);
    return QFile::decodeName(target);
}

} // namespace

int write_pdf_atomically(const QString& path, const QString& title,
                         const std::function<int(QPagedPaintDevice&)>& paint,
                         bool follow_symlinks) {
    if (path.isEmpty())
        throw chem::Error("-o", "give the PDF file to write with -o FILE");
    int old_mode = -1;
    const QString target = checked_output_path(path, follow_symlinks, old_mode);
    QSaveFile file(target);
    if (!file.open(QIODevice::WriteOnly))
        throw Failure(Failure::Kind::file, "cannot write \"" + path.toStdString() +
                                               "\": " + file.errorString().toStdString());
    int pages = 0;
    {
        QPdfWriter writer(&file);
        writer.setResolution(pdf_dpi);
        writer.setTitle(title);
        writer.setCreator(QStringLiteral("PhasePlan"));
        pages = paint(writer); // an exception here leaves QSaveFile uncommitted: no file appears
    }
    if (!file.commit())
        throw Failure(Failure::Kind::file, "cannot write \"" + path.toStdString() +
                                               "\": " + file.errorString().toStdString());
    // QSaveFile's new file has the default mode: a replaced file keeps its own (read-only stays
    // so).
    if (old_mode >= 0)
        ::chmod(QFile::encodeName(target).constData(), static_cast<mode_t>(old_mode));
    return pages;
}

} // namespace phaseplan::print
