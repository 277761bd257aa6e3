using System.Collections.Concurrent;
using System.Data;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using Npgsql;
using Npgsql.PostgresTypes;
using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// The shared read of a group of pairs (<see cref="IGroupSource"/>): one session, one snapshot, one gate slot of
/// <see cref="SourceConfig.MaxConcurrentQueries"/>; one aggregate scan (two when the remembered references lie
/// too far from the means; a cheap survey first for columns nothing is known of), one sample of all the group's
/// columns. JIT is off for the session: it makes such wide aggregates several times slower.
/// </summary>
internal sealed partial class PostgresPairSource
{
    /// <summary>After the hint store failed, how long shared reads go on without it (each attempt could wait for a connect timeout).</summary>
    private static readonly TimeSpan HintsPause = TimeSpan.FromMinutes(1);

    // Each column's mean at its last shared read: the shift of the next one, so one scan usually suffices.
    private readonly ConcurrentDictionary<string, double> _references = new(StringComparer.Ordinal);

    // Whether each column was finite on every row at its last shared read: its pairs then get the lean aggregate.
    private readonly ConcurrentDictionary<string, bool> _clean = new(StringComparer.Ordinal);

    // Keys whose hint was looked up in the store (found or not) by this object.
    private readonly ConcurrentDictionary<string, bool> _looked = new(StringComparer.Ordinal);

    private readonly IColumnHints? _hints;

    private long _hintsPausedUntilMs;

    private long _aggregateScans;

    /// <summary>Aggregate statements run by shared reads since this object was made (tests see what a hint saved).</summary>
    internal long AggregateScans => Interlocked.Read(ref _aggregateScans);

