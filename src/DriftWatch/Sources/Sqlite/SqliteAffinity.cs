namespace DriftWatch.Sources.Sqlite;

internal enum SqliteAffinity
{
    Integer,
    Text,
    Blob,
    Real,
    Numeric,
}

/// <summary>SQLite's rules for a column's type affinity from its declared type, in their documented order (sqlite.org/datatype3.html §3.1).</summary>
internal static class SqliteAffinityRules
{
    public static SqliteAffinity Of(string? declaredType)
    {
        var type = (declaredType ?? string.Empty).ToUpperInvariant();
        if (type.Contains("INT", StringComparison.Ordinal))
        {
            return SqliteAffinity.Integer;
        }

        if (type.Contains("CHAR", StringComparison.Ordinal) || type.Contains("CLOB", StringComparison.Ordinal) || type.Contains("TEXT", StringComparison.Ordinal))
        {
            return SqliteAffinity.Text;
        }

        if (type.Length == 0 || type.Contains("BLOB", StringComparison.Ordinal))
        {
            return SqliteAffinity.Blob;
        }

        if (type.Contains("REAL", StringComparison.Ordinal) || type.Contains("FLOA", StringComparison.Ordinal) || type.Contains("DOUB", StringComparison.Ordinal))
        {
            return SqliteAffinity.Real;
        }

        return SqliteAffinity.Numeric;
    }
}
