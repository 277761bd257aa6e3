using DriftWatch.Core.Configuration;

namespace DriftWatch.Tests.Configuration;

/// <summary>
/// A <c>channel: webhook</c> mailing list is checked at start-up: the URL (https, plain http only to a loopback
/// address), the signing secret (inline with ${ENV}, or a file), format and timeout; every refusal names file, line,
/// column and key, and never quotes the URL's path or the secret.
/// </summary>
public sealed class WebhookConfigTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    // Lines 1-4 are the source; alerting is line 5, the list's "name" line 7, its further keys from line 8 (column 7).
    private static string Yaml(string keys) => ConfigText.SqliteSource + "\nalerting:\n  mailing_lists:\n    - name: hook\n" + keys;

    private static MailingListConfig Single(string keys, IReadOnlyDictionary<string, string>? env = null, string? baseDirectory = null)
    {
        var result = ConfigText.Parse(Yaml(keys), env, baseDirectory);
        Assert.Empty(ConfigText.Lines(result));
        return Assert.Single(result.Config!.Alerting.MailingLists);
    }

    private static string[] Errors(string keys, IReadOnlyDictionary<string, string>? env = null, string? baseDirectory = null) =>
        ConfigText.Lines(ConfigText.Parse(Yaml(keys), env, baseDirectory));

    [Fact]
    public void Parse_HttpsUrlAndSecretFromEnv_MapsEveryKey()
    {
        var list = Single(
            "      channel: webhook\n      url: https://hooks.example.org/in/${HOOK_TOKEN}\n      secret: ${HOOK_SECRET}\n      format: text\n      timeout: 30s\n",
            new Dictionary<string, string> { ["HOOK_TOKEN"] = "T0KEN-42", ["HOOK_SECRET"] = "s3cret-s3cret-s3cret" });

        Assert.Equal(ChannelKind.Webhook, list.Channel);
        Assert.Equal(new Uri("https://hooks.example.org/in/T0KEN-42"), list.Url);
        Assert.Equal("s3cret-s3cret-s3cret", list.Secret);
        Assert.Equal(WebhookFormat.Text, list.Format);
        Assert.Equal(TimeSpan.FromSeconds(30), list.Timeout);
        Assert.Empty(list.Recipients);
    }

    [Fact]
    public void Parse_Defaults_FullFormatAndTenSecondTimeout()
    {
        var list = Single("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: 0123456789abcdef\n");

        Assert.Equal((WebhookFormat.Full, TimeSpan.FromSeconds(10)), (list.Format, list.Timeout));
        Assert.Equal(MailingListConfig.DefaultWebhookTimeout, list.Timeout);
    }

    [Theory]
    [InlineData("http://127.0.0.1:9000/hook")]
    [InlineData("http://localhost:9000/hook")]
    [InlineData("http://[::1]:9000/hook")]
    public void Parse_PlainHttpToLoopback_IsAccepted(string url)
    {
        var list = Single($"      channel: webhook\n      url: {url}\n      secret: 0123456789abcdef\n");
        Assert.Equal(new Uri(url), list.Url);
    }

    [Fact]
    public void Parse_PlainHttpToAnotherHost_IsRefusedWithoutQuotingThePath()
    {
        var errors = Errors("      channel: webhook\n      url: http://hooks.example.org:8080/in/T0KEN-42\n      secret: 0123456789abcdef\n");

        Assert.Equal(
            ["test.yaml:9:12: alerting.mailing_lists[0].url: must be https:// (plain http:// is allowed to a loopback address only, such as 127.0.0.1, ::1 or localhost); was http://hooks.example.org:8080"],
            errors);
    }

    [Fact]
    public void Parse_NotAUrl_IsRefusedWithTheValueHidden()
    {
        var errors = Errors("      channel: webhook\n      url: ftp://hooks.example.org/T0KEN-42\n      secret: 0123456789abcdef\n");
        Assert.Equal(["test.yaml:9:12: alerting.mailing_lists[0].url: must be an absolute https:// address (value hidden)"], errors);
    }

    [Fact]
    public void Parse_WebhookWithoutUrlOrSecret_NamesBothMissingKeys()
    {
        var errors = Errors("      channel: webhook\n");

        Assert.Equal(
        [
            "test.yaml:7:7: alerting.mailing_lists[0].url: is required for the webhook channel: the https:// address each digest is posted to",
            "test.yaml:7:7: alerting.mailing_lists[0].secret: is required for the webhook channel (or secret_file): the key each post is signed with",
        ],
            errors);
    }

    [Fact]
    public void Parse_ShortSecret_IsRefusedWithTheValueHidden()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: short-key\n");
        Assert.Equal(["test.yaml:10:15: alerting.mailing_lists[0].secret: is too short to sign with: use at least 16 characters (value hidden)"], errors);
    }

    [Fact]
    public void Parse_SecretFile_ReadsTheFileWithoutItsLineBreak()
    {
        _dir.Write("hook.secret", "from-a-file-0123456789\n");
        var list = Single("      channel: webhook\n      url: https://hooks.example.org/in\n      secret_file: hook.secret\n", baseDirectory: _dir.Path);
        Assert.Equal("from-a-file-0123456789", list.Secret);
    }

    [Fact]
    public void Parse_MissingSecretFile_NamesKeyAndPath()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret_file: gone.secret\n", baseDirectory: _dir.Path);
        Assert.Equal([$"test.yaml:10:20: alerting.mailing_lists[0].secret_file: cannot read '{Path.Combine(_dir.Path, "gone.secret")}': no such file"], errors);
    }

    [Fact]
    public void Parse_SecretAndSecretFile_KeepOne()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: 0123456789abcdef\n      secret_file: hook.secret\n");
        Assert.Equal(["test.yaml:11:20: alerting.mailing_lists[0].secret_file: and secret are both given; keep one of them"], errors);
    }

    [Fact]
    public void Parse_UnknownFormat_ListsTheChoices()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: 0123456789abcdef\n      format: txt\n");
        Assert.Equal(["test.yaml:11:15: alerting.mailing_lists[0].format: must be one of full, text; was 'txt' (did you mean 'text'?)"], errors);
    }

    [Fact]
    public void Parse_TimeoutOutOfRange_SaysTheLimit()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: 0123456789abcdef\n      timeout: 10m\n");
        Assert.Equal(["test.yaml:11:16: alerting.mailing_lists[0].timeout: must be at most 5m, was 10m"], errors);
    }

    [Fact]
    public void Parse_WebhookKeysOnAFileList_AreRefused()
    {
        var errors = Errors("      channel: file\n      directory: out\n      url: https://hooks.example.org/in\n");
        Assert.Equal(["test.yaml:10:12: alerting.mailing_lists[0].url: applies to the webhook channel only"], errors);
    }

    [Fact]
    public void Parse_MailKeysOnAWebhookList_AreRefused()
    {
        var errors = Errors("      channel: webhook\n      url: https://hooks.example.org/in\n      secret: 0123456789abcdef\n      recipients: [a@example.org]\n      include_plot: true\n");

        Assert.Equal(
        [
            "test.yaml:11:19: alerting.mailing_lists[0].recipients: applies to the smtp channel only",
            "test.yaml:12:21: alerting.mailing_lists[0].include_plot: applies to the smtp and file channels only: a webhook never carries a plot (it links to the dashboard)",
        ],
            errors);
    }
}
