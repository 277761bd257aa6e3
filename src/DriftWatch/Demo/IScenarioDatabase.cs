namespace DriftWatch.Demo;

/// <summary>
/// The invented "pipeline database" the demo loads day by day and DriftWatch watches through a normal source.
/// Names of tables and columns come from <see cref="TerminalScenario"/> only, never from user input.
/// </summary>
internal interface IScenarioDatabase : IAsyncDisposable
{
    /// <summary>For people: where the data lives, without secrets.</summary>
    string Describe { get; }

    /// <summary>Empties (a previous demo's data only) and creates one table per pair.</summary>
    Task CreateAsync(IReadOnlyList<ScenarioPair> pairs, CancellationToken cancellationToken);

    /// <summary>Appends one day's load of a pair to <paramref name="table"/> (the pair's table, or its renamed successor).</summary>
    Task LoadAsync(ScenarioPair pair, string table, IReadOnlyList<ScenarioRow> rows, CancellationToken cancellationToken);

    /// <summary>An upstream migration renames a table; the pair's configuration still names the old one.</summary>
    Task RenameTableAsync(string from, string to, CancellationToken cancellationToken);
}
