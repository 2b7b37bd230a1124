#include "print/ghs.h"

#include <QHash>
#include <QPainter>
#include <QPainterPath>
#include <QRegularExpression>

#include <algorithm>
#include <cmath>

namespace phaseplan::print {

namespace {

// Colours: GHS asks for a red frame "sufficiently wide to be clearly visible" on a white
// background with a black symbol (UN GHS Rev. 9, Annex 1, from memory).
const QColor ghs_red(0xE3, 0x06, 0x13);
const QColor ghs_black(0, 0, 0);

// Every symbol is drawn in a 100 × 100 unit square whose diamond has its corners at the middle of
// each side. The symbol itself stays inside roughly 22..78 so it clears the frame.

void bar(QPainter& p, qreal x0, qreal y0, qreal x1, qreal y1) {
    p.fillRect(QRectF(QPointF(x0, y0), QPointF(x1, y1)), ghs_black);
}

QPainterPath flame_path(qreal cx, qreal base_y, qreal height, qreal half_width) {
    // A flame with two tongues, base on base_y, tip at base_y - height.
    auto X = [&](qreal u) { return cx + u * half_width; }; // u in [-1, 1]
    auto Y = [&](qreal v) { return base_y - v * height; }; // v in [0, 1]
    QPainterPath f;
    f.moveTo(X(-0.55), Y(0));
    f.cubicTo(X(-1.05), Y(0.25), X(-0.75), Y(0.55), X(-0.35), Y(0.72)); // left flank
    f.cubicTo(X(-0.40), Y(0.55), X(-0.20), Y(0.45), X(-0.10), Y(0.42)); // into the left tongue
    f.cubicTo(X(-0.15), Y(0.70), X(0.10), Y(0.88), X(0.30), Y(1.0));    // up to the tip
    f.cubicTo(X(0.25), Y(0.80), X(0.95), Y(0.60), X(0.85), Y(0.30));    // right flank
    f.cubicTo(X(0.80), Y(0.12), X(0.65), Y(0.02), X(0.55), Y(0));       // round into the base
    f.closeSubpath();
    // inner hollow, so the flame reads as a flame at small size
    QPainterPath inner;
    inner.moveTo(X(-0.20), Y(0.04));
    inner.cubicTo(X(-0.45), Y(0.20), X(-0.15), Y(0.35), X(0.05), Y(0.45));
    inner.cubicTo(X(0.05), Y(0.30), X(0.45), Y(0.25), X(0.25), Y(0.04));
    inner.closeSubpath();
    return f.subtracted(inner);
}

void draw_exploding_bomb(QPainter& p) { // GHS01
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    p.drawEllipse(QPointF(44, 62), 12, 12); // the bomb
    // fragments flying out of the blast above the bomb
    QPainterPath burst;
    const QPointF c(50, 46);
    for (int i = 0; i < 9; ++i) {
        qreal a = (-160 + i * 17.5) * M_PI / 180.0; // fan over the upper half
        qreal r0 = 10, r1 = (i % 2) ? 22 : 27;
        QPointF d(std::cos(a), std::sin(a));
        QPointF n(-d.y(), d.x());
        QPointF a0 = c + d * r0, a1 = c + d * r1;
        burst.moveTo(a0 + n * 1.2);
        burst.lineTo(a1 + n * 2.6);
        burst.lineTo(a1 - n * 2.6);
        burst.lineTo(a0 - n * 1.2);
        burst.closeSubpath();
    }
    p.drawPath(burst);
    // a few loose fragments
    p.drawEllipse(QPointF(66, 62), 2.5, 2.5);
    p.drawEllipse(QPointF(62, 72), 2, 2);
    p.drawEllipse(QPointF(28, 52), 2, 2);
}

void draw_flame(QPainter& p) { // GHS02
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    p.drawPath(flame_path(50, 70, 46, 17));
    bar(p, 30, 72, 70, 77);
}

void draw_flame_over_circle(QPainter& p) { // GHS03
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    QPainterPath ring;
    ring.addEllipse(QPointF(50, 60), 12, 12);
    QPainterPath hole;
    hole.addEllipse(QPointF(50, 60), 6.5, 6.5);
    ring = ring.subtracted(hole);
    QPainterPath flame = flame_path(50, 52, 32, 13);
    // keep the flame off the circle's hole and blend it into the ring
    p.drawPath(ring.united(flame.subtracted(hole)));
    bar(p, 32, 74, 68, 78);
}

void draw_gas_cylinder(QPainter& p) { // GHS04
    p.save();
    p.translate(50, 56);
    p.rotate(-28);
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    p.drawRoundedRect(QRectF(-22, -8, 38, 16), 7, 7); // body
    p.drawRect(QRectF(15, -3.5, 6, 7));               // neck
    p.drawRect(QRectF(20, -6, 3, 12));                // valve
    p.restore();
}

void draw_corrosion(QPainter& p) { // GHS05
    // Two test tubes pouring drops: one onto a surface (left), one onto a hand (right).
    auto tube = [&](QPointF mouth, QPointF closed) {
        const QPointF d = closed - mouth;
        const qreal length = std::hypot(d.x(), d.y());
        p.save();
        p.translate(mouth);
        p.rotate(std::atan2(d.y(), d.x()) * 180.0 / M_PI -
                 90.0); // local +y runs mouth -> closed end
        p.setPen(QPen(ghs_black, 2.4));
        p.setBrush(Qt::white);
        QPainterPath t;
        t.moveTo(-3.8, 0);
        t.lineTo(-3.8, length - 3.8);
        t.arcTo(QRectF(-3.8, length - 7.6, 7.6, 7.6), 180, 180);
        t.lineTo(3.8, 0);
        p.drawPath(t);
        // the liquid near the mouth
        p.setPen(Qt::NoPen);
        p.setBrush(ghs_black);
        p.drawRect(QRectF(-3.8, 0, 7.6, length * 0.35));
        p.restore();
    };
    tube(QPointF(34, 40), QPointF(47, 26));
    tube(QPointF(66, 40), QPointF(53, 26));
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    // drops
    for (QPointF d : {QPointF(33, 46), QPointF(33, 52), QPointF(67, 46), QPointF(67, 52)})
        p.drawEllipse(d, 1.7, 2.3);
    // surface with a bite taken out of it
    QPainterPath surface;
    surface.addRect(QRectF(24, 58, 24, 10));
    QPainterPath bite;
    bite.addEllipse(QPointF(34, 58), 4.5, 4);
    p.drawPath(surface.subtracted(bite));
    // hand (palm and fingers) with a bite
    QPainterPath hand;
    hand.setFillRule(Qt::WindingFill);
    hand.addRoundedRect(QRectF(54, 60, 18, 9), 2, 2);
    hand.addRoundedRect(QRectF(52, 58, 22, 3.2), 1.5, 1.5);
    hand.addRoundedRect(QRectF(70, 64, 6, 4), 1.5, 1.5); // thumb
    QPainterPath hbite;
    hbite.addEllipse(QPointF(64, 58), 4, 3.5);
    p.drawPath(hand.simplified().subtracted(hbite));
    bar(p, 24, 72, 76, 74);
}

void draw_skull(QPainter& p) { // GHS06
    // crossbones behind the skull
    p.setPen(QPen(ghs_black, 5, Qt::SolidLine, Qt::RoundCap));
    p.drawLine(QPointF(33, 60), QPointF(67, 76));
    p.drawLine(QPointF(33, 76), QPointF(67, 60));
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    for (QPointF e : {QPointF(31, 58), QPointF(31, 62), QPointF(69, 58), QPointF(69, 62),
                      QPointF(31, 74), QPointF(31, 78), QPointF(69, 74), QPointF(69, 78)})
        p.drawEllipse(e, 2.6, 2.6);
    QPainterPath skull, jaw;
    skull.addEllipse(QPointF(50, 40), 13, 12.5);
    jaw.addRoundedRect(QRectF(42, 44, 16, 13), 3, 3);
    skull = skull.united(jaw);
    QPainterPath holes;
    holes.addEllipse(QPointF(45, 40), 3.6, 3.8);
    holes.addEllipse(QPointF(55, 40), 3.6, 3.8);
    QPolygonF nose({QPointF(50, 45), QPointF(48, 49), QPointF(52, 49)});
    holes.addPolygon(nose);
    holes.closeSubpath();
    for (qreal x : {45.5, 50.0, 54.5})
        holes.addRect(QRectF(x - 0.8, 52, 1.6, 5)); // teeth gaps
    p.drawPath(skull.subtracted(holes));
}

void draw_exclamation(QPainter& p) { // GHS07
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    QPainterPath bar_path;
    bar_path.moveTo(44, 26);
    bar_path.quadTo(50, 21, 56, 26);
    bar_path.lineTo(53, 62);
    bar_path.lineTo(47, 62);
    bar_path.closeSubpath();
    p.drawPath(bar_path);
    p.drawEllipse(QPointF(50, 70), 5, 5);
}

void draw_health_hazard(QPainter& p) { // GHS08
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    p.drawEllipse(QPointF(50, 29), 6.5, 7); // head
    QPainterPath body;
    body.moveTo(31, 77);
    body.lineTo(33, 50);
    body.cubicTo(34, 42, 42, 39, 46, 39);
    body.lineTo(54, 39);
    body.cubicTo(58, 39, 66, 42, 67, 50);
    body.lineTo(69, 77);
    body.closeSubpath();
    // the white star on the chest
    QPolygonF star;
    const QPointF c(50, 58);
    for (int i = 0; i < 16; ++i) {
        qreal a = i * M_PI / 8 - M_PI / 2;
        qreal r = (i % 2) ? 4 : 11;
        star << c + QPointF(std::cos(a) * r, std::sin(a) * r);
    }
    QPainterPath starp;
    starp.addPolygon(star);
    starp.closeSubpath();
    p.drawPath(body.subtracted(starp));
}

void draw_environment(QPainter& p) { // GHS09
    // a dead tree and a dead fish on the ground
    p.setPen(QPen(ghs_black, 3.2, Qt::SolidLine, Qt::RoundCap));
    p.drawLine(QPointF(38, 74), QPointF(38, 36)); // trunk
    p.setPen(QPen(ghs_black, 2.2, Qt::SolidLine, Qt::RoundCap));
    p.drawLine(QPointF(38, 48), QPointF(28, 38));
    p.drawLine(QPointF(38, 44), QPointF(47, 33));
    p.drawLine(QPointF(38, 56), QPointF(46, 48));
    p.drawLine(QPointF(38, 38), QPointF(34, 28));
    p.drawLine(QPointF(31, 41), QPointF(27, 44));
    p.setPen(QPen(ghs_black, 2.4, Qt::SolidLine, Qt::RoundCap));
    p.drawLine(QPointF(24, 75), QPointF(76, 75)); // ground / water line
    p.setPen(Qt::NoPen);
    p.setBrush(ghs_black);
    QPainterPath fish;
    fish.setFillRule(Qt::WindingFill);
    fish.moveTo(50, 68);
    fish.cubicTo(55, 61, 66, 61, 71, 68);
    fish.cubicTo(66, 73, 55, 73, 50, 68);
    fish.closeSubpath();
    QPolygonF tail({QPointF(71, 68), QPointF(77, 63), QPointF(77, 73)});
    fish.addPolygon(tail);
    fish = fish.simplified();
    QPainterPath eye;
    eye.addEllipse(QPointF(55.5, 67), 1.3, 1.3);
    p.drawPath(fish.subtracted(eye));
}

} // namespace

bool is_ghs_pictogram(const QString& code) {
    static const QRegularExpression re("^GHS0[1-9]$");
    return re.match(code).hasMatch();
}

QString ghs_pictogram_name(const QString& code) {
    // Names as commonly used with UN GHS Rev. 9, Annex 1 (from memory).
    static const QHash<QString, QString> names = {
        {"GHS01", "Exploding bomb"},    {"GHS02", "Flame"},
        {"GHS03", "Flame over circle"}, {"GHS04", "Gas cylinder"},
        {"GHS05", "Corrosion"},         {"GHS06", "Skull and crossbones"},
        {"GHS07", "Exclamation mark"},  {"GHS08", "Health hazard"},
        {"GHS09", "Environment"},
    };
    return names.value(code);
}

void paint_ghs_pictogram(QPainter& painter, const QRectF& box, const QString& code) {
    const qreal side = std::min(box.width(), box.height());
    if (side <= 0)
        return;
    painter.save();
    painter.setRenderHint(QPainter::Antialiasing, true);
    painter.translate(box.center().x() - side / 2, box.center().y() - side / 2);
    painter.scale(side / 100.0, side / 100.0);

    // The diamond: white inside, red frame. The frame is about 1/12 of the side, inset so the
    // stroke stays inside the box.
    QPolygonF diamond({QPointF(50, 4), QPointF(96, 50), QPointF(50, 96), QPointF(4, 50)});
    QPen frame(ghs_red, 7.5);
    frame.setJoinStyle(Qt::MiterJoin);
    painter.setPen(frame);
    painter.setBrush(Qt::white);
    painter.drawPolygon(diamond);

    painter.setPen(Qt::NoPen);
    painter.setBrush(ghs_black);
    const int n = is_ghs_pictogram(code) ? code.right(1).toInt() : 0;
    switch (n) {
    case 1:
        draw_exploding_bomb(painter);
        break;
    case 2:
        draw_flame(painter);
        break;
    case 3:
        draw_flame_over_circle(painter);
        break;
    case 4:
        draw_gas_cylinder(painter);
        break;
    case 5:
        draw_corrosion(painter);
        break;
    case 6:
        draw_skull(painter);
        break;
    case 7:
        draw_exclamation(painter);
        break;
    case 8:
        draw_health_hazard(painter);
        break;
    case 9:
        draw_environment(painter);
        break;
    default: {
        QFont f = painter.font();
        f.setPixelSize(14);
        f.setBold(true);
        painter.setFont(f);
        painter.setPen(ghs_black);
        painter.drawText(QRectF(20, 35, 60, 30), Qt::AlignCenter, code.isEmpty() ? "?" : code);
        break;
    }
    }
    painter.restore();
}

QString hazard_statement(const QString& h_code) {
    // Standard English wording, UN GHS Rev. 9 (2021) Annex 3 section 1; EUH codes from
    // Regulation (EC) No 1272/2008 Annex II. Quoted from memory: the safety data sheet of the
    // product in hand is the authority.
    static const QHash<QString, QString> table = {
        {"H200", "Unstable explosive"},
        {"H201", "Explosive; mass explosion hazard"},
        {"H220", "Extremely flammable gas"},
        {"H221", "Flammable gas"},
        {"H222", "Extremely flammable aerosol"},
        {"H223", "Flammable aerosol"},
        {"H224", "Extremely flammable liquid and vapour"},
        {"H225", "Highly flammable liquid and vapour"},
        {"H226", "Flammable liquid and vapour"},
        {"H227", "Combustible liquid"},
        {"H228", "Flammable solid"},
        {"H240", "Heating may cause an explosion"},
        {"H241", "Heating may cause a fire or explosion"},
        {"H242", "Heating may cause a fire"},
        {"H250", "Catches fire spontaneously if exposed to air"},
        {"H251", "Self-heating; may catch fire"},
        {"H260", "In contact with water releases flammable gases which may ignite spontaneously"},
        {"H261", "In contact with water releases flammable gas"},
        {"H270", "May cause or intensify fire; oxidizer"},
        {"H271", "May cause fire or explosion; strong oxidizer"},
        {"H272", "May intensify fire; oxidizer"},
        {"H280", "Contains gas under pressure; may explode if heated"},
        {"H281", "Contains refrigerated gas; may cause cryogenic burns or injury"},
        {"H290", "May be corrosive to metals"},
        {"H300", "Fatal if swallowed"},
        {"H301", "Toxic if swallowed"},
        {"H302", "Harmful if swallowed"},
        {"H303", "May be harmful if swallowed"},
        {"H304", "May be fatal if swallowed and enters airways"},
        {"H305", "May be harmful if swallowed and enters airways"},
        {"H310", "Fatal in contact with skin"},
        {"H311", "Toxic in contact with skin"},
        {"H312", "Harmful in contact with skin"},
        {"H313", "May be harmful in contact with skin"},
        {"H314", "Causes severe skin burns and eye damage"},
        {"H315", "Causes skin irritation"},
        {"H316", "Causes mild skin irritation"},
        {"H317", "May cause an allergic skin reaction"},
        {"H318", "Causes serious eye damage"},
        {"H319", "Causes serious eye irritation"},
        {"H320", "Causes eye irritation"},
        {"H330", "Fatal if inhaled"},
        {"H331", "Toxic if inhaled"},
        {"H332", "Harmful if inhaled"},
        {"H333", "May be harmful if inhaled"},
        {"H334", "May cause allergy or asthma symptoms or breathing difficulties if inhaled"},
        {"H335", "May cause respiratory irritation"},
        {"H336", "May cause drowsiness or dizziness"},
        {"H340", "May cause genetic defects"},
        {"H341", "Suspected of causing genetic defects"},
        {"H350", "May cause cancer"},
        {"H351", "Suspected of causing cancer"},
        {"H360", "May damage fertility or the unborn child"},
        {"H360D", "May damage the unborn child"},
        {"H360F", "May damage fertility"},
        {"H360FD", "May damage fertility. May damage the unborn child"},
        {"H360Df", "May damage the unborn child. Suspected of damaging fertility"},
        {"H360Fd", "May damage fertility. Suspected of damaging the unborn child"},
        {"H361", "Suspected of damaging fertility or the unborn child"},
        {"H361d", "Suspected of damaging the unborn child"},
        {"H361f", "Suspected of damaging fertility"},
        {"H361fd", "Suspected of damaging fertility. Suspected of damaging the unborn child"},
        {"H362", "May cause harm to breast-fed children"},
        {"H370", "Causes damage to organs"},
        {"H371", "May cause damage to organs"},
        {"H372", "Causes damage to organs through prolonged or repeated exposure"},
        {"H373", "May cause damage to organs through prolonged or repeated exposure"},
        {"H400", "Very toxic to aquatic life"},
        {"H401", "Toxic to aquatic life"},
        {"H402", "Harmful to aquatic life"},
        {"H410", "Very toxic to aquatic life with long lasting effects"},
        {"H411", "Toxic to aquatic life with long lasting effects"},
        {"H412", "Harmful to aquatic life with long lasting effects"},
        {"H413", "May cause long lasting harmful effects to aquatic life"},
        {"H420",
         "Harms public health and the environment by destroying ozone in the upper atmosphere"},
        {"EUH014", "Reacts violently with water"},
        {"EUH019", "May form explosive peroxides"},
        {"EUH029", "Contact with water liberates toxic gas"},
        {"EUH031", "Contact with acids liberates toxic gas"},
        {"EUH032", "Contact with acids liberates very toxic gas"},
        {"EUH066", "Repeated exposure may cause skin dryness or cracking"},
        {"EUH071", "Corrosive to the respiratory tract"},
    };
    return table.value(h_code.trimmed());
}

QStringList sorted_pictograms(const QStringList& codes) {
    QStringList out;
    for (const QString& c : codes) {
        QString t = c.trimmed().toUpper();
        if (!t.isEmpty() && !out.contains(t))
            out << t;
    }
    std::sort(out.begin(), out.end());
    return out;
}

QStringList sorted_hazard_codes(const QStringList& codes) {
    QStringList out;
    for (const QString& c : codes) {
        QString t = c.trimmed();
        if (!t.isEmpty() && !out.contains(t))
            out << t;
    }
    // H before EUH; then by the number; then by any suffix letters (H360D after H360).
    auto key = [](const QString& s) {
        static const QRegularExpression re("^(EUH|H)(\\d+)(.*)$");
        auto m = re.match(s);
        if (!m.hasMatch())
            return std::tuple<int, int, QString>(2, 0, s);
        return std::tuple<int, int, QString>(m.captured(1) == "H" ? 0 : 1, m.captured(2).toInt(),
                                             m.captured(3));
    };
    std::stable_sort(out.begin(), out.end(),
                     [&](const QString& a, const QString& b) { return key(a) < key(b); });
    return out;
}

} // namespace phaseplan::print
