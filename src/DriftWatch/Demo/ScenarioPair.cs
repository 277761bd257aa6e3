namespace DriftWatch.Demo;

/// <summary>
/// One watched pair of the demo's invented feed: the table it lives in (one table per pair), its time column
/// and its two numeric columns, how many rows a day's load holds, and the relationship in words.
/// </summary>
internal sealed record ScenarioPair(
    string Name,
    string Table,
    string TimeColumn,
    string X,
    string Y,
    int RowsPerDay,
    string Relationship);
