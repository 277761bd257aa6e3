namespace DriftWatch.Store;

/// <summary>
/// How far a reader of the run feed has got, written with what it decided from those runs (in the same
/// transaction), so a crash can never leave the decision stored and the position behind, or the reverse.
/// </summary>
/// <param name="Key">The <c>worker_state</c> key of the watermark (<see cref="RunFeed.AlertsWatermarkKey"/>).</param>
/// <param name="LastRunId">Every run up to this id has been read.</param>
/// <param name="UnreadableRuns">Runs passed over because they could not be read; added to the key's counter.</param>
internal sealed record FeedPosition(string Key, long LastRunId, int UnreadableRuns = 0)
{
    /// <summary>The <c>worker_state</c> key that counts the runs passed over as unreadable.</summary>
    public string UnreadableKey => Key + ".unreadable";
}
