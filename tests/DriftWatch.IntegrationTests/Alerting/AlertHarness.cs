using DriftWatch.Alerting.Channels.File;
using DriftWatch.Alerting.Channels.Smtp;
using DriftWatch.Alerting.Channels.Webhook;
using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>
/// The alerting path as the worker wires it — cycle processor, real store, dispatcher, real channels —
/// with a fake clock and fixed jitter so retries are tested without sleeping.
/// </summary>
internal sealed class AlertHarness
{
    public static readonly DateTimeOffset Start = new(2026, 3, 2, 8, 0, 0, TimeSpan.Zero);

    public AlertHarness(IStoreDatabase database, AlertingConfig config, OutboxOptions? options = null, ILogger<OutboxDispatcher>? dispatcherLog = null)
    {
        Store = new AlertStore(database);
        Outbox = new OutboxStore(database);
        Config = config;
        Options = options ?? new OutboxOptions();
        Processor = new AlertCycleProcessor(Store, config, Time, new OutboxSignal(), NullLogger<AlertCycleProcessor>.Instance);
        Dispatcher = new OutboxDispatcher(
            Outbox,
            [new SmtpAlertChannel(config.Smtp, TimeSpan.FromSeconds(10)), new FileAlertChannel(), new WebhookAlertChannel(Time)],
            config,
            Options,
            Time,
            new Random(7),
            dispatcherLog ?? NullLogger<OutboxDispatcher>.Instance);
    }

    public FakeTimeProvider Time { get; } = new(Start);

    public AlertStore Store { get; }

    public OutboxStore Outbox { get; }

    public AlertingConfig Config { get; }

    public OutboxOptions Options { get; }

    public AlertCycleProcessor Processor { get; }

    public OutboxDispatcher Dispatcher { get; }

    public static AlertingConfig Smtp(int port, params MailingListConfig[] lists) => new()
    {
        Smtp = new SmtpConfig { Host = "127.0.0.1", Port = port, Security = SmtpSecurity.None, From = "DriftWatch <driftwatch@example.org>" },
        MailingLists = lists,
        PublicUrl = new Uri("http://127.0.0.1:8087/"),
    };

    public static MailingListConfig MailingList(string name, params string[] recipients) => new() { Name = name, Recipients = recipients };

    public static PairConfig Pair(string name, string x = "declared_kg", string y = "weighed_kg") =>
        new() { Name = name, Source = "warehouse", Table = "shipping.parcels", X = x, Y = y };

    /// <summary>Anscombe (1973) set I as the baseline and set III as the current sample (values from memory).</summary>
    public static AlertPairContext Context(PairConfig pair) => new(
        pair,
        new RelationshipProfile { NRows = 11, NUsed = 11, PearsonR = 0.816, Slope = 0.500, Intercept = 3.00 },
        new PairedSample([10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5], [7.46, 6.77, 12.74, 7.11, 7.81, 8.84, 6.08, 5.39, 8.15, 6.42, 5.73]),
        new RelationshipProfile { NRows = 11, NUsed = 11, PearsonR = 0.816, Slope = 0.500, Intercept = 3.00 },
        new PairedSample([10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5], [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]));

    public static Finding Critical(FindingKind kind, string message) => new(kind, Severity.Critical, null, 1, message);

    /// <summary>One cycle over the given pairs, each with its findings, at the harness's current time.</summary>
    public Task<AlertCycleResult> CycleAsync(params (PairConfig Pair, Finding[] Findings)[] checks) =>
        Processor.ProcessAsync(
            [.. checks.Select((c, i) => PairOutcome.Success(c.Pair.Name, i + 1, c.Findings))],
            checks.ToDictionary(c => c.Pair.Name, c => Context(c.Pair)),
            null,
            CancellationToken.None);
}
