namespace DriftWatch.Core.History;

public enum RunStatus
{
    Succeeded,
    Failed,
}
