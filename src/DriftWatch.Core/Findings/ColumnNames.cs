namespace DriftWatch.Core.Findings;

/// <summary>The pair's column names as messages show them, and the profile's equation rewritten with them.</summary>
internal readonly record struct ColumnNames(string X, string Y)
{
    public static ColumnNames Of(string? x, string? y) =>
        new(string.IsNullOrWhiteSpace(x) ? "x" : x, string.IsNullOrWhiteSpace(y) ? "y" : y);

    /// <summary>"y = 3.6·x + 2" becomes "energy_mj = 3.6·energy_kwh + 2".</summary>
    public string Equation(string? equation)
    {
        const string Lead = "y = ";
        if (equation is null || !equation.StartsWith(Lead, StringComparison.Ordinal))
        {
            return equation ?? string.Empty;
        }

        // The right-hand side holds one "x" and otherwise only digits, signs, '.', '·' and 'E'.
        string rest = equation[Lead.Length..];
        int at = rest.IndexOf('x', StringComparison.Ordinal);
        string named = at < 0 ? rest : rest[..at] + X + rest[(at + 1)..];
        return Y + " = " + named;
    }
}
