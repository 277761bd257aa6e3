using DriftWatch.Core.Configuration;
using DriftWatch.Sources;
using MathNet.Numerics;
using MathNet.Numerics.Statistics;

namespace DriftWatch.IntegrationTests.Sources.Contract;

/// <summary>
/// What every source kind must do, run against each kind by a subclass that builds the same data in its
/// own engine: <c>readings</c> (row i = 1..<see cref="Rows"/>: x = i, y = 3i + (i mod 7), ts = 2026-03-01
/// 00:00 UTC + i s, label = 'r' || i), <c>edges</c> (x = i, y = 2i for i = 1..100 plus nulls and, where the
/// engine stores them, NaN/±Infinity) and <c>huge</c> (x = i·1e298, y = 2i·1e298 + (i mod 3)·1e297).
/// Oracles: the engine's own aggregates where it has them (named by each subclass), MathNet.Numerics over
/// every row, and plain arithmetic on the generating formula.
/// </summary>
public abstract class SourceContract : IAsyncLifetime
{
    public const int Rows = 20_000;

    /// <summary>2026-03-01 03:00 UTC: a one-hour window holds rows 7200..10799.</summary>
    public static readonly DateTimeOffset Now = new(2026, 3, 1, 3, 0, 0, TimeSpan.Zero);

    /// <summary>How the kind reports a uniform random draw in the run's method ("random", "reservoir", "random filter").</summary>
    protected abstract string RandomMethod { get; }

    /// <summary>(rows, nulls, usable) of <c>edges</c>: 100 usable rows plus what the engine can store.</summary>
    protected abstract (long Rows, long Nulls, long Used) EdgeCounts { get; }

    public abstract Task InitializeAsync();

    public abstract Task DisposeAsync();

    private protected abstract IPairSource CreateSource(TimeSpan? timeout = null);

    /// <summary>A source whose server or file is not there.</summary>
    private protected abstract IPairSource CreateUnreachableSource();

    /// <summary>The name a pair's <c>table</c> uses for a logical table (a file glob for Parquet).</summary>
    protected abstract string TableName(string logical);

    /// <summary>
    /// The engine's own figures over the rows of <c>readings</c> a plain SQL <paramref name="condition"/> on x selects:
    /// r, slope, mean of x, sample variance of y (null where the engine lacks one).
    /// </summary>
    protected abstract Task<double?[]> EngineFiguresAsync(string condition);

    private Task<double?[]> EngineFiguresAsync() => EngineFiguresAsync("x > 0");

    /// <summary>Every (x, y) of a logical table with both values finite, read from the engine.</summary>
    protected abstract Task<List<(double X, double Y)>> FiniteRowsAsync(string logical);

    /// <summary>Pairs that would write (a writing function, a smuggled statement) and must fail.</summary>
    protected abstract IEnumerable<PairConfig> WriteAttempts();

    /// <summary>Whether the data a write attempt aimed at is unchanged.</summary>
    protected abstract Task<bool> UntouchedAsync();

    /// <summary>A pair whose aggregate runs far longer than a second.</summary>
    protected abstract PairConfig SlowPair();

    protected PairConfig Pair(string logical = "readings", string x = "x", string y = "y", SampleSpec? sample = null, WindowSpec? window = null, string? where = null) => new()
    {
        Name = "contract." + logical,
        Source = "contract",
        Table = TableName(logical),
        X = x,
        Y = y,
        Sample = sample ?? new SampleSpec(),
        Window = window,
        Where = where,
    };

    protected static PairConfig QueryPair(string query) => new()
    {
        Name = "contract.query",
        Source = "contract",
        Query = query,
        X = "x",
        Y = "y",
    };

    private static async Task<T> UseAsync<T>(IPairSource source, Func<IPairSource, Task<T>> work)
    {
        try
        {
            return await work(source);
        }
        finally
        {
            switch (source)
            {
                case IAsyncDisposable a:
                    await a.DisposeAsync();
                    break;
                case IDisposable d:
                    d.Dispose();
                    break;
            }
        }
    }

    private Task<SampledPair> SampleAsync(PairConfig pair, TimeSpan? timeout = null) =>
        UseAsync(CreateSource(timeout), s => s.SampleAsync(pair, Now, CancellationToken.None));

