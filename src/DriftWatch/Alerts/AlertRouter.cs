using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerts;

/// <summary>
/// Which route hears about which alert. A route takes an alert when its severity reaches the route's
/// min_severity and the pair selects the route: a pair with a <c>notify</c> list selects exactly the routes it
/// names (their tag filters are then not consulted: naming a route is the stronger statement); a pair without
/// one selects every route whose tag filter is empty or shares a tag with the pair. Recovery notices follow
/// the same rules with the severity the alert had.
/// </summary>
internal static class AlertRouter
{
    public static IReadOnlyList<RoutedDigest> Route(IReadOnlyList<DigestItem> items, IReadOnlyList<RouteConfig> routes)
    {
        ArgumentNullException.ThrowIfNull(items);
        ArgumentNullException.ThrowIfNull(routes);
        var result = new List<RoutedDigest>();
        foreach (var route in routes)
        {
            var taken = items.Where(i => Takes(route, i)).ToArray();
            if (taken.Length > 0)
            {
                result.Add(new RoutedDigest(route, taken));
            }
        }

        return result;
    }

    public static bool Takes(RouteConfig route, DigestItem item)
    {
        ArgumentNullException.ThrowIfNull(route);
        ArgumentNullException.ThrowIfNull(item);
        if (item.Alert.Severity < route.MinSeverity)
        {
            return false;
        }

        var pair = item.Context.Pair;
        if (pair.Notify.Count > 0)
        {
            return pair.Notify.Contains(route.Name, StringComparer.Ordinal);
        }

        return route.Tags.Count == 0 || route.Tags.Intersect(pair.Tags, StringComparer.Ordinal).Any();
    }
}
