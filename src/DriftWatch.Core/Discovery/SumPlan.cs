namespace DriftWatch.Core.Discovery;

/// <summary>
/// The aggregates the matrix statement computes, in order. A pair of complete columns needs only its cross product
/// (the columns' own sums serve every pair); a pair where either column has nulls or non-finite values gets its own
/// count, sums and sums of squares over the rows where both are finite (pairwise-complete rows). Constant columns
/// and columns without a finite value get nothing: every correlation with them is undefined.
/// </summary>
public sealed class SumPlan
{
    private readonly Dictionary<SumTerm, int> _index = [];

    public SumPlan(IReadOnlyList<ColumnStats> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        Columns = columns;
        var terms = new List<SumTerm>();
        for (var i = 0; i < columns.Count; i++)
        {
            if (columns[i].Complete && !columns[i].Constant)
            {
                terms.Add(new SumTerm(SumKind.Sum, i, -1));
                terms.Add(new SumTerm(SumKind.SumSquares, i, -1));
            }
        }

        for (var i = 0; i < columns.Count; i++)
        {
            for (var j = i + 1; j < columns.Count; j++)
            {
                if (columns[i].Constant || columns[j].Constant)
                {
                    continue;
                }

                terms.Add(new SumTerm(SumKind.Cross, i, j));
                if (!(columns[i].Complete && columns[j].Complete))
                {
                    terms.Add(new SumTerm(SumKind.PairCount, i, j));
                    terms.Add(new SumTerm(SumKind.PairSum, i, j));
                    terms.Add(new SumTerm(SumKind.PairSum, j, i));
                    terms.Add(new SumTerm(SumKind.PairSumSquares, i, j));
                    terms.Add(new SumTerm(SumKind.PairSumSquares, j, i));
                }
            }
        }

        Terms = terms;
        for (var k = 0; k < terms.Count; k++)
        {
            _index[terms[k]] = k;
        }
    }

    public IReadOnlyList<ColumnStats> Columns { get; }

    public IReadOnlyList<SumTerm> Terms { get; }

    /// <summary>The correlation matrix from the statement's values, one per term in <see cref="Terms"/>' order (a null sum of no rows is 0).</summary>
    public CorrelationMatrix Assemble(IReadOnlyList<double> values)
    {
        ArgumentNullException.ThrowIfNull(values);
        if (values.Count != Terms.Count)
        {
            throw new ArgumentException($"The statement returned {values.Count} values for {Terms.Count} sums.", nameof(values));
        }

        var k = Columns.Count;
        var r = new double?[k, k];
        var n = new long[k, k];
        for (var i = 0; i < k; i++)
        {
            n[i, i] = Columns[i].Finite;
            r[i, i] = Columns[i].Constant ? null : 1;
            for (var j = i + 1; j < k; j++)
            {
                if (!_index.TryGetValue(new SumTerm(SumKind.Cross, i, j), out var cross))
                {
                    continue;
                }

                PairSums sums = Columns[i].Complete && Columns[j].Complete
                    ? new PairSums(Columns[i].Rows, At(SumKind.Sum, i, -1), At(SumKind.Sum, j, -1), At(SumKind.SumSquares, i, -1), At(SumKind.SumSquares, j, -1), values[cross])
                    : new PairSums((long)At(SumKind.PairCount, i, j), At(SumKind.PairSum, i, j), At(SumKind.PairSum, j, i), At(SumKind.PairSumSquares, i, j), At(SumKind.PairSumSquares, j, i), values[cross]);
                n[i, j] = n[j, i] = sums.N;
                r[i, j] = r[j, i] = sums.Pearson();
            }
        }

        return new CorrelationMatrix([.. Columns.Select(c => c.Name)], r, n);

        double At(SumKind kind, int i, int j) => values[_index[new SumTerm(kind, i, j)]];
    }
}
