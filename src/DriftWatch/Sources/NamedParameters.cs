using System.Data.Common;
using System.Globalization;

namespace DriftWatch.Sources;

/// <summary>Hands out named placeholders (<c>$p1</c> for DuckDB, <c>@p1</c> for MySQL) and binds their values to a command.</summary>
internal sealed class NamedParameters(char prefix)
{
    private readonly List<(string Name, object Value)> _values = [];

    public string Add(object value)
    {
        var name = "p" + (_values.Count + 1).ToString(CultureInfo.InvariantCulture);
        _values.Add((name, value));
        return prefix + name;
    }

    public void BindTo(DbCommand command, Func<string, object, DbParameter> create)
    {
        ArgumentNullException.ThrowIfNull(command);
        ArgumentNullException.ThrowIfNull(create);
        foreach (var (name, value) in _values)
        {
            command.Parameters.Add(create(name, value));
        }
    }
}
