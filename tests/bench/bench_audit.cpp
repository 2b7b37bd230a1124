// Speed of the audit trail and the password hash (app/storage/audit_trail.h, accounts.h):
//   build/bench_audit --benchmark_repetitions=5 --benchmark_report_aggregates_only=true
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/sql_util.h"

#include <QCoreApplication>
#include <QJsonDocument>
#include <QTemporaryDir>

#include <benchmark/benchmark.h>

#include <memory>

using namespace phaseplan::storage;

namespace {

/// A change entry of ordinary size: one amended amount with its reason.
QJsonObject typical_changes() {
    return audit_change("actual[sodium-dihydrogen-phosphate-monohydrate].mass_g", 2.981, 2.984);
}

/// A database file whose trail holds `n` entries.
struct Trail {
    QTemporaryDir dir;
    std::unique_ptr<Database> db;
    explicit Trail(int n) {
        db = std::make_unique<Database>(dir.filePath("bench.sqlite"));
        sql::WriteTransaction tx(db->connection());
        for (int i = 0; i < n; ++i)
            append_audit(db->connection(), {}, "demo-prep", "amend", "batch", "HR-QC117-A-0041",
                         "transcription error", typical_changes());
        tx.commit();
    }
};

void BM_EntryHash(benchmark::State& state) {
    AuditEntry e;
    e.seq = 12345;
    e.logged_at = "2026-12-02T13:08:28.123Z";
    e.login = "demo-prep";
    e.action = "amend";
    e.record_type = "batch";
    e.record_id = "HR-QC117-A-0041";
    e.reason = "transcription error";
    e.changes = QString::fromUtf8(QJsonDocument(typical_changes()).toJson(QJsonDocument::Compact));
    e.prev_hash = audit_genesis_hash();
    for (auto _ : state)
        benchmark::DoNotOptimize(audit_hash(e));
}
BENCHMARK(BM_EntryHash);

// One change committed on its own, as the app writes it (WAL, synchronous=FULL).
void BM_AppendCommitted(benchmark::State& state) {
    Trail t(0);
    for (auto _ : state) {
        sql::WriteTransaction tx(t.db->connection());
        append_audit(t.db->connection(), {}, "demo-prep", "amend", "batch", "HR-QC117-A-0041",
                     "transcription error", typical_changes());
        tx.commit();
    }
}
BENCHMARK(BM_AppendCommitted)->Unit(benchmark::kMillisecond);

void BM_Verify(benchmark::State& state) {
    Trail t(static_cast<int>(state.range(0)));
    for (auto _ : state) {
        const AuditVerification v = verify_audit(t.db->connection());
        if (!v.intact)
            state.SkipWithError("broken");
    }
    state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(BM_Verify)->Arg(1000)->Arg(10000)->Arg(100000)->Unit(benchmark::kMillisecond);

void BM_Argon2idHash(benchmark::State& state) {
    for (auto _ : state)
        benchmark::DoNotOptimize(hash_password("demo-prep-2026"));
}
BENCHMARK(BM_Argon2idHash)->Unit(benchmark::kMillisecond);

} // namespace

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    benchmark::Initialize(&argc, argv);
    benchmark::RunSpecifiedBenchmarks();
    return 0;
}
