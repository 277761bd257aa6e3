using System.Collections.Concurrent;
using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Findings;
using Microsoft.Extensions.Logging;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>A failed delivery attempt is one log line with its reason; the stack trace is for debug level only.</summary>
public sealed class DeliveryFailureLogTests : IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Dispatch_SmtpServerDown_LogsOneLineWithTheReasonAndTheTraceOnlyAtDebug()
    {
        // Nothing listens on the port: the connection is refused by the operating system (a real socket error).
        var port = LoopbackSmtp.FreePort();
        var log = new Collected();
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(port, MailingList("team", "team@example.org")), dispatcherLog: log);
        await harness.CycleAsync((Pair("pair_a"), [Critical(FindingKind.BecamePerfect, "pair a became exact")]));

        var result = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(1, result.Failed);
        var failure = Assert.Single(log.Entries, e => e.Level >= LogLevel.Warning);
        Assert.Equal(LogLevel.Warning, failure.Level);
        Assert.Null(failure.Exception);
        Assert.DoesNotContain('\n', failure.Message);
        Assert.Contains($"SMTP server 127.0.0.1:{port} (None) unavailable", failure.Message, StringComparison.Ordinal);
        // ECONNREFUSED's text on Linux (common practice).
        Assert.Contains("Connection refused", failure.Message, StringComparison.Ordinal);
        Assert.Contains("(attempt 1)", failure.Message, StringComparison.Ordinal);
        var trace = Assert.Single(log.Entries, e => e.Level == LogLevel.Debug);
        Assert.IsType<ChannelUnavailableException>(trace.Exception);
    }

    public void Dispose() => _file.Dispose();

    private sealed record Entry(LogLevel Level, string Message, Exception? Exception);

    private sealed class Collected : ILogger<OutboxDispatcher>
    {
        private readonly ConcurrentQueue<Entry> _entries = new();

        public IReadOnlyList<Entry> Entries => [.. _entries];

        public IDisposable? BeginScope<TState>(TState state)
            where TState : notnull => null;

        public bool IsEnabled(LogLevel logLevel) => true;

        public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter) =>
            _entries.Enqueue(new Entry(logLevel, formatter(state, exception), exception));
    }
}
