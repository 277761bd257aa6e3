using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerts;

/// <summary>The items one route receives in one cycle: they become one message.</summary>
internal sealed record RoutedDigest(RouteConfig Route, IReadOnlyList<DigestItem> Items);
