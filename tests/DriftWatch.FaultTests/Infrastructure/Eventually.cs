namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>
/// Waits on a condition, polling it, until it holds or a deadline passes. The deadline bounds a hung test; it is
/// never what the test asserts, and nothing waits a fixed time to let something happen.
/// </summary>
public static class Eventually
{
    /// <summary>Long enough for a loaded 2-core machine; a healthy run meets each condition in a few seconds.</summary>
    public static readonly TimeSpan Deadline = TimeSpan.FromSeconds(90);

    private static readonly TimeSpan Poll = TimeSpan.FromMilliseconds(200);

    public static async Task TrueAsync(string what, TimeSpan deadline, Func<CancellationToken, Task<bool>> condition, Func<string>? context = null)
    {
        using var limit = new CancellationTokenSource(deadline);
        while (true)
        {
            try
            {
                if (await condition(limit.Token))
                {
                    return;
                }

                await Task.Delay(Poll, limit.Token);
            }
            catch (OperationCanceledException) when (limit.IsCancellationRequested)
            {
                throw new TimeoutException($"Waited {deadline.TotalSeconds:0} s for {what}.{(context is null ? "" : "\n" + context())}");
            }
        }
    }

    public static Task TrueAsync(string what, Func<CancellationToken, Task<bool>> condition, Func<string>? context = null) =>
        TrueAsync(what, Deadline, condition, context);
}