    public async Task<IReadOnlyList<Lazy<SampledPair>?>> SampleGroupAsync(IReadOnlyList<PairConfig> pairs, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        if (pairs.Count == 0)
        {
            return [];
        }

        var first = pairs[0];
        var targets = pairs.Select(p => PairTarget.From(p)).ToList();
        var target = targets[0];
        return await InSessionAsync(first, target, async (connection, ct) =>
        {
            await ExecuteAsync(connection, "SELECT set_config('jit', 'off', true)", _ => { }, ct);
            // Pairs anchored on their newest load never share a read (TableGroups), so the window ends now.
            var range = first.Window is null ? null : WindowRange.EndingAt(first.Window, now);
            var shared = new PostgresPairSql(target, range);
            var all = targets.SelectMany(t => new[] { t.X, t.Y }).Distinct(StringComparer.Ordinal).ToList();
            var types = await ProbeGroupAsync(connection, new PostgresGroupSql(shared, target, all, [], new bool[all.Count]), all, first, target, ct);

            // A pair with a column that is not a number is left to its own check, which names the column.
            var included = Enumerable.Range(0, pairs.Count).Where(i => types[targets[i].X] is not null && types[targets[i].Y] is not null).ToList();
            var columns = included.SelectMany(i => new[] { targets[i].X, targets[i].Y }).Distinct(StringComparer.Ordinal).ToList();
            var index = columns.Select((c, i) => (c, i)).ToDictionary(e => e.c, e => e.i, StringComparer.Ordinal);
            var pairColumns = included.Select(i => (index[targets[i].X], index[targets[i].Y])).ToList();
            var sql = new PostgresGroupSql(shared, target, columns, pairColumns, [.. columns.Select(c => types[c] == true)]);

            var figures = new Core.History.SourceFigures?[pairs.Count];
            long rows = 0;
            if (included.Count > 0)
            {
                var keys = columns.Select(c => shared.From() + "\n" + target.Where + "\n" + c).ToList();
                await RecallHintsAsync(keys, now, ct);
                await SurveyUnknownColumnsAsync(connection, sql, keys, ct);
                var references = keys.Select(k => _references.TryGetValue(k, out var r) ? r : 0.0).ToArray();
                var clean = keys.Select(k => _clean.TryGetValue(k, out var c) && c).ToArray();
                for (var pass = 0; pass < 3; pass++)
                {
                    // Pairs whose columns were finite on every row last time get the lean form; this scan checks it.
                    var full = pairColumns.Select(c => !(clean[c.Item1] && clean[c.Item2])).ToArray();
                    var statement = full.Any(f => f) ? sql.Aggregate(references, full) : sql.Lean(references);
                    var read = await ReadGroupAggregateAsync(connection, statement, columns.Count, pairColumns.Count, ct);
                    Interlocked.Increment(ref _aggregateScans);
                    rows = read.Rows;
                    var lacking = false;
                    for (var k = 0; k < included.Count; k++)
                    {
                        var (x, y) = pairColumns[k];
                        var sums = full[k] || (read.Columns[x].Finite == rows && read.Columns[y].Finite == rows) ? read.Pairs[k] : null;
                        figures[included[k]] ??= sums is null ? null : GroupFigures.Of(rows, references[x], read.Columns[x], references[y], read.Columns[y], sums);
                        lacking |= figures[included[k]] is null;
                    }

                    // Shift by this scan's means and note which columns were finite throughout: the next read (or a
                    // second scan now) keeps every digit and knows which pairs need the sums over unusable rows.
                    var changed = false;
                    for (var c = 0; c < columns.Count; c++)
                    {
                        var isClean = read.Columns[c].Finite == rows;
                        changed |= isClean != clean[c];
                        clean[c] = isClean;
                        _clean[keys[c]] = isClean;
                        if (read.Columns[c].Mean(references[c]) is { } mean && double.IsFinite(mean))
                        {
                            changed |= mean != references[c];
                            references[c] = mean;
                            _references[keys[c]] = mean;
                        }
                    }

                    if (!lacking || !changed)
                    {
                        break;
                    }
                }

                await KeepHintsAsync(keys, now, ct);
            }

            var spec = first.Sample;
            var needsEstimate = target.IsTable && spec.Method is SampleMethod.Auto or SampleMethod.Tablesample;
            var estimate = needsEstimate ? await EstimateRowsAsync(connection, target.Table!, ct) : null;
            var plan = SamplePlanner.Choose(spec, rows, estimate, first.Window is not null || target.Where is not null);
            if (spec.Seed is { } seed && plan.Draw != SampleDraw.All)
            {
                await ExecuteAsync(connection, "SELECT setseed($1)", p => p.Add(SeedFraction(seed), NpgsqlDbType.Double), ct);
            }

            var rowsRead = included.Count == 0 ? null : await ReadGroupSampleAsync(connection, sql, plan, spec, columns.Count, ct);
            var result = new Lazy<SampledPair>?[pairs.Count];
            for (var k = 0; k < included.Count; k++)
            {
                if (figures[included[k]] is { } f)
                {
                    var (x, y) = pairColumns[k];
                    result[included[k]] = new Lazy<SampledPair>(() =>
                    {
                        var sample = rowsRead!.Pair(x, y, plan.Draw == SampleDraw.All ? 0 : spec.Rows);
                        return new SampledPair(sample, f, Describe(plan, spec, sample)) { WindowEnd = range?.To };
                    });
                }
            }

            return (IReadOnlyList<Lazy<SampledPair>?>)result;
        }, cancellationToken);
    }

    /// <summary>
    /// For columns with neither a remembered nor a stored hint: one cheap statement of their finite counts and means,
    /// so the shared aggregate that follows is lean where it can be and shifted by the means (one scan, not two).
    /// </summary>
    private async Task SurveyUnknownColumnsAsync(NpgsqlConnection connection, PostgresGroupSql sql, List<string> keys, CancellationToken ct)
    {
        var unknown = Enumerable.Range(0, keys.Count).Where(c => !_clean.ContainsKey(keys[c])).ToList();
        if (unknown.Count == 0)
        {
            return;
        }

        var (text, parameters) = sql.Survey(unknown);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        Interlocked.Increment(ref _aggregateScans);
        var rows = reader.GetInt64(0);
        for (var i = 0; i < unknown.Count; i++)
        {
            var a = reader.GetFieldValue<double?[]>(1 + i);
            var key = keys[unknown[i]];
            _clean[key] = (long)(a[0] ?? 0) == rows;
            if (a[1] is { } mean && double.IsFinite(mean))
            {
                _references[key] = mean;
            }
        }
    }

