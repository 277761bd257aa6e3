using System.Globalization;
using Npgsql;
using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// Hands out $1, $2, … placeholders. Source commands use positional parameters inside an
/// <see cref="NpgsqlBatch"/> so Npgsql sends the text unparsed as ONE prepared statement: the server then
/// rejects a second statement smuggled into a pair's filter or query ("; COMMIT; DELETE …").
/// </summary>
internal sealed class PositionalParameters
{
    private readonly List<NpgsqlParameter> _parameters = [];

    public string Add(object value, NpgsqlDbType type)
    {
        _parameters.Add(new NpgsqlParameter { Value = value, NpgsqlDbType = type });
        return "$" + _parameters.Count.ToString(CultureInfo.InvariantCulture);
    }

    public NpgsqlBatchCommand Command(string sql)
    {
        var command = new NpgsqlBatchCommand(sql);
        foreach (var parameter in _parameters)
        {
            command.Parameters.Add(parameter);
        }

        return command;
    }
}
