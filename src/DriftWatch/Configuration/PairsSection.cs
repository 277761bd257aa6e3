using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>
/// <c>pairs:</c> each watched column pair with its effective settings: the pair's own keys over the
/// defaults, its source and mailing lists checked against the ones declared.
/// </summary>
internal static class PairsSection
{
    public static readonly TimeSpan MinWindow = TimeSpan.FromMinutes(1);
    public static readonly TimeSpan MaxWindow = TimeSpan.FromDays(3650);

    public static IReadOnlyList<PairConfig> Read(
        MappingReader root,
        PairDefaults defaults,
        IReadOnlyList<SourceConfig> sources,
        IReadOnlySet<string> declaredSources,
        IReadOnlySet<string> lists,
        StoreConfig store)
    {
        var pairs = new List<PairConfig>();
        var seen = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var (node, path) in root.Items("pairs"))
        {
            var reader = MappingReader.OpenItem(root.Context, node, path, ConfigKeys.Pair, "a pair needs name, source, table or query, x and y");
            if (reader is null)
            {
                continue;
            }

            var errorsBefore = root.Context.ErrorCount;
            var pair = ReadPair(reader, seen, defaults, declaredSources, lists);
            reader.Done();
            if (pair is null || root.Context.ErrorCount > errorsBefore)
            {
                continue;
            }

            PairChecks.Check(reader, pair, sources, store);
            if (root.Context.ErrorCount == errorsBefore)
            {
                pairs.Add(pair);
            }
        }

