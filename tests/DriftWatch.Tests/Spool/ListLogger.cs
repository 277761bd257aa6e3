using Microsoft.Extensions.Logging;

namespace DriftWatch.Tests.Spool;

/// <summary>Keeps every formatted log line, so a test can assert what an operator would read.</summary>
internal sealed class ListLogger<T> : ILogger<T>
{
    public System.Collections.Concurrent.ConcurrentQueue<(LogLevel Level, string Message)> Lines { get; } = new();

    public IDisposable? BeginScope<TState>(TState state)
        where TState : notnull => null;

    public bool IsEnabled(LogLevel logLevel) => true;

    public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter)
    {
        ArgumentNullException.ThrowIfNull(formatter);
        Lines.Enqueue((logLevel, formatter(state, exception)));
    }
}
