using System.Globalization;
using System.Security.Cryptography;
using System.Text;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// Stable identifiers: the same mailing list, cycle time and set of (alert, transition) always give the same
/// Message-Id, so a message re-sent after an ambiguous failure is recognisably the same one, and a retried
/// cycle cannot queue it twice (the outbox's message_id is unique).
/// </summary>
internal static class MessageIds
{
    public const string Domain = "driftwatch.local";

    /// <summary>A Message-Id without angle brackets, e.g. "dw-3f2a…@driftwatch.local".</summary>
    public static string ForDigest(string mailingList, DateTimeOffset at, IEnumerable<DigestItem> items)
    {
        var keys = items
            .Select(Key)
            .Order(StringComparer.Ordinal);
        var text = string.Join('\n', [mailingList, at.ToUnixTimeMilliseconds().ToString(CultureInfo.InvariantCulture), .. keys]);
        return $"dw-{Hash(text, 24)}@{Domain}";
    }

    /// <summary>A Content-Id for the inline plot of a pair inside one message.</summary>
    public static string ForPlot(string messageId, string pair, int index) =>
        $"plot{index.ToString(CultureInfo.InvariantCulture)}.{Hash(messageId + "\n" + pair, 12)}@{Domain}";

    /// <summary>
    /// One (alert, transition). FirstSeen identifies the alert before the store has given it an id, so the key is
    /// the same whether the message is composed before or after the alert row is written.
    /// </summary>
    private static string Key(DigestItem item) =>
        string.Join('|', item.Alert.Pair, item.Alert.Kind, item.Alert.FirstSeen.ToUnixTimeMilliseconds().ToString(CultureInfo.InvariantCulture), item.Notification.Kind);

    private static string Hash(string text, int length) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)))[..length];
}
