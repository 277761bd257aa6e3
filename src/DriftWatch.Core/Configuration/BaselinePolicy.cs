namespace DriftWatch.Core.Configuration;

public enum BaselinePolicyKind
{
    /// <summary>Pooled from the first N successful runs, then fixed until accepted or reset.</summary>
    FirstRuns,

    /// <summary>Pooled from the runs between two dates.</summary>
    Window,

    /// <summary>Pooled from the recent runs in a sliding period, skipping runs that had critical findings.</summary>
    Rolling,
}

public sealed record BaselinePolicy
{
    public const int DefaultFirstRuns = 5;
    public static readonly TimeSpan DefaultRollingPeriod = TimeSpan.FromDays(30);

    public BaselinePolicyKind Kind { get; init; } = BaselinePolicyKind.FirstRuns;

    public int FirstRuns { get; init; } = DefaultFirstRuns;

    public DateTimeOffset? From { get; init; }

    public DateTimeOffset? To { get; init; }

    public TimeSpan RollingPeriod { get; init; } = DefaultRollingPeriod;

    public override string ToString() => Kind switch
    {
        BaselinePolicyKind.FirstRuns => $"first_runs: {FirstRuns}",
        BaselinePolicyKind.Window => $"window: {From:yyyy-MM-dd} .. {To:yyyy-MM-dd}",
        _ => $"rolling: {RollingPeriod.TotalDays:0}d",
    };
}
