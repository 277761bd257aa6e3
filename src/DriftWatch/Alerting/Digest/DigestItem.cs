using DriftWatch.Core.Alerting;

namespace DriftWatch.Alerting.Digest;

/// <summary>One notification with the context of its pair: the unit mailing lists filter and digests group.</summary>
internal sealed record DigestItem(AlertNotification Notification, AlertPairContext Context)
{
    public AlertState Alert => Notification.Alert;

    public bool IsActive => Notification.Kind != NotificationKind.Cleared;
}
