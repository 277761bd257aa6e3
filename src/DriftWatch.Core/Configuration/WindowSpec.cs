namespace DriftWatch.Core.Configuration;

/// <summary>
/// Restricts a check to rows whose time column lies in the last <see cref="Last"/> before the window's end.
/// With <see cref="WindowAnchor.Now"/> the window is [t − last, t) for the check time t; with
/// <see cref="WindowAnchor.Latest"/> it is (v − last, v] for v the newest value of the column at or before t.
/// </summary>
public sealed record WindowSpec(string Column, TimeSpan Last, WindowAnchor Anchor = WindowAnchor.Now)
{
    public const WindowAnchor DefaultAnchor = WindowAnchor.Now;
}
