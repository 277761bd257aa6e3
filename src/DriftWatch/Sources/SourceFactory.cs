using System.Collections.Concurrent;
using DriftWatch.Core.Configuration;
using DriftWatch.Sources.DuckDb;
using DriftWatch.Sources.MySql;
using DriftWatch.Sources.Postgres;
using DriftWatch.Sources.Sqlite;

namespace DriftWatch.Sources;

/// <summary>
/// The one place a source kind is registered. Returns one adapter per source configuration, cached, so the
/// adapter's connection pool and concurrency limit are shared by every pair of that source. A changed
/// configuration (a reload) gets a fresh adapter.
/// </summary>
/// <param name="hints">Where shared reads keep what they learn about columns (the store); none keeps it per adapter.</param>
internal sealed class SourceFactory(IColumnHints? hints = null) : ISourceFactory, IAsyncDisposable
{
    private readonly ConcurrentDictionary<SourceConfig, Lazy<IPairSource>> _sources = new();

    public IPairSource Create(SourceConfig source)
    {
        ArgumentNullException.ThrowIfNull(source);
        return _sources.GetOrAdd(source, s => new Lazy<IPairSource>(() => Build(s))).Value;
    }

    public async ValueTask DisposeAsync()
    {
        foreach (var source in _sources.Values.Where(l => l.IsValueCreated).Select(l => l.Value))
        {
            switch (source)
            {
                case IAsyncDisposable asyncDisposable:
                    await asyncDisposable.DisposeAsync();
                    break;
                case IDisposable disposable:
                    disposable.Dispose();
                    break;
            }
        }

        _sources.Clear();
    }

    private IPairSource Build(SourceConfig source) => source.Kind switch
    {
        SourceKind.Postgres => new PostgresPairSource(source, hints),
        SourceKind.Sqlite => new SqlitePairSource(source),
        SourceKind.DuckDb => new DuckDbPairSource(source),
        SourceKind.MySql => new MySqlPairSource(source),
        _ => throw new ArgumentOutOfRangeException(nameof(source), source.Kind, $"Source '{source.Name}' has an unknown kind."),
    };
}
