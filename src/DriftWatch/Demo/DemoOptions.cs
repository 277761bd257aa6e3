namespace DriftWatch.Demo;

/// <param name="Out">The output folder (recreated).</param>
/// <param name="Days">Simulated days, from 1.</param>
/// <param name="PostgresConnection">Load the scenario into this PostgreSQL database instead of a SQLite file.</param>
/// <param name="Verbose">Log each step of the flow (information level) to stderr.</param>
internal sealed record DemoOptions(string Out, int Days, string? PostgresConnection = null, bool Verbose = false)
{
    public const int MaxDays = 365;
}
