using DriftWatch.Alerting.Digest;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Routing;

/// <summary>
/// Which mailing list hears about which alert. A list takes an alert when its severity reaches the list's
/// from_severity and the pair selects the list: a pair with a <c>notify</c> list of names selects exactly the
/// mailing lists it names (their tag filters are then not consulted: naming a list is the stronger statement); a
/// pair without one selects every list whose tag filter is empty or shares a tag with the pair. All-clear notices
/// follow the same rules with the severity the alert had.
/// </summary>
internal static class AlertAddressing
{
    public static IReadOnlyList<AddressedDigest> Address(IReadOnlyList<DigestItem> items, IReadOnlyList<MailingListConfig> lists)
    {
        ArgumentNullException.ThrowIfNull(items);
        ArgumentNullException.ThrowIfNull(lists);
        var result = new List<AddressedDigest>();
        foreach (var list in lists)
        {
            var taken = items.Where(i => Takes(list, i)).ToArray();
            if (taken.Length > 0)
            {
                result.Add(new AddressedDigest(list, taken));
            }
        }

        return result;
    }

    public static bool Takes(MailingListConfig list, DigestItem item)
    {
        ArgumentNullException.ThrowIfNull(list);
        ArgumentNullException.ThrowIfNull(item);
        if (item.Alert.Severity < list.FromSeverity)
        {
            return false;
        }

        var pair = item.Context.Pair;
        if (pair.Notify.Count > 0)
        {
            return pair.Notify.Contains(list.Name, StringComparer.Ordinal);
        }

        return list.Tags.Count == 0 || list.Tags.Intersect(pair.Tags, StringComparer.Ordinal).Any();
    }
}
