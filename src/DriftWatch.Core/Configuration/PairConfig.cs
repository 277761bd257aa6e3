using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Configuration;

/// <summary>One watched column pair with its effective settings (defaults already applied).</summary>
public sealed record PairConfig
{
    public const string DefaultSchedule = "0 0 * * * ?";

    public required string Name { get; init; }

    public required string Source { get; init; }

    /// <summary>Table (optionally schema-qualified, "schema.table"); exclusive with <see cref="Query"/>.</summary>
    public string? Table { get; init; }

    /// <summary>Extra filter for <see cref="Table"/>, written by the pair's owner in the source's SQL.</summary>
    public string? Where { get; init; }

    /// <summary>A query that returns at least the two columns; exclusive with <see cref="Table"/>.</summary>
    public string? Query { get; init; }

    public required string X { get; init; }

    public required string Y { get; init; }

    public WindowSpec? Window { get; init; }

    public SampleSpec Sample { get; init; } = new();

    /// <summary>Quartz cron expression (seconds first).</summary>
    public string Schedule { get; init; } = DefaultSchedule;

    /// <summary>What the owner declares about the pair (<c>declared:</c>); nothing by default.</summary>
    public PairDeclaration Declared { get; init; } = PairDeclaration.None;

    public Thresholds Thresholds { get; init; } = Thresholds.Default;

    public BaselinePolicy Baseline { get; init; } = new();

    /// <summary>Mailing list names; empty means every list whose tag filter matches.</summary>
    public IReadOnlyList<string> Notify { get; init; } = [];

    public IReadOnlyList<string> Tags { get; init; } = [];

    /// <summary>Where in the config file the pair was declared ("file:line"), for messages.</summary>
    public string? Location { get; init; }
}
