namespace DriftWatch.Alerting.Digest;

/// <summary>What a digest needs besides its items.</summary>
/// <param name="From">The From address (alerting.smtp.from); <see cref="DefaultFrom"/> for file-only setups.</param>
/// <param name="PublicUrl">The dashboard's base URL for links; null leaves links out.</param>
internal sealed record DigestOptions(string From, Uri? PublicUrl)
{
    public const string DefaultFrom = "DriftWatch <driftwatch@localhost>";

    /// <summary>Beyond this many pairs in one message the rest go without a plot, to keep messages mailable.</summary>
    public const int MaxPlotsPerMessage = 12;
}
