namespace DriftWatch.Demo;

/// <summary>The demo cannot start (the folder is not a previous demo's, the database is unreachable): one line for the user.</summary>
internal sealed class DemoException : Exception
{
    public DemoException()
    {
    }

    public DemoException(string message)
        : base(message)
    {
    }

    public DemoException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
