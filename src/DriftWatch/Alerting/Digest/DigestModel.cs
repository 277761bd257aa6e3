namespace DriftWatch.Alerting.Digest;

/// <summary>What one digest message says, before it is written as HTML and plain text.</summary>
internal sealed record DigestModel(
    string Subject,
    string MailingList,
    DateTimeOffset At,
    IReadOnlyList<PairSection> Sections,
    bool CarriesPlots);

/// <summary>
/// One pair in a digest: its alerts (worst first), one table and at most one plot, however many of its kinds
/// changed. <paramref name="PlotContentId"/> is the inline image's Content-Id; <paramref name="PlotNote"/> says
/// why a plot is missing where one was wanted; <paramref name="PlotCaption"/> is the sentence under the plot.
/// </summary>
internal sealed record PairSection(
    AlertPairContext Context,
    IReadOnlyList<DigestItem> Items,
    string? PlotContentId,
    string? PlotNote,
    string? DashboardUrl,
    string? PlotCaption = null)
{
    public string Pair => Context.Pair.Name;

    public string SourceLine
    {
        get
        {
            var pair = Context.Pair;
            var from = pair.Table is not null ? $"table {pair.Table}" : pair.Query is not null ? "a query" : null;
            return from is null
                ? $"source {pair.Source} · x = {pair.X}, y = {pair.Y}"
                : $"source {pair.Source}, {from} · x = {pair.X}, y = {pair.Y}";
        }
    }

    /// <summary>Set when the current sample is an exact function (the profile derived the equation).</summary>
    public string? Equation => Context.Current?.Equation;
}
