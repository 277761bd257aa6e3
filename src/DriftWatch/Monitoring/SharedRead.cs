using DriftWatch.Sources;

namespace DriftWatch.Monitoring;

/// <summary>
/// A pair's rows read with its group's (<see cref="TableGroups"/>), from the read started at <paramref name="StartedAt"/>;
/// the pair's sample is taken out of the shared rows when its check asks for it.
/// </summary>
internal sealed record SharedRead(DateTimeOffset StartedAt, Lazy<SampledPair> Read);
