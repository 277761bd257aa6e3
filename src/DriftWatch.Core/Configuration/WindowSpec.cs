namespace DriftWatch.Core.Configuration;

/// <summary>Restricts a check to rows whose time column lies in the last <see cref="Last"/> before the check time.</summary>
public sealed record WindowSpec(string Column, TimeSpan Last);
