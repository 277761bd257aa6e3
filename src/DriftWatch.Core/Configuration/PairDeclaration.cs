namespace DriftWatch.Core.Configuration;

public enum DeclaredDirection
{
    Any,
    Positive,
    Negative,
}

/// <summary>
/// What the pair's owner declares about the relationship (the <c>declared:</c> key). With <see cref="Exact"/>
/// the pair must stay an exact function (a derived column), so exactness is healthy and losing it is the finding.
/// </summary>
public sealed record PairDeclaration(DeclaredDirection Direction = DeclaredDirection.Any, bool Exact = false)
{
    /// <summary>Nothing declared: any direction, not exact.</summary>
    public static PairDeclaration None { get; } = new();
}