    private Task<SourceException> FailAsync(PairConfig pair, IPairSource? source = null) =>
        UseAsync(source ?? CreateSource(), s => Assert.ThrowsAsync<SourceException>(() => s.SampleAsync(pair, Now, CancellationToken.None)));

    private static void AssertRealRows(Core.Profiling.PairedSample sample, int from = 1, int to = Rows)
    {
        for (var i = 0; i < sample.UsedCount; i++)
        {
            var x = sample.X[i];
            Assert.InRange(x, from, to);
            Assert.Equal(Math.Floor(x), x);
            Assert.Equal((3 * x) + (x % 7), sample.Y[i]);
        }

        Assert.Equal(sample.UsedCount, sample.X.Distinct().Count());
    }

    [Fact]
    public async Task Figures_AreTheEnginesOwnAggregates_AndMathNetsOverEveryRow()
    {
        var result = await SampleAsync(Pair());
        var figures = result.Figures!;
        var rows = await FiniteRowsAsync("readings");
        double[] x = [.. rows.Select(r => r.X)], y = [.. rows.Select(r => r.Y)];

        Assert.Equal(Rows, figures.RowCount);
        Assert.Equal(Rows, figures.UsedCount);
        Assert.Equal(0, figures.NullCount);
        // Reference library: MathNet.Numerics (Pearson, least-squares line, sample variance) over every row.
        var (intercept, slope) = Fit.Line(x, y);
        Assert.Equal(Correlation.Pearson(x, y), figures.PearsonR!.Value, 10);
        Assert.Equal(slope, figures.Slope!.Value, 10);
        Assert.Equal(intercept, figures.Intercept!.Value, 6);
        Assert.Equal(x.Mean(), figures.XMean!.Value, 8);
        Assert.Equal(1.0, figures.YVariance!.Value / y.Variance(), 10);

        // The engine's own aggregates, where it has them (each subclass names them).
        var engine = await EngineFiguresAsync();
        double?[] ours = [figures.PearsonR, figures.Slope, figures.XMean, figures.YVariance];
        for (var i = 0; i < engine.Length; i++)
        {
            if (engine[i] is { } expected)
            {
                Assert.Equal(1.0, ours[i]!.Value / expected, 12);
            }
        }
    }

    /// <summary>The figures over a window against the engine's own aggregates and MathNet over the rows x in [<paramref name="low"/>, <paramref name="high"/>].</summary>
    private async Task AssertFiguresOfRowsAsync(Core.History.SourceFigures figures, int low, int high)
    {
        Assert.Equal(high - low + 1, figures.RowCount);
        Assert.Equal(high - low + 1, figures.UsedCount);
        var engine = await EngineFiguresAsync(FormattableString.Invariant($"x >= {low} AND x <= {high}"));
        double?[] ours = [figures.PearsonR, figures.Slope, figures.XMean, figures.YVariance];
        for (var i = 0; i < engine.Length; i++)
        {
            if (engine[i] is { } expected)
            {
                Assert.Equal(1.0, ours[i]!.Value / expected, 12);
            }
        }

        // Reference library: MathNet.Numerics over the same rows read from the engine.
        var rows = (await FiniteRowsAsync("readings")).Where(r => r.X >= low && r.X <= high).ToList();
        double[] x = [.. rows.Select(r => r.X)], y = [.. rows.Select(r => r.Y)];
        Assert.Equal(Correlation.Pearson(x, y), figures.PearsonR!.Value, 10);
        Assert.Equal(Fit.Line(x, y).B, figures.Slope!.Value, 10);
    }

    /// <summary>Row i's time by the generating formula: 2026-03-01 00:00 UTC + i s.</summary>
    private static DateTimeOffset TimeOfRow(int i) => new DateTimeOffset(2026, 3, 1, 0, 0, 0, TimeSpan.Zero).AddSeconds(i);

