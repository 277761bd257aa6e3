namespace DriftWatch.Alerting.Channels.Webhook;

/// <summary>The headers every webhook post carries besides Content-Type (docs/alerting.md, "Verifying a post").</summary>
internal static class WebhookHeaders
{
    /// <summary>Unix time in whole seconds when this attempt was made (each retry has its own).</summary>
    public const string Timestamp = "X-DriftWatch-Timestamp";

    /// <summary>Lowercase hex HMAC-SHA256 of "timestamp.body" (<see cref="WebhookSignature"/>).</summary>
    public const string Signature = "X-DriftWatch-Signature";

    /// <summary>The message's stable id, the same on every retry: a receiver drops a delivery id it has already taken.</summary>
    public const string DeliveryId = "X-DriftWatch-Delivery-Id";

    public const string ContentType = "application/json";

    public const string UserAgent = "DriftWatch";
}
