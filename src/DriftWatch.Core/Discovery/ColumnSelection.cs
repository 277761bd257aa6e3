namespace DriftWatch.Core.Discovery;

/// <summary>The numeric columns a survey reads, and those left out by the column bound.</summary>
public sealed record ColumnSelection(IReadOnlyList<string> Chosen, IReadOnlyList<string> Skipped, IReadOnlyList<CatalogueColumn> NonNumeric)
{
    /// <summary>The default bound: 60 columns make 1,770 pairs, each of up to six sums, in one statement.</summary>
    public const int DefaultMaxColumns = 60;

    /// <summary>The first <paramref name="maxColumns"/> numeric columns in catalogue order (the table's own order, stable between runs).</summary>
    public static ColumnSelection Choose(IReadOnlyList<CatalogueColumn> columns, int maxColumns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxColumns, 2);
        var numeric = columns.Where(c => c.Numeric).Select(c => c.Name).ToList();
        return new ColumnSelection(
            numeric.Take(maxColumns).ToList(),
            numeric.Skip(maxColumns).ToList(),
            columns.Where(c => !c.Numeric).ToList());
    }

    /// <summary>Why columns were left out, naming how many and which; null when none were.</summary>
    public string? SkippedMessage(int maxColumns)
    {
        if (Skipped.Count == 0)
        {
            return null;
        }

        const int Named = 10;
        var names = string.Join(", ", Skipped.Take(Named)) + (Skipped.Count > Named ? $", … ({Skipped.Count - Named} more)" : string.Empty);
        var total = Chosen.Count + Skipped.Count;
        return $"the table has {total} numeric columns; surveying the first {Chosen.Count} in catalogue order (--max-columns {maxColumns}) " +
            $"because the correlation matrix grows with the square of the columns ({Chosen.Count * (Chosen.Count - 1) / 2} pairs). " +
            $"Skipped {Skipped.Count}: {names}. Raise --max-columns to include them.";
    }
}
