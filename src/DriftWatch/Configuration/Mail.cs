using MimeKit;

namespace DriftWatch.Configuration;

/// <summary>Mail addresses are checked with MimeKit's parser, the one that later writes them into messages.</summary>
internal static class Mail
{
    public static string? CheckAddress(string text) =>
        MailboxAddress.TryParse(text, out var mailbox) && mailbox.Address.Contains('@', StringComparison.Ordinal)
            ? null
            : $"'{text}' is not a mail address (name@example.org, or Name <name@example.org>)";
}
