using DriftWatch.Sources;

namespace DriftWatch.IntegrationTests.Sources;

/// <summary>Quoting per the SQL standard's delimited identifiers (common practice: PostgreSQL manual §4.1.1, SQLite keywords page).</summary>
public sealed class SqlIdentifierTests
{
    [Theory]
    [InlineData("amount", "\"amount\"")]
    [InlineData("Order Total", "\"Order Total\"")]
    [InlineData("a\"b", "\"a\"\"b\"")]
    [InlineData("a\"; drop table x; --", "\"a\"\"; drop table x; --\"")]
    public void Quote_WrapsInDoubleQuotes_DoublingEmbeddedQuotes(string name, string expected)
    {
        Assert.Equal(expected, SqlIdentifier.Quote(name));
    }

    [Theory]
    [InlineData("")]
    [InlineData("   ")]
    [InlineData("a\0b")]
    [InlineData("line\nbreak")]
    public void Quote_EmptyOrControlCharacters_IsRejected(string name)
    {
        Assert.Throws<ArgumentException>(() => SqlIdentifier.Quote(name));
    }

    [Fact]
    public void Quote_LongerThanPostgresNameLimit_IsRejected()
    {
        // NAMEDATALEN is 64 bytes including the terminator (PostgreSQL manual §4.1.1): 63 is the longest name.
        Assert.Equal(65, SqlIdentifier.Quote(new string('a', 63)).Length);
        Assert.Throws<ArgumentException>(() => SqlIdentifier.Quote(new string('a', 64)));
        Assert.Throws<ArgumentException>(() => SqlIdentifier.Quote(new string('é', 32)));
    }

    [Theory]
    [InlineData("orders", null, "orders", "\"orders\"")]
    [InlineData("sales.orders", "sales", "orders", "\"sales\".\"orders\"")]
    [InlineData("\"my.schema\".\"odd\"\"name\"", "my.schema", "odd\"name", "\"my.schema\".\"odd\"\"name\"")]
    [InlineData("a\"; drop table x; --", null, "a\"; drop table x; --", "\"a\"\"; drop table x; --\"")]
    public void ParseQualified_SplitsSchemaAndTable(string text, string? schema, string table, string quoted)
    {
        var name = SqlIdentifier.ParseQualified(text);

        Assert.Equal(schema, name.Schema);
        Assert.Equal(table, name.Name);
        Assert.Equal(quoted, name.Quoted);
    }

    [Theory]
    [InlineData("a.b.c")]
    [InlineData("\"unterminated")]
    [InlineData("\"a\"b.c")]
    [InlineData("sales.")]
    public void ParseQualified_Malformed_IsRejected(string text)
    {
        Assert.Throws<ArgumentException>(() => SqlIdentifier.ParseQualified(text));
    }
}
