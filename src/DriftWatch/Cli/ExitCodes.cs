namespace DriftWatch.Cli;

/// <summary>Process exit codes shared by every command; scripts and CI jobs branch on them.</summary>
internal static class ExitCodes
{
    /// <summary>Ran, and no finding is a warning or worse.</summary>
    public const int Healthy = 0;

    /// <summary>Ran, and at least one finding is a warning or worse.</summary>
    public const int Findings = 1;

    /// <summary>Bad command line, configuration, missing file or column: nothing was checked.</summary>
    public const int UsageError = 2;

    /// <summary>
    /// Some checks could not run (a source unreachable, a query failing) or had nothing to measure (no rows, too few
    /// usable rows, a constant column): either way the pair's state is unknown.
    /// </summary>
    public const int RunFailures = 3;
}
