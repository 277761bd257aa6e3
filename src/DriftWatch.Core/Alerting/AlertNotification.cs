namespace DriftWatch.Core.Alerting;

/// <summary>One alert to tell people about, as it stands after this cycle.</summary>
public sealed record AlertNotification(AlertState Alert, NotificationKind Kind);
