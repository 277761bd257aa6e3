namespace DriftWatch.Core.Configuration;

public enum ExpectedDirection
{
    Any,
    Positive,
    Negative,
}

/// <summary>
/// What the pair's owner declares about the relationship. With <see cref="Exact"/> the pair must stay an
/// exact function (a derived column), so exactness is healthy and losing it is the finding.
/// </summary>
public sealed record PairExpectation(ExpectedDirection Direction = ExpectedDirection.Any, bool Exact = false)
{
    public static PairExpectation Default { get; } = new();
}
