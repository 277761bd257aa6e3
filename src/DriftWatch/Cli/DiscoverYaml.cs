using System.Globalization;
using System.Text;
using DriftWatch.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Output;
using DriftWatch.Sources.DuckDb;

namespace DriftWatch.Cli;

/// <summary>
/// The <c>pairs:</c> entries <c>discover</c> proposes, as YAML that the configuration loader takes unchanged: names
/// from <see cref="PairNames"/>, every value double-quoted, only plain table and column names (the loader's rule,
/// <see cref="Identifiers"/>). A copy or affine derivation is proposed with <c>declared: exact: true</c>, so the
/// pair is healthy while the derivation holds and alerts when it breaks; a monotone derivation is named in a comment only.
/// </summary>
internal static class DiscoverYaml
{
    public const string Indent = "  ";

    /// <param name="taken">Pair names already in use; the proposed names are added.</param>
    /// <param name="header">Start with the <c>pairs:</c> key (a new file, or standard output); without it, entries only (appending).</param>
    /// <param name="alreadyWritten">Names an earlier run wrote to the same file: such a proposal is named in a comment, not repeated.</param>
    public static string Block(string source, string table, DiscoveryResult result, ISet<string> taken, bool header, IReadOnlySet<string>? alreadyWritten = null)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(taken);
        var text = new StringBuilder();
        text.Append(CultureInfo.InvariantCulture, $"# Proposed by driftwatch discover from table {table} (source '{source}'). Paste the entries under your pairs: key.\n");
        text.Append("# Correlations are statistical signals, not proof: keep the pairs whose relationship matters to you.\n");
        if (header)
        {
            text.Append("pairs:\n");
        }

        if (TableProblem(table) is { } tableProblem)
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# none proposed: {tableProblem}\n");
            return text.ToString();
        }

        var entries = 0;
        foreach (var d in result.Derivations)
        {
            var figures = $"r = {Figures.Correlation(d.R)}, n = {Figures.Count(d.N)}";
            if (d.Kind == DerivationKind.Monotone)
            {
                text.Append(CultureInfo.InvariantCulture, $"{Indent}# not proposed: {d.Equation} ({figures}): a derived column, not a relationship to watch.\n");
                continue;
            }

            var what = d.Kind == DerivationKind.Copy ? "a copy" : "a derived column";
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# {d.Equation} on every row: {what} ({figures}). Declared exact: it alerts when the derivation breaks.\n");
            entries += Entry(text, source, table, d.From, d.Column, exact: true, taken, alreadyWritten);
        }

        foreach (var c in result.Candidates)
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# r = {Figures.Correlation(c.R)}, ρ = {Figures.Correlation(c.Spearman)}, n = {Figures.Count(c.N)}; shape {JsonContract.Name(c.Shape)} on a sample of {Figures.Count(c.SampleRows)} rows.\n");
            entries += Entry(text, source, table, c.X, c.Y, exact: false, taken, alreadyWritten);
        }

        if (entries == 0 && result.Derivations.Count == 0)
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# none proposed: no pair reached the bound on |r|.\n");
        }

        return text.ToString();
    }

    private static int Entry(StringBuilder text, string source, string table, string x, string y, bool exact, ISet<string> taken, IReadOnlySet<string>? alreadyWritten)
    {
        if (alreadyWritten is not null && PairNames.For(NameStem(table), x, y, new HashSet<string>()) is var stem && alreadyWritten.Contains(stem))
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# already proposed above: {stem}\n");
            return 0;
        }

        if ((Identifiers.CheckColumn(x) ?? Identifiers.CheckColumn(y)) is { } problem)
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}# not proposed: {problem}\n");
            return 0;
        }

        var name = PairNames.For(NameStem(table), x, y, taken);
        text.Append(CultureInfo.InvariantCulture, $"{Indent}- name: \"{name}\"\n");
        text.Append(CultureInfo.InvariantCulture, $"{Indent}  source: \"{source}\"\n");
        text.Append(CultureInfo.InvariantCulture, $"{Indent}  table: \"{table}\"\n");
        text.Append(CultureInfo.InvariantCulture, $"{Indent}  x: \"{x}\"\n");
        text.Append(CultureInfo.InvariantCulture, $"{Indent}  y: \"{y}\"\n");
        if (exact)
        {
            text.Append(CultureInfo.InvariantCulture, $"{Indent}  declared:\n{Indent}    exact: true\n");
        }

        return 1;
    }

    /// <summary>As the loader reads a pair's <c>table</c>: a plain name, or (for a duckdb source) a path or glob of files.</summary>
    private static string? TableProblem(string table)
    {
        if (!DuckDbTarget.IsFile(table))
        {
            return Identifiers.CheckTable(table);
        }

        // The path goes into a double-quoted YAML scalar as it is: a quote or a backslash would need escapes.
        return DuckDbTarget.PathProblem(table)
            ?? (table.Contains('"', StringComparison.Ordinal) || table.Contains('\\', StringComparison.Ordinal) ? $"file path '{table}' holds a quote or a backslash; write its pairs by hand" : null);
    }

    /// <summary>What pair names start with: the table, or for files the last path part without wildcards or endings ("data/parcels/*.parquet" → "parcels").</summary>
    private static string NameStem(string table)
    {
        if (!DuckDbTarget.IsFile(table))
        {
            return table;
        }

        var part = table.Trim().Split('/').LastOrDefault(p => p.Length > 0 && p.IndexOfAny(['*', '?']) < 0) ?? "files";
        var stem = part.Split('.')[0];
        return stem.Length == 0 ? "files" : stem;
    }
}
