namespace DriftWatch.Core.Findings;

/// <summary>Ordered: a larger value is worse. Serialised lower-case.</summary>
public enum Severity
{
    Info = 0,
    Warning = 1,
    Critical = 2,
}
