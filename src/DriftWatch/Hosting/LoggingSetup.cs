using DriftWatch.Core.Configuration;
using Serilog;
using Serilog.Events;
using Serilog.Formatting.Compact;

namespace DriftWatch.Hosting;

internal static class LoggingSetup
{
    /// <summary>
    /// Console by default (human text, or one JSON object per line for log shippers), an optional file.
    /// Logs go to stderr so that command output on stdout (tables, JSON) stays clean for pipes.
    /// </summary>
    public static Serilog.ILogger Create(LoggingConfig logging, LogEventLevel? overrideLevel = null)
    {
        ArgumentNullException.ThrowIfNull(logging);
        var level = overrideLevel ?? (Enum.TryParse<LogEventLevel>(logging.MinimumLevel, ignoreCase: true, out var parsed) ? parsed : LogEventLevel.Information);
        var configuration = new LoggerConfiguration()
            .MinimumLevel.Is(level)
            .MinimumLevel.Override("Microsoft", LogEventLevel.Warning)
            .MinimumLevel.Override("Quartz", LogEventLevel.Warning)
            .Enrich.FromLogContext();
        configuration = logging.Format == LogFormat.Json
            ? configuration.WriteTo.Console(new CompactJsonFormatter(), standardErrorFromLevel: LogEventLevel.Verbose)
            : configuration.WriteTo.Console(
                outputTemplate: "{Timestamp:HH:mm:ss} {Level:u3} {Message:lj}{NewLine}{Exception}",
                standardErrorFromLevel: LogEventLevel.Verbose,
                formatProvider: System.Globalization.CultureInfo.InvariantCulture);
        if (!string.IsNullOrWhiteSpace(logging.File))
        {
            configuration = configuration.WriteTo.File(
                new CompactJsonFormatter(),
                logging.File,
                rollingInterval: RollingInterval.Day,
                retainedFileCountLimit: 14);
        }

        return configuration.CreateLogger();
    }
}
