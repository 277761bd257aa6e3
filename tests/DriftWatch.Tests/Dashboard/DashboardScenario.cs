using System.Globalization;
using System.Text;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Store;

namespace DriftWatch.Tests.Dashboard;

/// <summary>
/// A real SQLite store in a temp file holding a few days of checks of invented pairs, produced by the real
/// pipeline: the profiler on generated samples (seeded), the baseline service, the finding engine, the alert
/// lifecycle and the alert store with its outbox. Test fixture data, invented for these tests only.
/// <list type="bullet">
/// <item><see cref="Healthy"/>: order totals follow item counts with noise throughout.</item>
/// <item><see cref="Perfect"/>: gross amounts carried per-invoice adjustments, then on the last day became exactly
/// 1.2 × net (a job started deriving the column): became_perfect, critical, confirmed.</item>
/// <item><see cref="Failing"/>: the last three checks could not reach the source: check_failing is confirmed.</item>
/// <item><see cref="Young"/>: configured a day ago, two runs, no baseline yet (first_runs: 5).</item>
/// <item><see cref="Hostile"/> (optional): pair and column names that are HTML, for escaping tests; its y is an
/// exact function of x, so its perfect_relationship alert is confirmed and the name reaches alerts and outbox too.</item>
/// </list>
/// Shared with the browser tests (linked into that project).
/// </summary>
internal sealed class DashboardScenario : IAsyncDisposable
{
    public const string Healthy = "orders.total_vs_items";
    public const string Perfect = "invoices.gross_vs_net";
    public const string Failing = "meters.power_vs_load";
    public const string Young = "fleet.fuel_vs_distance";
    public const string Hostile = "<script>alert(1)</script>";
    public const string HostileColumn = "<img src=x onerror=alert(2)>";
    public const string SourceError = "could not connect to plant_pg at 127.0.0.1:5433: Connection refused";

    public static readonly DateTimeOffset Start = new(2026, 11, 27, 0, 0, 0, TimeSpan.Zero);
    public static readonly TimeSpan Interval = TimeSpan.FromHours(6);
    public const int Cycles = 16;
    public const int SampleSize = 300;

    private readonly string _directory;

    private DashboardScenario(string directory, IStoreDatabase database, DriftWatchConfig config)
    {
        _directory = directory;
        Database = database;
        Config = config;
        History = StoreFactory.CreateHistoryStore(database, config.Store);
        Alerts = new AlertStore(database);
        Outbox = new OutboxStore(database);
    }

    public IStoreDatabase Database { get; }

    public HistoryStore History { get; }

    public AlertStore Alerts { get; }

    public OutboxStore Outbox { get; }

    public DriftWatchConfig Config { get; }

    public string StorePath => Path.Combine(_directory, "driftwatch.db");

    /// <summary>Twenty minutes after the last cycle: what the pages treat as now.</summary>
    public static DateTimeOffset Now => Start + Interval * (Cycles - 1) + TimeSpan.FromMinutes(20);

    public static TimeProvider Clock { get; } = new FixedClock(Now);

    /// <summary>Messages recorded in the outbox: all but the last were sent, the last failed once.</summary>
    public int OutboxCount { get; private set; }

    /// <param name="populate">False leaves the store migrated but empty (tests of the store connection only).</param>
    public static async Task<DashboardScenario> CreateAsync(bool hostile = false, bool populate = true, CancellationToken cancellationToken = default)
    {
        var directory = Path.Combine(Path.GetTempPath(), "driftwatch-dash-" + Guid.NewGuid().ToString("N")[..12]);
        Directory.CreateDirectory(directory);
        var config = BuildConfig(Path.Combine(directory, "driftwatch.db"), hostile);
        var database = await StoreFactory.OpenAsync(config.Store, cancellationToken);
        var scenario = new DashboardScenario(directory, database, config);
        if (populate)
        {
            await scenario.RunCyclesAsync(cancellationToken);
        }

        return scenario;
    }

