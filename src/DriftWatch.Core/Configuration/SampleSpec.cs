namespace DriftWatch.Core.Configuration;

public enum SampleMethod
{
    /// <summary>All rows below <see cref="SampleSpec.AllRowsBelow"/>, else block sampling sized from statistics.</summary>
    Auto,

    /// <summary>PostgreSQL TABLESAMPLE (SYSTEM, or BERNOULLI when <see cref="SampleSpec.Bernoulli"/>).</summary>
    Tablesample,

    /// <summary>ORDER BY random() LIMIT rows.</summary>
    Random,

    /// <summary>Every row.</summary>
    All,
}

public sealed record SampleSpec
{
    public const int DefaultRows = 10_000;
    public const long DefaultAllRowsBelow = 50_000;

    public int Rows { get; init; } = DefaultRows;

    public SampleMethod Method { get; init; } = SampleMethod.Auto;

    /// <summary>Tables with fewer estimated rows than this are read whole under <see cref="SampleMethod.Auto"/>.</summary>
    public long AllRowsBelow { get; init; } = DefaultAllRowsBelow;

    /// <summary>Row-level (BERNOULLI) instead of block-level (SYSTEM) table sampling: more even, scans the table.</summary>
    public bool Bernoulli { get; init; }

    /// <summary>Fixed seed for REPEATABLE sampling; null draws a new sample every run.</summary>
    public int? Seed { get; init; }
}