    [Fact]
    public async Task AnchorLatest_EndsTheWindowAtTheNewestValueWithinTheFilter_BeforeTheCheckTime()
    {
        // Newest ts at or before 03:00 with x < 9000 is row 8999 (02:29:59); the window (01:29:59, 02:29:59] holds
        // rows 5400..8999: row 5399, exactly one hour before the newest, is out; row 8999 itself is in.
        var pair = Pair(window: new WindowSpec("ts", TimeSpan.FromHours(1), WindowAnchor.Latest), where: "x < 9000", sample: new SampleSpec { Method = SampleMethod.All });

        var latest = await UseAsync(CreateSource(), s => s.LatestAsync(pair, Now, CancellationToken.None));
        var result = await SampleAsync(pair);

        Assert.Equal(TimeOfRow(8999), latest);
        Assert.Equal(TimeOfRow(8999), result.WindowEnd);
        Assert.Equal(5400, result.Sample.X.Min());
        Assert.Equal(8999, result.Sample.X.Max());
        AssertRealRows(result.Sample, 5400, 8999);
        await AssertFiguresOfRowsAsync(result.Figures!, 5400, 8999);
    }

    [Fact]
    public async Task AnchorLatest_FarthestRows_ComeFromTheSameWindow()
    {
        var pair = Pair(window: new WindowSpec("ts", TimeSpan.FromHours(1), WindowAnchor.Latest), where: "x < 9000");
        // Against y = 2.999x the residual of row i is 0.001·i + (i mod 7): plain arithmetic over rows 5400..8999.
        var expected = Enumerable.Range(5400, 3600).Select(i => (X: (double)i, R: (3.0 * i) + (i % 7) - (2.999 * i))).OrderByDescending(t => t.R).Take(3).ToList();

        var rows = await UseAsync(CreateSource(), s => s.FarthestFromLineAsync(pair, Now, 0, 2.999, 3, CancellationToken.None));

        Assert.Equal(expected.Select(e => e.X), rows.Select(r => r.X));
    }

    [Fact]
    public async Task AsOf_AnchorNow_WindowEndsAtTheAsOfTime_RowsLoadedLaterAreOut()
    {
        // As of 01:00 with last 30m: [00:30, 01:00) holds rows 1800..3599; rows after 01:00 (up to 20 000) are out.
        var asOf = new DateTimeOffset(2026, 3, 1, 1, 0, 0, TimeSpan.Zero);
        var pair = Pair(window: new WindowSpec("ts", TimeSpan.FromMinutes(30)), sample: new SampleSpec { Method = SampleMethod.All });

        var result = await UseAsync(CreateSource(), s => s.SampleAsync(pair, asOf, CancellationToken.None));

        Assert.Equal(asOf, result.WindowEnd);
        Assert.Equal(1800, result.Sample.X.Min());
        Assert.Equal(3599, result.Sample.X.Max());
        await AssertFiguresOfRowsAsync(result.Figures!, 1800, 3599);
    }

    [Fact]
    public async Task AsOf_AnchorLatest_TakesTheNewestValueAtOrBeforeTheAsOfTime()
    {
        // Row 3600 is stamped exactly 01:00: at or before the as-of time, so it is the newest and in; (00:30, 01:00] is rows 1801..3600.
        var asOf = new DateTimeOffset(2026, 3, 1, 1, 0, 0, TimeSpan.Zero);
        var pair = Pair(window: new WindowSpec("ts", TimeSpan.FromMinutes(30), WindowAnchor.Latest), sample: new SampleSpec { Method = SampleMethod.All });

        var result = await UseAsync(CreateSource(), s => s.SampleAsync(pair, asOf, CancellationToken.None));

        Assert.Equal(TimeOfRow(3600), result.WindowEnd);
        Assert.Equal(1801, result.Sample.X.Min());
        Assert.Equal(3600, result.Sample.X.Max());
        await AssertFiguresOfRowsAsync(result.Figures!, 1801, 3600);
    }