    public static DriftWatchConfig BuildConfig(string storePath, bool hostile)
    {
        var pairs = new List<PairConfig>
        {
            new() { Name = Healthy, Source = "shop_db", Table = "sales.orders", X = "item_count", Y = "order_total", Tags = ["sales"], Schedule = "0 0 */6 * * ?" },
            new() { Name = Perfect, Source = "billing_db", Table = "billing.invoices", X = "net_amount", Y = "gross_amount", Tags = ["billing", "finance"], Schedule = "0 0 */6 * * ?" },
            new() { Name = Failing, Source = "plant_pg", Query = "SELECT load_pct, power_kw FROM telemetry.meter_readings", X = "load_pct", Y = "power_kw", Tags = ["plant"], Schedule = "0 0 */6 * * ?" },
            new() { Name = Young, Source = "shop_db", Table = "fleet.trips", X = "distance_km", Y = "fuel_l", Tags = ["fleet"], Schedule = "0 0 */6 * * ?" },
        };
        if (hostile)
        {
            pairs.Add(new PairConfig { Name = Hostile, Source = "shop_db", Table = "evil", X = HostileColumn, Y = "y\"quoted'", Tags = ["<b>tag</b>"] });
        }

        return new DriftWatchConfig
        {
            Sources =
            [
                new SourceConfig { Name = "shop_db", Kind = SourceKind.Sqlite, ConnectionString = "Data Source=shop.db" },
                new SourceConfig { Name = "billing_db", Kind = SourceKind.Postgres, ConnectionString = "Host=127.0.0.1;Database=billing" },
                new SourceConfig { Name = "plant_pg", Kind = SourceKind.Postgres, ConnectionString = "Host=127.0.0.1;Port=5433;Database=plant" },
            ],
            Store = new StoreConfig { Kind = StoreKind.Sqlite, ConnectionString = "Data Source=" + storePath },
            Pairs = pairs,
        };
    }

    private async Task RunCyclesAsync(CancellationToken cancellationToken)
    {
        var baselines = new BaselineService(History, Profiler.Profile);
        var random = new Random(20261127);
        var outbox = new List<long>();
        for (var cycle = 0; cycle < Cycles; cycle++)
        {
            var at = Start + Interval * cycle;
            var outcomes = new List<PairOutcome>();
            foreach (var pair in Config.Pairs)
            {
                if (pair.Name == Young && cycle < Cycles - 2)
                {
                    continue;
                }

                var started = at + TimeSpan.FromSeconds(outcomes.Count * 3);
                var finished = started + TimeSpan.FromMilliseconds(180 + random.Next(900));
                if (pair.Name == Failing && cycle >= Cycles - 3)
                {
                    var failedId = await History.RecordRunAsync(new NewRun(pair.Name, started, finished, RunStatus.Failed, SourceError, null, [], null, null), cancellationToken);
                    outcomes.Add(PairOutcome.Failure(pair.Name, failedId, cycle - (Cycles - 3) + 1, SourceError));
                    continue;
                }

                var sample = Generate(pair.Name, cycle, random);
                var profile = Profiler.Profile(sample, pair.Thresholds);
                var baseline = await baselines.GetOrBuildAsync(pair, started, cancellationToken);
                var findings = FindingEngine.Assess(profile, sample, baseline?.Profile, baseline?.Points, pair.Declared, pair.Thresholds, pair.X, pair.Y);
                var id = await History.RecordRunAsync(new NewRun(pair.Name, started, finished, RunStatus.Succeeded, null, profile, findings, null, sample, "all"), cancellationToken);
                outcomes.Add(PairOutcome.Success(pair.Name, id, findings));
            }

            var filtered = FalseDiscoveryControl.FilterCycle(outcomes, Config.Alerting.FdrQ);
            var open = await Alerts.GetOpenAlertsAsync(null, cancellationToken);
            var decision = AlertLifecycle.Evaluate(filtered, open, new Dictionary<string, DateTimeOffset>(), Config.Alerting, at + TimeSpan.FromMinutes(1));
            var messages = decision.Notifications.Select((n, i) => Message(n, at, i)).ToArray();
            await Alerts.ApplyCycleAsync(decision, messages, null, cancellationToken);
            OutboxCount += messages.Length;
        }

        // Delivery outcomes: every message sent a minute after it was queued, except the newest, which failed once.
        var entries = await Outbox.ListOutboxAsync(unsentOnly: true, 1000, cancellationToken);
        var newest = entries.MaxBy(e => e.Id);
        foreach (var entry in entries)
        {
            if (entry == newest)
            {
                await Outbox.MarkFailedAsync(entry.Id, "451 4.7.0 temporary failure, try again later", entry.CreatedAt + TimeSpan.FromMinutes(5), cancellationToken);
            }
            else
            {
                await Outbox.MarkSentAsync(entry.Id, entry.CreatedAt + TimeSpan.FromMinutes(1), cancellationToken);
            }
        }
    }

