namespace DriftWatch.Core.Discovery;

/// <summary>Pearson's r of every pair of a table's columns over each pair's pairwise-complete finite rows, with those rows' count.</summary>
public sealed class CorrelationMatrix(IReadOnlyList<string> columns, double?[,] r, long[,] n)
{
    public IReadOnlyList<string> Columns { get; } = columns;

    /// <summary>Null where undefined: fewer than 3 rows, or a column without spread on the pair's rows.</summary>
    public double? R(int i, int j) => r[i, j];

    public long N(int i, int j) => n[i, j];
}
