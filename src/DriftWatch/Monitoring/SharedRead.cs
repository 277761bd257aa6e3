using DriftWatch.Sources;

namespace DriftWatch.Monitoring;

/// <summary>A pair's rows read with its group's (<see cref="TableGroups"/>), from the read started at <paramref name="StartedAt"/>.</summary>
internal sealed record SharedRead(DateTimeOffset StartedAt, SampledPair Read);