    /// <summary>Invented relationships; the seed makes every run of the tests see the same numbers.</summary>
    private static PairedSample Generate(string pair, int cycle, Random random)
    {
        var x = new double[SampleSize];
        var y = new double[SampleSize];
        for (var i = 0; i < SampleSize; i++)
        {
            switch (pair)
            {
                case Healthy:
                    x[i] = 1 + random.Next(20);
                    y[i] = 4 + 12.5 * x[i] + Noise(random, 9);
                    break;
                case Perfect:
                    x[i] = Math.Round(20 + random.NextDouble() * 480, 2);
                    // Until the last day gross carried per-invoice shipping and discounts; then a job recomputed it from net.
                    y[i] = cycle >= Cycles - 4 ? 1.2 * x[i] : 1.2 * x[i] + Noise(random, 45);
                    break;
                case Hostile:
                    // An exact function on every run: perfect_relationship is seen every run and confirmed.
                    x[i] = 1 + random.Next(50);
                    y[i] = 2 + 3 * x[i];
                    break;
                case Failing:
                    x[i] = 5 + random.NextDouble() * 90;
                    y[i] = 0.8 + 0.042 * x[i] + Noise(random, 0.25);
                    break;
                default:
                    x[i] = 2 + random.NextDouble() * 300;
                    y[i] = 0.3 + 0.078 * x[i] + Noise(random, 1.8);
                    break;
            }
        }

        return new PairedSample(x, y);
    }

    private static double Noise(Random random, double sd)
    {
        // Box–Muller: a normal deviate from two uniforms.
        var u1 = 1.0 - random.NextDouble();
        var u2 = random.NextDouble();
        return sd * Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }

    private static OutboxMessage Message(AlertNotification notification, DateTimeOffset at, int index)
    {
        var alert = notification.Alert;
        var subject = $"DriftWatch · {alert.Pair}: {JsonName(alert.Kind)} ({JsonName(notification.Kind)})";
        var id = string.Create(CultureInfo.InvariantCulture, $"<{at.ToUnixTimeMilliseconds()}.{index}@driftwatch.test>");
        var mime = Encoding.ASCII.GetBytes($"Message-Id: {id}\r\nSubject: {subject}\r\n\r\n{alert.Message}\r\n");
        return new OutboxMessage(id, "oncall", ChannelKind.Smtp, at + TimeSpan.FromMinutes(1), subject, ["data-oncall@example.test"], mime);
    }

    private static string JsonName<T>(T value)
        where T : struct, Enum => DriftWatch.Output.JsonContract.Name(value);

    public async ValueTask DisposeAsync()
    {
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        await Task.Yield();
        try
        {
            Directory.Delete(_directory, recursive: true);
        }
        catch (IOException)
        {
            // A file still held open by a pooled connection of another test; the temp folder is cleaned by the OS.
        }
    }

    private sealed class FixedClock(DateTimeOffset now) : TimeProvider
    {
        public override DateTimeOffset GetUtcNow() => now;
    }
}
