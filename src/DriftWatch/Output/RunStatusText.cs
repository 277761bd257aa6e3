using DriftWatch.Core.History;

namespace DriftWatch.Output;

/// <summary>
/// The one word for a run's outcome, the same in CLI tables, JSON, the dashboard and the docs: "succeeded",
/// "failed", "unmeasurable" or "interrupted" (<see cref="JsonContract.Name(RunStatus)"/>). Tables colour the last two red.
/// </summary>
internal static class RunStatusText
{
    public static string Word(RunStatus status) => JsonContract.Name(status);

    /// <summary>Spectre markup: the word, red when the run measured nothing.</summary>
    public static string Markup(RunStatus status) =>
        status == RunStatus.Succeeded ? Word(status) : $"[red]{Word(status)}[/]";
}