        return pairs;
    }

    private static PairConfig? ReadPair(
        MappingReader reader,
        Dictionary<string, long> seen,
        PairDefaults defaults,
        IReadOnlySet<string> declaredSources,
        IReadOnlySet<string> lists)
    {
        var name = NameSection.Read(reader, "pair", seen);
        var source = ReadSource(reader, declaredSources);
        var (table, where, query) = ReadOrigin(reader);
        var x = Column(reader, "x", "the column on the horizontal axis");
        var y = Column(reader, "y", "the column on the vertical axis");
        if (x is not null && string.Equals(x, y, StringComparison.Ordinal))
        {
            reader.Error("y", $"names the same column as x ('{x}'); a pair needs two columns");
        }

        var window = ReadWindow(reader.Mapping("window", ConfigKeys.Window));
        var sample = SampleSection.Read(reader.Mapping("sample", ConfigKeys.Sample), defaults.Sample);
        var schedule = ScheduleKey.Read(reader) ?? defaults.Schedule;
        var declared = ReadDeclared(reader.Mapping("declared", ConfigKeys.Declared));
        var thresholds = ThresholdsSection.Read(reader.Mapping("thresholds", ConfigKeys.Thresholds), defaults.Thresholds);
        var baseline = BaselineSection.Read(reader.Mapping("baseline", ConfigKeys.Baseline)) ?? defaults.Baseline;
        var notify = ReadNotify(reader, lists);
        var tags = ReadTags(reader, "tags");
        if (name is null || source is null || x is null || y is null || (table is null && query is null))
        {
            return null;
        }

        return new PairConfig
        {
            Name = name,
            Source = source,
            Table = table,
            Where = where,
            Query = query,
            X = x,
            Y = y,
            Window = window,
            Sample = sample,
            Schedule = schedule,
            Declared = declared,
            Thresholds = thresholds,
            Baseline = baseline,
            Notify = notify,
            Tags = tags,
            Location = $"{reader.Context.FileName}:{reader.Start.Line}",
        };
    }

    private static string? ReadSource(MappingReader reader, IReadOnlySet<string> declared)
    {
        if (!reader.Has("source"))
        {
            _ = reader.Node("source");
            reader.Missing("source", "is required: the name of one of the sources");
            return null;
        }

        var source = reader.Text("source");
        if (source is not null && !declared.Contains(source))
        {
            reader.Error("source", UnknownName("source", source, declared));
            return null;
        }

        return source;
    }

    private static (string? Table, string? Where, string? Query) ReadOrigin(MappingReader reader)
    {
        var table = reader.Text("table");
        var where = reader.Text("where");
        var query = reader.Text("query");
        // A path or glob of Parquet/CSV files (for a duckdb source; PairChecks refuses it for other kinds).
        if (table is not null && Sources.DuckDb.DuckDbTarget.IsFile(table))
        {
            if (Sources.DuckDb.DuckDbTarget.PathProblem(table) is { } pathProblem)
            {
                reader.Error("table", pathProblem);
                table = null;
            }
        }
        else if (table is not null && Identifiers.CheckTable(table) is { } tableProblem)
        {
            reader.Error("table", tableProblem);
            table = null;
        }

        if (reader.Has("table") && reader.Has("query"))
        {
            reader.Error("query", "table and query are both given; a pair reads either a table (with an optional where) or a query");
            return (null, null, null);
        }

        if (!reader.Has("table") && !reader.Has("query"))
        {
            reader.Missing("table", "a pair needs table (with an optional where) or query");
            return (null, null, null);
        }

        if (where is not null)
        {
            if (reader.Has("query"))
            {
                reader.Error("where", "applies to table only; put the filter into the query");
                where = null;
            }
            else if (SqlFragments.CheckWhere(where) is { } whereProblem)
            {
                reader.Error("where", whereProblem);
                where = null;
            }
        }

        if (query is not null)
        {
            query = SqlFragments.TrimQuery(query, out var queryProblem);
            if (query is null)
            {
                reader.Error("query", queryProblem!);
            }
        }

        return (table, where, query);
    }

    private static string? Column(MappingReader reader, string key, string what)
    {
        if (!reader.Has(key))
        {
            _ = reader.Node(key);
            reader.Missing(key, $"is required: {what}");
            return null;
        }

        var text = reader.Text(key);
        if (text is not null && Identifiers.CheckColumn(text) is { } problem)
        {
            reader.Error(key, problem);
            return null;
        }

        return text;
    }

    private static WindowSpec? ReadWindow(MappingReader? reader)
    {
        if (reader is null)
        {
            return null;
        }

        var column = Column(reader, "column", "the time column the window applies to");
        TimeSpan? last = null;
        if (!reader.Has("last"))
        {
            _ = reader.Node("last");
            reader.Missing("last", $"is required: how far back the window reaches, e.g. 24h or 7d");
        }
        else
        {
            last = reader.Duration("last", MinWindow, MaxWindow);
        }

        var anchor = reader.Choice("anchor", ("now", WindowAnchor.Now), ("latest", WindowAnchor.Latest)) ?? WindowSpec.DefaultAnchor;
        reader.Done();
        return column is null || last is null ? null : new WindowSpec(column, last.Value, anchor);
    }

    private static PairDeclaration ReadDeclared(MappingReader? reader)
    {
        if (reader is null)
        {
            return PairDeclaration.None;
        }

        var direction = reader.Choice(
            "direction",
            ("any", DeclaredDirection.Any),
            ("positive", DeclaredDirection.Positive),
            ("negative", DeclaredDirection.Negative)) ?? DeclaredDirection.Any;
        var exact = reader.Bool("exact") ?? false;
        reader.Done();
        return new PairDeclaration(direction, exact);
    }

    private static List<string> ReadNotify(MappingReader reader, IReadOnlySet<string> lists)
    {
        var names = new List<string>();
        foreach (var (text, at, path) in reader.TextList("notify"))
        {
            if (!lists.Contains(text))
            {
                reader.Context.Error(at, path, UnknownName("mailing list", text, lists));
                continue;
            }

            if (!names.Contains(text, StringComparer.Ordinal))
            {
                names.Add(text);
            }
        }

        return names;
    }

    /// <summary>Tags, shared with mailing lists: usable names, duplicates dropped.</summary>
    public static IReadOnlyList<string> ReadTags(MappingReader reader, string key)
    {
        var tags = new List<string>();
        foreach (var (text, at, path) in reader.TextList(key))
        {
            if (Identifiers.CheckName(text) is { } problem)
            {
                reader.Context.Error(at, path, problem);
            }
            else if (!tags.Contains(text, StringComparer.Ordinal))
            {
                tags.Add(text);
            }
        }

        return tags;
    }

    private static string UnknownName(string what, string name, IReadOnlySet<string> declared)
    {
        if (declared.Count == 0)
        {
            return $"unknown {what} '{name}': no {what}s are declared";
        }

        var hint = KeyHints.Closest(name, declared);
        var list = string.Join(", ", declared.Order(StringComparer.Ordinal));
        return hint is null
            ? $"unknown {what} '{name}'; declared: {list}"
            : $"unknown {what} '{name}'; did you mean '{hint}'? (declared: {list})";
    }
}
