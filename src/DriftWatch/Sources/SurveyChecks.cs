using DriftWatch.Core.Discovery;

namespace DriftWatch.Sources;

internal static class SurveyChecks
{
    /// <summary>A survey needs two numeric columns; the message lists what the table has instead.</summary>
    public static void EnoughColumns(ColumnSelection selection, QualifiedName table, string source)
    {
        if (selection.Chosen.Count >= 2)
        {
            return;
        }

        var others = selection.NonNumeric.Count == 0
            ? string.Empty
            : "; its other columns: " + string.Join(", ", selection.NonNumeric.Take(20).Select(c => $"{c.Name} ({c.Type})"));
        var what = selection.Chosen.Count == 0 ? "no numeric columns" : $"only one numeric column ({selection.Chosen[0]})";
        throw new SourceException(SourceFailure.NonNumericColumn, $"table {table} in source '{source}' has {what}, so there is no pair to survey{others}.");
    }
}
