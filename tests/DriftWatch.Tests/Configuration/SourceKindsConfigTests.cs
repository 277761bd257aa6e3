using DriftWatch.Core.Configuration;
using DriftWatch.Sources.MySql;
using MySqlConnector;

namespace DriftWatch.Tests.Configuration;

/// <summary>The duckdb and mysql source kinds in the configuration: what loads, and each mistake at its line and column.</summary>
public sealed class SourceKindsConfigTests
{
    private const string Pair = """

        pairs:
          - name: events
            source: lake
            table: 'data/events/*.parquet'
            x: u
            y: v
        """;

    [Fact]
    public void DuckDb_WithoutConnection_ReadsFilesThroughAnInMemoryDatabase()
    {
        var result = ConfigText.Parse("sources:\n  - name: lake\n    kind: duckdb" + Pair);

        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        var source = Assert.Single(result.Config!.Sources);
        Assert.Equal(SourceKind.DuckDb, source.Kind);
        Assert.Contains(":memory:", source.ConnectionString, StringComparison.Ordinal);
        Assert.Equal(ConfigText.BaseDirectory, source.BaseDirectory);
        Assert.Equal("data/events/*.parquet", Assert.Single(result.Config.Pairs).Table);
    }

    [Fact]
    public void DuckDb_DatabaseFile_ResolvesAgainstTheConfigDirectory()
    {
        var result = ConfigText.Parse("sources:\n  - name: lake\n    kind: duckdb\n    connection: lake.duckdb" + Pair);

        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Contains(Path.Combine(ConfigText.BaseDirectory, "lake.duckdb"), result.Config!.Sources[0].ConnectionString, StringComparison.Ordinal);
    }

    [Fact]
    public void MySql_PasswordFromTheEnvironment_AndServerRequired()
    {
        var ok = ConfigText.Parse(
            "sources:\n  - name: lake\n    kind: mysql\n    connection: ${MY}" + Pair.Replace("'data/events/*.parquet'", "events", StringComparison.Ordinal),
            new Dictionary<string, string> { ["MY"] = "Server=db;Database=shop;User ID=reader;Password=from-env" });
        Assert.True(ok.Ok, string.Join("\n", ConfigText.Lines(ok)));
        var builder = new MySqlConnectionStringBuilder(ok.Config!.Sources[0].ConnectionString);
        Assert.Equal("db", builder.Server);
        Assert.Equal("from-env", builder.Password);

        var noServer = ConfigText.Single(ConfigText.Parse("sources:\n  - name: lake\n    kind: mysql\n    connection: Database=shop" + Pair.Replace("'data/events/*.parquet'", "events", StringComparison.Ordinal)));
        Assert.StartsWith("test.yaml:4:", noServer.ToString(), StringComparison.Ordinal);
        Assert.EndsWith("sources[0].connection: is a MySQL connection string without Server (value hidden)", noServer.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public void MisspelledKind_SaysWhereAndSuggestsTheKind()
    {
        var error = ConfigText.Single(ConfigText.Parse("sources:\n  - name: lake\n    kind: duckbd" + Pair));

        Assert.StartsWith("test.yaml:3:", error.ToString(), StringComparison.Ordinal);
        Assert.Contains("sources[0].kind: must be one of postgres, sqlite, duckdb, mysql; was 'duckbd'", error.ToString(), StringComparison.Ordinal);
        Assert.EndsWith("(did you mean 'duckdb'?)", error.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public void Files_OnANonDuckDbSource_AreRefusedAtTheTable()
    {
        var error = ConfigText.Single(ConfigText.Parse("sources:\n  - name: lake\n    kind: sqlite\n    connection: shop.db" + Pair));

        // Line 8 of the YAML holds the pair's table.
        Assert.StartsWith("test.yaml:8:", error.ToString(), StringComparison.Ordinal);
        Assert.EndsWith("pairs[0].table: 'data/events/*.parquet' names files; only a duckdb source reads Parquet or CSV files ('lake' is sqlite)", error.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public void Tablesample_OnAMySqlSource_IsRefused()
    {
        var yaml = "sources:\n  - name: lake\n    kind: mysql\n    connection: Server=db" + Pair.Replace("'data/events/*.parquet'", "events", StringComparison.Ordinal) + "\n    sample:\n      method: tablesample\n";

        var error = ConfigText.Single(ConfigText.Parse(yaml));

        Assert.Contains("method tablesample needs a postgres or duckdb source; 'lake' is mysql", error.ToString(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("x > 1", true, null)]
    [InlineData("note = 'a;b' AND `odd;name` > 0", true, null)]
    [InlineData("note = 'it''s; fine'", true, null)]
    [InlineData("x > 1; DELETE FROM t", true, "it holds a ';': a filter or query must be a single SELECT")]
    [InlineData("x > 1 /*!; DROP TABLE t */", true, "it holds an executable comment (/*! … */)")]
    [InlineData("x > 1 /* note; */", true, null)]
    [InlineData("x > 1 -- trailing", true, "it ends in a line comment, which would hide the rest of DriftWatch's statement")]
    [InlineData("note = 'open", true, "it has an unterminated quote")]
    // With backslash escapes \' stays inside the string; under NO_BACKSLASH_ESCAPES the quote closes it and the ';' is outside.
    [InlineData("note = 'a\\'; DELETE FROM t; -- '", true, null)]
    [InlineData("note = 'a\\'; DELETE FROM t; -- '", false, "it holds a ';': a filter or query must be a single SELECT")]
    public void ConfiguredSql_ForMySql_IsOnePieceOfOneStatement(string text, bool backslashEscapes, string? problem)
    {
        // MySQL's lexical rules for quotes and comments (MySQL reference manual, "String Literals" and "Comments"; from memory).
        Assert.Equal(problem, MySqlConfiguredSql.Problem(text, backslashEscapes));
    }
}