    [Fact]
    public async Task AnchorLatest_WithNothingToRead_IsAnEmptyWindowWithoutAnEnd()
    {
        var nothing = Pair(window: new WindowSpec("ts", TimeSpan.FromHours(1), WindowAnchor.Latest), where: "x < 0");
        var beforeAnyRow = new DateTimeOffset(2026, 2, 28, 0, 0, 0, TimeSpan.Zero);
        var all = Pair(window: new WindowSpec("ts", TimeSpan.FromHours(1), WindowAnchor.Latest));

        var filtered = await SampleAsync(nothing);
        var early = await UseAsync(CreateSource(), s => s.SampleAsync(all, beforeAnyRow, CancellationToken.None));

        Assert.Null(await UseAsync(CreateSource(), s => s.LatestAsync(nothing, Now, CancellationToken.None)));
        Assert.Null(await UseAsync(CreateSource(), s => s.LatestAsync(all, beforeAnyRow, CancellationToken.None)));
        foreach (var result in new[] { filtered, early })
        {
            Assert.Null(result.WindowEnd);
            Assert.Equal(0, result.Figures!.RowCount);
            Assert.Equal(0, result.Sample.RowCount);
        }
    }

    [Fact]
    public async Task Window_AndWhere_KeepExactlyTheirRows()
    {
        // ts >= 02:00 and < 03:00 → i in [7200, 10800); x < 9000 → i in [7200, 9000): 1 800 rows.
        var pair = Pair(window: new WindowSpec("ts", TimeSpan.FromHours(1)), where: "x < 9000", sample: new SampleSpec { Method = SampleMethod.All });

        var result = await SampleAsync(pair);

        Assert.Equal(1800, result.Figures!.RowCount);
        Assert.Equal(1800, result.Sample.RowCount);
        Assert.Equal(7200, result.Sample.X.Min());
        Assert.Equal(8999, result.Sample.X.Max());
        AssertRealRows(result.Sample, 7200, 8999);
        // Mean of x over 7200..8999 by arithmetic: (7200 + 8999) / 2.
        Assert.Equal(8099.5, result.Figures.XMean!.Value, 9);
    }

    [Fact]
    public async Task RandomSample_HasTheAskedSize_OfDistinctRealRows_AndSaysHowItWasDrawn()
    {
        var result = await SampleAsync(Pair(sample: new SampleSpec { Rows = 500, Method = SampleMethod.Random }));

        Assert.Equal(500, result.Sample.RowCount);
        AssertRealRows(result.Sample);
        Assert.StartsWith(RandomMethod + " ", result.Method, StringComparison.Ordinal);
        Assert.Equal(Rows, result.Figures!.RowCount);
        // Not the first rows of the table: a uniform draw of 500 of 20 000 spreads over the range.
        Assert.True(result.Sample.X.Max() - result.Sample.X.Min() > Rows / 2, $"range {result.Sample.X.Min()}..{result.Sample.X.Max()}");
    }

    [Fact]
    public async Task SeededSample_Repeats()
    {
        var pair = Pair(sample: new SampleSpec { Rows = 300, Method = SampleMethod.Random, Seed = 7 });

        var first = await SampleAsync(pair);
        var second = await SampleAsync(pair);

        Assert.Equal(300, first.Sample.RowCount);
        Assert.Equal(first.Sample.X.Order(), second.Sample.X.Order());
        Assert.EndsWith("seed 7", first.Method, StringComparison.Ordinal);
    }

    [Fact]
    public async Task FarthestFromLine_RanksByResidual_AsTheFormulaSays()
    {
        // Against y = 2.999x the residual of row i is 0.001·i + (i mod 7): plain arithmetic gives the order.
        var expected = Enumerable.Range(1, Rows).Select(i => (X: (double)i, R: (3.0 * i) + (i % 7) - (2.999 * i))).OrderByDescending(t => t.R).Take(3).ToList();

        var rows = await UseAsync(CreateSource(), s => s.FarthestFromLineAsync(Pair(), Now, 0, 2.999, 3, CancellationToken.None));

        Assert.Equal(expected.Select(e => e.X), rows.Select(r => r.X));
        for (var i = 0; i < 3; i++)
        {
            Assert.Equal(expected[i].R, rows[i].Residual, 6);
        }
    }