    /// <summary>Fills the remembered references and cleanliness of keys this object has not looked up yet from the hint store.</summary>
    private async Task RecallHintsAsync(IReadOnlyList<string> keys, DateTimeOffset now, CancellationToken ct)
    {
        var unknown = keys.Where(k => !_looked.ContainsKey(k)).Distinct(StringComparer.Ordinal).ToList();
        if (_hints is null || unknown.Count == 0 || now.ToUnixTimeMilliseconds() < Interlocked.Read(ref _hintsPausedUntilMs))
        {
            return;
        }

        try
        {
            var found = await _hints.ReadAsync(Config.Name, unknown, ct);
            foreach (var key in unknown)
            {
                _looked[key] = true;
                if (found.TryGetValue(key, out var hint))
                {
                    // What this object learned itself is newer than the store's.
                    if (hint.Mean is { } mean && double.IsFinite(mean))
                    {
                        _references.TryAdd(key, mean);
                    }

                    _clean.TryAdd(key, hint.AllFinite);
                }
            }
        }
        catch (Exception ex) when (IsHintStoreFailure(ex))
        {
            PauseHints(now);
        }
    }

    /// <summary>Hands what this read learned to the hint store; a store that fails costs the next process a scan, not this check.</summary>
    private async Task KeepHintsAsync(IReadOnlyList<string> keys, DateTimeOffset now, CancellationToken ct)
    {
        if (_hints is null || now.ToUnixTimeMilliseconds() < Interlocked.Read(ref _hintsPausedUntilMs))
        {
            return;
        }

        var hints = new Dictionary<string, ColumnHint>(StringComparer.Ordinal);
        foreach (var key in keys)
        {
            if (_clean.TryGetValue(key, out var clean))
            {
                hints[key] = new ColumnHint(_references.TryGetValue(key, out var mean) ? mean : null, clean);
            }
        }

        try
        {
            await _hints.WriteAsync(Config.Name, hints, now, ct);
        }
        catch (Exception ex) when (IsHintStoreFailure(ex))
        {
            PauseHints(now);
        }
    }

    private void PauseHints(DateTimeOffset now) => Interlocked.Exchange(ref _hintsPausedUntilMs, (now + HintsPause).ToUnixTimeMilliseconds());

    private static bool IsHintStoreFailure(Exception ex) =>
        ex is System.Data.Common.DbException or IOException or TimeoutException or System.Net.Sockets.SocketException or InvalidOperationException;

    /// <summary>Per column: true for numeric (it needs the range guard), false for another number type, null when it is not a number.</summary>
    private static async Task<Dictionary<string, bool?>> ProbeGroupAsync(
        NpgsqlConnection connection, PostgresGroupSql sql, List<string> columns, PairConfig first, PairTarget target, CancellationToken ct)
    {
        var (text, parameters) = sql.Probe();
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(CommandBehavior.SchemaOnly, ct);
        var types = new Dictionary<string, bool?>(StringComparer.Ordinal);
        for (var i = 0; i < reader.FieldCount; i++)
        {
            var type = reader.GetPostgresType(i);
            var internalName = (type is PostgresDomainType domain ? domain.BaseType : type)?.InternalName ?? "unknown";
            if (i < columns.Count)
            {
                types[columns[i]] = NumericTypes.Contains(internalName) ? internalName == "numeric" : null;
            }
            else if (!TimeTypes.Contains(internalName))
            {
                throw new SourceException(SourceFailure.QueryError, $"Pair '{first.Name}' ({target.Describe}): window column {first.Window!.Column} is {type?.DisplayName ?? internalName}; it must be a date or timestamp.");
            }
        }

        return types;
    }

    private sealed record GroupAggregate(long Rows, ColumnSums[] Columns, PairSums[] Pairs);

