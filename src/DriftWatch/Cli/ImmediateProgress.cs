namespace DriftWatch.Cli;

/// <summary>
/// Reports on the calling thread, one report at a time. <see cref="Progress{T}"/> posts to the thread pool,
/// so its lines could arrive after the command had finished and closed its output.
/// </summary>
internal sealed class ImmediateProgress<T>(Action<T> report) : IProgress<T>
{
    private readonly Lock _gate = new();

    public void Report(T value)
    {
        lock (_gate)
        {
            report(value);
        }
    }
}
