using DriftWatch.Core.Configuration;

namespace DriftWatch.Configuration;

/// <summary>
/// The keys of a <c>channel: webhook</c> mailing list: <c>url</c>, <c>secret</c> or <c>secret_file</c>, <c>format</c>,
/// <c>timeout</c>. The URL may carry a token (chat tools put one in the path), so it is read like a secret and a
/// message names at most its scheme, host and port.
/// </summary>
internal static class WebhookKeys
{
    /// <summary>A shorter key is guessable; 16 characters is common practice for an HMAC secret's floor.</summary>
    public const int MinSecretLength = 16;

    public static readonly TimeSpan MinTimeout = TimeSpan.FromSeconds(1);
    public static readonly TimeSpan MaxTimeout = TimeSpan.FromMinutes(5);

    private static readonly string[] Keys = ["url", "secret", "secret_file", "format", "timeout"];

    public static Values Read(MappingReader reader, ChannelKind channel)
    {
        ArgumentNullException.ThrowIfNull(reader);
        if (channel != ChannelKind.Webhook)
        {
            foreach (var key in Keys.Where(reader.Has))
            {
                _ = reader.Node(key);
                reader.Error(key, "applies to the webhook channel only");
            }

            return new Values(null, null, WebhookFormat.Full, MailingListConfig.DefaultWebhookTimeout);
        }

        var url = ReadUrl(reader);
        var secret = ReadSecret(reader);
        var format = reader.Choice("format", ("full", WebhookFormat.Full), ("text", WebhookFormat.Text)) ?? WebhookFormat.Full;
        var timeout = reader.Duration("timeout", MinTimeout, MaxTimeout) ?? MailingListConfig.DefaultWebhookTimeout;
        return new Values(url, secret, format, timeout);
    }

    private static Uri? ReadUrl(MappingReader reader)
    {
        if (!reader.Has("url"))
        {
            _ = reader.Node("url");
            reader.Missing("url", "is required for the webhook channel: the https:// address each digest is posted to");
            return null;
        }

        var text = reader.Text("url", secret: true);
        if (text is null || text == ConfigContext.OfflinePlaceholder)
        {
            return null;
        }

        if (!Uri.TryCreate(text, UriKind.Absolute, out var url) || (url.Scheme != Uri.UriSchemeHttps && url.Scheme != Uri.UriSchemeHttp) || url.Host.Length == 0)
        {
            reader.Error("url", "must be an absolute https:// address (value hidden)");
            return null;
        }

        if (!string.IsNullOrEmpty(url.UserInfo))
        {
            reader.Error("url", "must not carry a user name or password; the post is signed with secret instead (value hidden)");
            return null;
        }

        if (url.Scheme == Uri.UriSchemeHttp && !url.IsLoopback)
        {
            reader.Error("url", $"must be https:// (plain http:// is allowed to a loopback address only, such as 127.0.0.1, ::1 or localhost); was {url.GetLeftPart(UriPartial.Authority)}");
            return null;
        }

        return url;
    }

    private static string? ReadSecret(MappingReader reader)
    {
        var secret = reader.Text("secret", secret: true);
        var file = reader.Text("secret_file");
        if (secret is not null && file is not null)
        {
            reader.Error("secret_file", "and secret are both given; keep one of them");
            return null;
        }

        if (secret is null && file is null)
        {
            if (!reader.Has("secret") && !reader.Has("secret_file"))
            {
                reader.Missing("secret", "is required for the webhook channel (or secret_file): the key each post is signed with");
            }

            return null;
        }

        if (file is not null)
        {
            secret = SecretFiles.Read(reader.Context.ResolvePath(file), out var problem);
            if (secret is null && reader.Context.Offline)
            {
                reader.Context.SkipOffline(reader.KeyPath("secret_file"), problem + "; not checked offline");
                return ConfigContext.OfflinePlaceholder;
            }

            if (secret is null)
            {
                reader.Error("secret_file", problem!);
                return null;
            }
        }

        if (secret!.Length < MinSecretLength && secret != ConfigContext.OfflinePlaceholder)
        {
            reader.Error(file is null ? "secret" : "secret_file", $"is too short to sign with: use at least {MinSecretLength} characters (value hidden)");
            return null;
        }

        return secret;
    }

    internal sealed record Values(Uri? Url, string? Secret, WebhookFormat Format, TimeSpan Timeout);
}
