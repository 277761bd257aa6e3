namespace DriftWatch.Sources;

internal enum SourceFailure
{
    Unreachable,
    MissingTable,
    MissingColumn,
    NonNumericColumn,
    PermissionDenied,
    Timeout,
    QueryError,
}
