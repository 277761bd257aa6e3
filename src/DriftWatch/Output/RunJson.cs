using DriftWatch.Core.History;

namespace DriftWatch.Output;

/// <summary>
/// One recorded run, as every outward surface shows it: <c>history --format json</c>, the dashboard API
/// (<c>/api/pairs</c>, <c>/api/pairs/{name}/runs</c>). Names are snake_case by <see cref="JsonContract"/>'s naming
/// policy; add fields at the end, the shape is pinned by approval tests.
/// </summary>
internal sealed record RunJson(
    long Id,
    DateTimeOffset StartedAt,
    DateTimeOffset FinishedAt,
    double DurationSeconds,
    string Status,
    string? Error,
    string? SampleMethod,
    ProfileJson? Profile,
    IReadOnlyList<FindingJson> Findings,
    WindowJson? Window,
    JudgedAgainstJson? JudgedAgainst,
    DateTimeOffset? WindowEndedAt,
    DateTimeOffset? BackDatedAt)
{
    public static RunJson Of(RunRecord run)
    {
        ArgumentNullException.ThrowIfNull(run);
        return new RunJson(
            run.Id,
            run.StartedAt,
            run.FinishedAt,
            Math.Max(0, (run.FinishedAt - run.StartedAt).TotalSeconds),
            JsonContract.Name(run.Status),
            run.Error,
            run.SampleMethod,
            run.Profile is null ? null : JsonContract.ToJson(run.Profile),
            [.. run.Findings.Select(JsonContract.ToJson)],
            WindowJson.Of(run.SourceFigures),
            JudgedAgainstJson.Of(run.JudgedAgainst),
            run.WindowEnd,
            run.BackDatedAt);
    }
}
