using DriftWatch.Core.History;

namespace DriftWatch.Spool;

/// <summary>One spooled run and the file that holds it; <see cref="Sequence"/> is the order of arrival.</summary>
internal sealed record SpoolEntry(long Sequence, string File, long Bytes, NewRun Run);