    [Fact]
    public async Task BadValues_AreCounted_AndLeftOutOfTheFigures()
    {
        var result = await SampleAsync(Pair("edges", sample: new SampleSpec { Method = SampleMethod.All }));

        var (rows, nulls, used) = EdgeCounts;
        Assert.Equal(rows, result.Figures!.RowCount);
        Assert.Equal(nulls, result.Figures.NullCount);
        Assert.Equal(used, result.Figures.UsedCount);
        Assert.Equal(used, result.Sample.UsedCount);
        // The usable rows lie exactly on y = 2x.
        Assert.Equal(1.0, result.Figures.PearsonR!.Value, 12);
        Assert.Equal(2.0, result.Figures.Slope!.Value, 12);
    }

    [Fact]
    public async Task HugeValues_GiveFiniteFigures_MatchingMathNet()
    {
        var result = await SampleAsync(Pair("huge", sample: new SampleSpec { Method = SampleMethod.All }));
        var rows = await FiniteRowsAsync("huge");
        // Reference: MathNet over the rows divided by 1e298 (Pearson r and the slope do not change with the scale).
        double[] x = [.. rows.Select(r => r.X / 1e298)], y = [.. rows.Select(r => r.Y / 1e298)];

        Assert.Equal(100, result.Figures!.UsedCount);
        Assert.Equal(Correlation.Pearson(x, y), result.Figures.PearsonR!.Value, 10);
        Assert.Equal(1.0, result.Figures.Slope!.Value / Fit.Line(x, y).B, 10);
        Assert.Equal(1.0, result.Figures.XMean!.Value / (x.Mean() * 1e298), 10);
    }

    [Fact]
    public async Task WriteAttempts_Fail_AndTheDataStays()
    {
        foreach (var pair in WriteAttempts())
        {
            var e = await FailAsync(pair);
            Assert.Equal(SourceFailure.QueryError, e.Failure);
        }

        Assert.True(await UntouchedAsync());
    }

    [Fact]
    public async Task Unreachable_MissingTable_MissingColumn_NonNumeric_AreTheirFailureClasses()
    {
        Assert.Equal(SourceFailure.Unreachable, (await FailAsync(Pair(), CreateUnreachableSource())).Failure);
        var table = await FailAsync(Pair("nowhere"));
        Assert.Equal(SourceFailure.MissingTable, table.Failure);
        AssertOneLineNaming(table.Message, "Pair 'contract.nowhere'", "nowhere");
        var column = await FailAsync(Pair(x: "no_such_column"));
        Assert.Equal(SourceFailure.MissingColumn, column.Failure);
        AssertOneLineNaming(column.Message, "Pair 'contract.readings'", "no_such_column");
        var text = await FailAsync(Pair(x: "label"));
        Assert.Equal(SourceFailure.NonNumericColumn, text.Failure);
        Assert.Contains("label", text.Message, StringComparison.Ordinal);
    }

    /// <summary>A failed run's message is read in a table row, a mail line and a log line: one line that names the pair and what is missing.</summary>
    private static void AssertOneLineNaming(string message, params string[] parts)
    {
        Assert.All(parts, part => Assert.Contains(part, message, StringComparison.Ordinal));
        Assert.DoesNotContain('\n', message);
    }

    [Fact]
    public async Task SlowAggregate_StopsAtTheStatementTimeout()
    {
        var e = await UseAsync(CreateSource(TimeSpan.FromSeconds(1)), s => Assert.ThrowsAsync<SourceException>(() => s.SampleAsync(SlowPair(), Now, CancellationToken.None)));

        Assert.Equal(SourceFailure.Timeout, e.Failure);
    }

    [Fact]
    public async Task HostileIdentifiers_AreRefusedOrQuoted_NeverRun()
    {
        var control = await FailAsync(Pair(x: "x\u0001"));
        Assert.Equal(SourceFailure.QueryError, control.Failure);

        // A quote of either kind stays inside the quoted name: the column simply does not exist.
        foreach (var name in new[] { "x\"; DELETE FROM readings; --", "x`; DELETE FROM readings; --x" })
        {
            var e = await FailAsync(Pair(y: name));
            Assert.Equal(SourceFailure.MissingColumn, e.Failure);
        }

        var result = await SampleAsync(Pair(sample: new SampleSpec { Rows = 10, Method = SampleMethod.Random }));
        Assert.Equal(Rows, result.Figures!.RowCount);
    }
}
