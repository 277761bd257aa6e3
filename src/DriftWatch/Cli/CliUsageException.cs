namespace DriftWatch.Cli;

/// <summary>
/// The user asked for something that cannot be done as asked (missing file, unknown column, options
/// that contradict each other). <see cref="CliApp"/> prints the message as one "error:" line and exits
/// with <see cref="ExitCodes.UsageError"/>; no stack trace, the message is for people.
/// </summary>
internal sealed class CliUsageException : Exception
{
    public CliUsageException(string message, Exception? innerException = null)
        : base(message, innerException)
    {
    }
}
