namespace DriftWatch.Sources;

/// <summary>A watched pair could not be read. The message is for people and never carries secrets.</summary>
internal sealed class SourceException : Exception
{
    public SourceException(SourceFailure failure, string message, Exception? innerException = null)
        : base(message, innerException)
    {
        Failure = failure;
    }

    public SourceFailure Failure { get; }
}
