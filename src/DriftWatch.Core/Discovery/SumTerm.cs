namespace DriftWatch.Core.Discovery;

/// <summary>What one aggregate of the matrix statement sums. u is a column's centred, scaled value, null unless finite.</summary>
public enum SumKind
{
    /// <summary>Σ uᵢ over the rows where uᵢ is finite (a complete column: every row).</summary>
    Sum,

    /// <summary>Σ uᵢ² over the rows where uᵢ is finite.</summary>
    SumSquares,

    /// <summary>Σ uᵢ·uⱼ over the rows where both are finite.</summary>
    Cross,

    /// <summary>The rows where both uᵢ and uⱼ are finite.</summary>
    PairCount,

    /// <summary>Σ uᵢ over the rows where both uᵢ and uⱼ are finite.</summary>
    PairSum,

    /// <summary>Σ uᵢ² over the rows where both uᵢ and uⱼ are finite.</summary>
    PairSumSquares,
}

/// <summary>One aggregate of the matrix statement; <see cref="J"/> is −1 for a column's own sums.</summary>
public readonly record struct SumTerm(SumKind Kind, int I, int J);
