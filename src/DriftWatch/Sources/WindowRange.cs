using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

/// <summary>
/// The rows of a pair's window, by its time column: [From, To) when the window ends at the check time, so the
/// window of a check at t is what arrived before t; (From, To] when it ends at the newest value v of the column,
/// so v's rows are in and the rows exactly <c>last</c> before v (the load before, on a regular schedule) are out.
/// </summary>
internal sealed record WindowRange(DateTimeOffset From, DateTimeOffset To, bool EndInclusive)
{
    /// <summary>[at − last, at): anchor <c>now</c>, with the check time (or the <c>--as-of</c> time).</summary>
    public static WindowRange EndingAt(WindowSpec window, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(window);
        return new WindowRange(at - window.Last, at, EndInclusive: false);
    }

    /// <summary>(newest − last, newest]: anchor <c>latest</c>.</summary>
    public static WindowRange Through(WindowSpec window, DateTimeOffset newest)
    {
        ArgumentNullException.ThrowIfNull(window);
        return new WindowRange(newest - window.Last, newest, EndInclusive: true);
    }

    /// <summary>The comparisons of the window's condition: "&gt;=" and "&lt;" or "&gt;" and "&lt;=".</summary>
    public (string Lower, string Upper) Operators => EndInclusive ? (">", "<=") : (">=", "<");
}
