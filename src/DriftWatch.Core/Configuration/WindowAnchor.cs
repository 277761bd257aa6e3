namespace DriftWatch.Core.Configuration;

/// <summary>Where a pair's window ends.</summary>
public enum WindowAnchor
{
    /// <summary>At the check time: the window holds what arrived in the last <c>last</c>.</summary>
    Now,

    /// <summary>At the newest value of the window column (within the pair's filter, at or before the check time): the latest load.</summary>
    Latest,
}
