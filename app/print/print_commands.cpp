#include "print/print_commands.h"

#include "chem/error.h"
#include "core/date_time.h"
#include "print/documents.h"
#include "print/sheet.h"

#include <QPagedPaintDevice>

namespace phaseplan {

namespace {

void require_output(const CommandOptions& opt) {
    if (opt.output_path.isEmpty())
        throw chem::Error("-o", "give the PDF file to write with -o FILE");
}

} // namespace

QJsonObject command_sheet(const AppData& data, const QJsonObject& input,
                          const CommandOptions& opt) {
    const print::Paper paper = print::paper_from_name(opt.paper);
    if (paper == print::Paper::label62)
        throw chem::Error("--paper", "label62 is a label size; a sheet prints on a4 or letter");
    require_output(opt);
    const print::PrintJob job = print::build_print_job(data, input, now_minute_text());
    const int pages = print::write_pdf_atomically(
        opt.output_path, job.title,
        [&](QPagedPaintDevice& d) { return print::render_sheet(d, job.sheet, paper); },
        opt.follow_symlinks);
    QJsonObject out = job.summary;
    out["output"] = opt.output_path;
    out["paper"] = print::paper_name(paper);
    out["pages"] = pages;
    return out;
}

QJsonObject command_labels(const AppData& data, const QJsonObject& input,
                           const CommandOptions& opt) {
    const print::Paper paper = print::paper_from_name(opt.paper);
    require_output(opt);
    const print::PrintJob job = print::build_print_job(data, input, now_minute_text());
    const print::LabelGrid grid = print::label_grid(paper);
    // Default: one sheet full of labels for one bottle's document; one label each otherwise.
    int copies = job.copies.value_or(1);
    if (!job.copies && paper != print::Paper::label62 && job.labels.size() == 1)
        copies = grid.columns * grid.rows;
    const int pages = print::write_pdf_atomically(
        opt.output_path, job.title,
        [&](QPagedPaintDevice& d) { return print::render_labels(d, job.labels, paper, copies); },
        opt.follow_symlinks);
    QJsonObject out = job.summary;
    out["output"] = opt.output_path;
    out["paper"] = print::paper_name(paper);
    out["pages"] = pages;
    out["labels"] = static_cast<int>(job.labels.size()) * copies;
    return out;
}

} // namespace phaseplan
