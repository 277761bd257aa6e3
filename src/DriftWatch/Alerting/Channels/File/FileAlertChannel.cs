using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Channels.File;

/// <summary>
/// Writes the stored message, byte for byte, as "&lt;message-id&gt;.eml" in the mailing list's directory: for setups
/// without mail, and for audit. Idempotent: a retry rewrites the same file (written aside, then moved in, so a
/// reader never sees half a message).
/// </summary>
internal sealed class FileAlertChannel : IAlertChannel
{
    public ChannelKind Kind => ChannelKind.File;

    public ChannelBody Body => ChannelBody.Mail;

    public async Task SendAsync(OutboxEntry entry, MailingListConfig list, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        ArgumentNullException.ThrowIfNull(list);
        if (string.IsNullOrWhiteSpace(list.Directory))
        {
            throw new ChannelUnavailableException($"Mailing list '{list.Name}' writes files but has no directory configured.");
        }

        var bytes = entry.Mime ?? throw new InvalidOperationException($"Outbox entry {entry.Id} was loaded without its message.");
        var path = PathFor(list.Directory, entry.MessageId);
        var temporary = path + ".part";
        try
        {
            Directory.CreateDirectory(list.Directory);
            await System.IO.File.WriteAllBytesAsync(temporary, bytes, cancellationToken);
            System.IO.File.Move(temporary, path, overwrite: true);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new ChannelUnavailableException($"Mailing list '{list.Name}' cannot write to {list.Directory}: {ex.Message}", ex);
        }
    }

    /// <summary>The file for a Message-Id; characters a file name cannot hold become '_'.</summary>
    public static string PathFor(string directory, string messageId)
    {
        ArgumentNullException.ThrowIfNull(messageId);
        var invalid = Path.GetInvalidFileNameChars();
        var name = new string([.. messageId.Trim('<', '>').Select(c => invalid.Contains(c) || c == '\\' ? '_' : c)]);
        return Path.Combine(directory, name + ".eml");
    }
}
