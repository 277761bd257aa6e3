namespace DriftWatch.Alerting.Digest;

/// <summary>The cautions every digest carries (DriftWatch's standing rule), worded once for both body parts.</summary>
internal static class DigestCautions
{
    public const string Signals =
        "Findings are statistical signals, not proof: they say where to look, and a person decides what is wrong.";

    public const string SampledValues =
        "This message carries sampled data values out of the database: each plot shows rows sampled from the source. " +
        "A mailing list can leave plots out (include_plot: false).";

    public static string Summary(IReadOnlyList<DigestItem> items)
    {
        var active = items.Count(i => i.IsActive);
        var cleared = items.Count - active;
        var parts = new List<string>(2);
        if (active > 0)
        {
            parts.Add(active == 1 ? "1 alert needs a look" : $"{active} alerts need a look");
        }

        if (cleared > 0)
        {
            parts.Add(cleared == 1 ? "1 alert cleared" : $"{cleared} alerts cleared");
        }

        return string.Join(", ", parts) + ".";
    }
}
