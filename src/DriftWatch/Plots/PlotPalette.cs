using ScottPlot;

namespace DriftWatch.Plots;

/// <summary>DriftWatch's own plot colours: the past is muted grey, the present one clear colour, severities warm.</summary>
internal static class PlotPalette
{
    public static readonly Color BaselinePoints = Color.FromHex("#9AA0A6").WithOpacity(0.55);
    public static readonly Color BaselineLine = Color.FromHex("#5F6368");
    public static readonly Color CurrentPoints = Color.FromHex("#0E7490").WithOpacity(0.8);
    public static readonly Color CurrentLine = Color.FromHex("#164E63");
    public static readonly Color Band = Color.FromHex("#9AA0A6").WithOpacity(0.22);
    public static readonly Color Warning = Color.FromHex("#D97706");
    public static readonly Color Critical = Color.FromHex("#B91C1C");
    public static readonly Color Info = Color.FromHex("#64748B");

    /// <summary>A sans-serif face present on most Linux hosts; ScottPlot falls back to its default when missing.</summary>
    public const string FontName = "DejaVu Sans";
}
