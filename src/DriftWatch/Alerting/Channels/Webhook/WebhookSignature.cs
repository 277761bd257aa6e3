using System.Security.Cryptography;
using System.Text;

namespace DriftWatch.Alerting.Channels.Webhook;

/// <summary>
/// How a webhook post is signed: lowercase hex of HMAC-SHA256 (RFC 2104, FIPS 180-4) keyed with the mailing list's
/// secret (its UTF-8 bytes) over the ASCII timestamp, a full stop, and the body bytes exactly as sent. The
/// timestamp in the message lets a receiver refuse an old post replayed later.
/// </summary>
internal static class WebhookSignature
{
    public static string Sign(string secret, string timestamp, ReadOnlySpan<byte> body)
    {
        ArgumentException.ThrowIfNullOrEmpty(secret);
        ArgumentException.ThrowIfNullOrEmpty(timestamp);
        return Hex(Encoding.UTF8.GetBytes(secret), SignedBytes(timestamp, body));
    }

    /// <summary>Lowercase hex of HMAC-SHA256(key, data).</summary>
    public static string Hex(ReadOnlySpan<byte> key, ReadOnlySpan<byte> data) => Convert.ToHexStringLower(HMACSHA256.HashData(key, data));

    /// <summary>"timestamp.body": what is signed.</summary>
    public static byte[] SignedBytes(string timestamp, ReadOnlySpan<byte> body)
    {
        var prefix = Encoding.ASCII.GetBytes(timestamp + ".");
        var signed = new byte[prefix.Length + body.Length];
        prefix.CopyTo(signed, 0);
        body.CopyTo(signed.AsSpan(prefix.Length));
        return signed;
    }
}
