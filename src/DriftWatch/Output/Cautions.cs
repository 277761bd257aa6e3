namespace DriftWatch.Output;

/// <summary>The cautions every report carries (project rule), worded once.</summary>
internal static class Cautions
{
    public const string SignalsNotProof = "Findings are statistical signals, not proof.";

    public const string PlotsCarryData = "Plots carry sampled data values out of the database.";
}
