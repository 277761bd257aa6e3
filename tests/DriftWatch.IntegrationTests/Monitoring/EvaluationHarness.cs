using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>
/// Alert evaluation as the worker wires it (run feed, history store, cycle processor, alert store) over a real
/// store. A new harness over the same database is what a restarted worker gets: nothing survives but the store.
/// </summary>
internal sealed class EvaluationHarness
{
    public static readonly DateTimeOffset Start = new(2026, 3, 2, 8, 0, 0, TimeSpan.Zero);

    public EvaluationHarness(IStoreDatabase database, DriftWatchConfig config, FakeTimeProvider time)
    {
        Database = database;
        Time = time;
        History = new HistoryStore(database, config.Store.PointsPerRun);
        Alerts = new AlertStore(database);
        Outbox = new OutboxStore(database);
        Feed = new RunFeed(database);
        var processor = new AlertCycleProcessor(Alerts, config.Alerting, time, new OutboxSignal(), NullLogger<AlertCycleProcessor>.Instance);
        Evaluation = new AlertEvaluation(config, Feed, History, processor, NullLogger<AlertEvaluation>.Instance);
    }

    public IStoreDatabase Database { get; }

    public FakeTimeProvider Time { get; }

    public HistoryStore History { get; }

    public AlertStore Alerts { get; }

    public OutboxStore Outbox { get; }

    public RunFeed Feed { get; }

    public AlertEvaluation Evaluation { get; }

    /// <summary>Pairs watched, every message to a file mailing list in <paramref name="folder"/> (no server needed).</summary>
    public static DriftWatchConfig Config(string folder, params string[] pairs) => new()
    {
        Pairs = [.. pairs.Select(p => new PairConfig { Name = p, Source = "warehouse", Table = "shipping.parcels", X = "declared_kg", Y = "weighed_kg" })],
        Alerting = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = folder }] },
    };

    /// <summary>A succeeded run of <paramref name="pair"/> with these findings, recorded now; then the clock moves an hour on.</summary>
    public async Task<long> RecordAsync(string pair, params Finding[] findings)
    {
        var now = Time.GetUtcNow();
        // Anscombe (1973) set I, values from memory: a real profile and points for the digest to show.
        var points = new PairedSample([10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5], [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]);
        var profile = new RelationshipProfile { NRows = 11, NUsed = 11, PearsonR = 0.816, Slope = 0.500, Intercept = 3.00 };
        var id = await History.RecordRunAsync(new NewRun(pair, now, now.AddSeconds(2), RunStatus.Succeeded, null, profile, findings, null, points, "all"), CancellationToken.None);
        Time.Advance(TimeSpan.FromHours(1));
        return id;
    }

    /// <summary>A warning: needs two runs in a row to be confirmed (the default warning confirm runs).</summary>
    public static Finding Warning(string message) => new(FindingKind.SlopeShift, Severity.Warning, null, 0.4, message);

    /// <summary>A critical finding: confirmed, and mailed, after one run.</summary>
    public static Finding Critical(string message) => new(FindingKind.BecamePerfect, Severity.Critical, null, 1, message);
}
