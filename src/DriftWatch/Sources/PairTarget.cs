using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

/// <summary>
/// What a pair reads, with every name already checked and quoted: a table (plus optional filter) or a
/// query used as a subquery. Built once per check; a bad name becomes a <see cref="SourceException"/>.
/// </summary>
internal sealed record PairTarget(
    string Pair,
    QualifiedName? Table,
    string? Query,
    string X,
    string Y,
    string? WindowColumn,
    string? Where)
{
    public bool IsTable => Table is not null;

    /// <summary>For messages: "table public.orders" or "query".</summary>
    public string Describe => Table is not null ? $"table {Table}" : "query";

    /// <param name="quote">How a column name is quoted; standard SQL double quotes unless given (MySQL uses backticks).</param>
    public static PairTarget From(PairConfig pair, Func<string, string>? quote = null)
    {
        ArgumentNullException.ThrowIfNull(pair);
        quote ??= SqlIdentifier.Quote;
        try
        {
            QualifiedName? table = null;
            string? query = null;
            if (!string.IsNullOrWhiteSpace(pair.Table))
            {
                table = SqlIdentifier.ParseQualified(pair.Table.Trim());
            }
            else if (!string.IsNullOrWhiteSpace(pair.Query))
            {
                // A trailing semicolon is natural to write but cannot stand inside a subquery.
                query = pair.Query.Trim().TrimEnd(';', ' ', '\t', '\r', '\n');
            }
            else
            {
                throw new SourceException(SourceFailure.QueryError, $"Pair '{pair.Name}' names neither a table nor a query.");
            }

            return new PairTarget(
                pair.Name,
                table,
                query,
                quote(pair.X),
                quote(pair.Y),
                pair.Window is null ? null : quote(pair.Window.Column),
                string.IsNullOrWhiteSpace(pair.Where) ? null : pair.Where.Trim());
        }
        catch (ArgumentException e)
        {
            throw new SourceException(SourceFailure.QueryError, $"Pair '{pair.Name}': {e.Message.Split(" (Parameter", 2)[0]}", e);
        }
    }
}
