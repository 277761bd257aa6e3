namespace DriftWatch.Output;

/// <summary>How a command prints its result.</summary>
internal enum OutputFormat
{
    /// <summary>Aligned tables and coloured severities for a person at a terminal (plain when redirected).</summary>
    Table,

    /// <summary>The JSON contract (<see cref="JsonContract"/>), for scripts.</summary>
    Json,
}
