using DriftWatch.Core.Findings;

namespace DriftWatch.Plots;

/// <summary>One run on the r-over-time chart; <paramref name="WorstSeverity"/> null means the run had no findings.</summary>
internal sealed record CorrelationHistoryPoint(DateTimeOffset At, double? PearsonR, Severity? WorstSeverity);

/// <summary>The baseline's Pearson r and its confidence interval, drawn as a band behind the history.</summary>
internal sealed record CorrelationBaselineBand(double R, double Low, double High);