    private static async Task<GroupAggregate> ReadGroupAggregateAsync(
        NpgsqlConnection connection, (string Sql, PositionalParameters Parameters) aggregate, int columns, int pairs, CancellationToken ct)
    {
        var (text, parameters) = aggregate;
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(ct);
        await reader.ReadAsync(ct);
        var rows = reader.GetInt64(0);
        var columnSums = new ColumnSums[columns];
        for (var c = 0; c < columns; c++)
        {
            var a = reader.GetFieldValue<double?[]>(1 + c);
            if (a.Length == 3)
            {
                // The lean form: a NaN or an infinity made the sums non-finite; the column then counts as not finite throughout.
                var count = (long)(a[0] ?? 0);
                double sum = a[1] ?? 0, squares = a[2] ?? 0;
                columnSums[c] = double.IsFinite(sum) && double.IsFinite(squares)
                    ? new ColumnSums(count, sum, squares, rows - count)
                    : new ColumnSums(-1, 0, 0, rows - count);
                continue;
            }

            columnSums[c] = new ColumnSums((long)(a[0] ?? 0), a[1] ?? 0, a[2] ?? 0, (long)(a[3] ?? 0));
        }

        var pairSums = new PairSums[pairs];
        for (var k = 0; k < pairs; k++)
        {
            var a = reader.GetFieldValue<double?[]>(1 + columns + k);
            // The lean form (Σ dx·dy alone) stands for a pair with no unusable row; the caller checks that it has none.
            pairSums[k] = a.Length == 1
                ? new PairSums(a[0] ?? 0, 0, 0, 0, 0, 0, 0)
                : new PairSums(a[0] ?? 0, (long)(a[1] ?? 0), (long)(a[2] ?? 0), a[3] ?? 0, a[4] ?? 0, a[5] ?? 0, a[6] ?? 0);
        }

        return new GroupAggregate(rows, columnSums, pairSums);
    }

    private static async Task<SampledColumns> ReadGroupSampleAsync(
        NpgsqlConnection connection, PostgresGroupSql sql, SamplePlan plan, SampleSpec spec, int columns, CancellationToken ct)
    {
        var (text, parameters) = sql.Sample(plan, spec.Rows, spec.Seed, spec.Bernoulli);
        await using var batch = new NpgsqlBatch(connection);
        batch.BatchCommands.Add(parameters.Command(text));
        await using var reader = await batch.ExecuteReaderAsync(CommandBehavior.SequentialAccess, ct);
        var read = new SampledColumns(columns, plan.Draw == SampleDraw.All ? 0 : spec.Rows);
        var count = 0;
        while (await reader.ReadAsync(ct))
        {
            for (var c = 0; c < columns; c++)
            {
                read.Add(c, reader.IsDBNull(c) ? null : reader.GetDouble(c));
            }

            count++;
        }

        if (plan.Keep is not null && count < spec.Rows)
        {
            // The pre-filter kept too few rows (a chance near 1e-9): draw again from the whole window, as a lone read does.
            await reader.DisposeAsync();
            return await ReadGroupSampleAsync(connection, sql, plan with { Keep = null }, spec, columns, ct);
        }

        return read;
    }

    /// <summary>The sampled rows of a group, column by column (a null kept apart from NaN); each pair's sample is taken out on demand.</summary>
    private sealed class SampledColumns
    {
        private readonly List<double>[] _values;
        private readonly List<bool>[] _nulls;

        public SampledColumns(int columns, int capacity)
        {
            _values = [.. Enumerable.Range(0, columns).Select(_ => new List<double>(capacity))];
            _nulls = [.. Enumerable.Range(0, columns).Select(_ => new List<bool>(capacity))];
        }

        public void Add(int column, double? value)
        {
            _values[column].Add(value ?? 0);
            _nulls[column].Add(value is null);
        }

        /// <summary>The pair's sample, row by row in the order read, as <see cref="PairedSampleBuilder"/> builds a lone read's.</summary>
        public PairedSample Pair(int x, int y, int capacity)
        {
            var builder = new PairedSampleBuilder(capacity);
            var count = _values[x].Count;
            for (var i = 0; i < count; i++)
            {
                builder.Add(_nulls[x][i] ? null : _values[x][i], _nulls[y][i] ? null : _values[y][i]);
            }

            return builder.Build();
        }
    }
}
