namespace DriftWatch.Tests.Configuration;

/// <summary>
/// Each bad configuration gives its message at the right place. Lines and columns are counted by hand in
/// the YAML below (1-based, as editors show them); the messages are the loader's documented ones.
/// </summary>
public sealed class ConfigLoaderErrorTests
{
    // Lines 1-10; a test's extra keys start on line 11, indented under the pair.
    private const string OnePair = """
        sources:
          - name: shop
            kind: sqlite
            connection: shop.db
        pairs:
          - name: a
            source: shop
            table: t
            x: u
            y: v

        """;

    private static string[] Errors(string yaml) => ConfigText.Lines(ConfigText.Parse(yaml));

    [Fact]
    public void Parse_MisspelledKey_NamesItWithHint()
    {
        var errors = Errors(OnePair + "    smaple:\n      rows: 100\n");
        Assert.Equal(["test.yaml:11:5: pairs[0].smaple: unknown key 'smaple'; did you mean 'sample'?"], errors);
    }

    [Fact]
    public void Parse_KeyAtWrongLevel_PointsToTheLevelItBelongsTo()
    {
        var errors = Errors(OnePair + "    rows: 100\n");
        Assert.Equal(["test.yaml:11:5: pairs[0].rows: unknown key 'rows' here; did you mean 'sample.rows'? ('rows' belongs under 'sample:')"], errors);
    }

    [Fact]
    public void Parse_UnknownKeyWithoutNearMatch_ListsAllowedKeys()
    {
        var errors = Errors(OnePair + "store:\n  colour: red\n");
        Assert.Equal(["test.yaml:12:3: store.colour: unknown key 'colour'; allowed here: kind, connection, password_file, retention, points_per_run, points_retention"], errors);
    }

    [Fact]
    public void Parse_OldExpectKey_PointsToDeclared()
    {
        // A file written before the key was renamed: the message names file, line, column and the new key.
        var errors = Errors(OnePair + "    expect:\n      direction: positive\n      exact: true\n");
        Assert.Equal(["test.yaml:11:5: pairs[0].expect: unknown key 'expect'; it is now 'declared' (same keys: direction, exact): write declared: instead of expect:"], errors);
    }

    [Fact]
    public void Parse_BadCron_QuotesQuartzReason()
    {
        // Quartz's own message for a minute of 61 (its CronExpression parser is the oracle).
        var errors = Errors(OnePair + "    schedule: \"0 61 * * * ?\"\n");
        Assert.Equal(["test.yaml:11:15: pairs[0].schedule: '0 61 * * * ?' is not a valid cron expression: Minute and Second values must be between 0 and 59"], errors);
    }

    [Fact]
    public void Parse_CronThatNeverFires_IsRefused()
    {
        // 30 February does not exist (Gregorian calendar), so Quartz finds no fire time.
        var errors = Errors(OnePair + "    schedule: 0 0 0 30 2 ?\n");
        Assert.Equal(["test.yaml:11:15: pairs[0].schedule: '0 0 0 30 2 ?' never fires"], errors);
    }

    [Fact]
    public void Parse_BadDuration_SaysHowToWriteOne()
    {
        var errors = Errors(OnePair + "    window:\n      column: placed_at\n      last: 5 minutes\n");
        Assert.Equal(["test.yaml:13:13: pairs[0].window.last: '5 minutes' is not a duration; write e.g. 30s, 15m, 24h, 30d or 1h30m"], errors);
    }

    [Fact]
    public void Parse_DurationWithoutUnit_SuggestsUnits()
    {
        var errors = Errors(OnePair + "store:\n  retention: 180\n");
        Assert.Equal(["test.yaml:12:14: store.retention: '180' has no unit; write e.g. 180s or 180m"], errors);
    }

    [Fact]
    public void Parse_DuplicatePairName_NamesFirstDeclaration()
    {
        var errors = Errors(OnePair + "  - name: a\n    source: shop\n    table: t2\n    x: u\n    y: v\n");
        Assert.Equal(["test.yaml:11:11: pairs[1].name: duplicate pair name 'a' (first declared on line 6)"], errors);
    }

    [Fact]
    public void Parse_DuplicateSourceName_IsAnError()
    {
        var errors = Errors(OnePair.Replace("pairs:", "  - name: shop\n    kind: sqlite\n    connection: other.db\npairs:", StringComparison.Ordinal));
        Assert.Equal(["test.yaml:5:11: sources[1].name: duplicate source name 'shop' (first declared on line 2)"], errors);
    }

    [Fact]
    public void Parse_UnknownSource_SuggestsDeclaredOne()
    {
        var errors = Errors(OnePair.Replace("source: shop", "source: shpo", StringComparison.Ordinal));
        Assert.Equal(["test.yaml:7:13: pairs[0].source: unknown source 'shpo'; did you mean 'shop'? (declared: shop)"], errors);
    }

    [Fact]
    public void Parse_UnknownMailingList_IsAnError()
    {
        var errors = Errors(OnePair + "    notify: [pager]\nalerting:\n  mailing_lists:\n    - name: archive\n      channel: file\n      directory: out\n");
        Assert.Equal(["test.yaml:11:14: pairs[0].notify[0]: unknown mailing list 'pager'; declared: archive"], errors);
    }

    [Fact]
    public void Parse_InjectionInTableName_IsRefused()
    {
        var errors = Errors(OnePair.Replace("table: t", "table: 'a\"; drop table x; --'", StringComparison.Ordinal));
        Assert.Equal(["test.yaml:8:12: pairs[0].table: 'a\"; drop table x; --' is not a plain table name; use name or schema.name made of letters, digits, '_' and '$', starting with a letter or '_'"], errors);
    }

    [Theory]
    [InlineData("x: \"u v\"")]
    [InlineData("x: 1u")]
    [InlineData("x: u.v")]
    [InlineData("x: \"u;\"")]
    public void Parse_BadColumnName_IsRefused(string line)
    {
        var errors = Errors(OnePair.Replace("x: u", line, StringComparison.Ordinal));
        var error = Assert.Single(errors);
        Assert.StartsWith("test.yaml:9:8: pairs[0].x: ", error, StringComparison.Ordinal);
        Assert.Contains("is not a plain column name", error, StringComparison.Ordinal);
    }

    [Fact]
    public void Parse_WindowColumnInjection_IsRefused()
    {
        var errors = Errors(OnePair + "    window:\n      column: \"t) or (1=1\"\n      last: 24h\n");
        Assert.Equal(["test.yaml:12:15: pairs[0].window.column: 't) or (1=1' is not a plain column name; use letters, digits, '_' and '$', starting with a letter or '_' (at most 63)"], errors);
    }

    [Fact]
    public void Parse_TableAndQuery_IsAnError()
    {
        var errors = Errors(OnePair + "    query: SELECT u, v FROM t\n");
        Assert.Equal(["test.yaml:11:12: pairs[0].query: table and query are both given; a pair reads either a table (with an optional where) or a query"], errors);
    }

    [Fact]
    public void Parse_NeitherTableNorQuery_IsAnError()
    {
        var errors = Errors(OnePair.Replace("    table: t\n", string.Empty, StringComparison.Ordinal));
        Assert.Equal(["test.yaml:6:5: pairs[0].table: a pair needs table (with an optional where) or query"], errors);
    }

    [Fact]
    public void Parse_MissingX_IsReportedAtThePair()
    {
        var errors = Errors(OnePair.Replace("    x: u\n", string.Empty, StringComparison.Ordinal));
        Assert.Equal(["test.yaml:6:5: pairs[0].x: is required: the column on the horizontal axis"], errors);
    }

    [Fact]
    public void Parse_TooFewRows_SaysLimitAndValue()
    {
        var errors = Errors(OnePair + "    sample:\n      rows: 3\n");
        Assert.Equal(["test.yaml:12:13: pairs[0].sample.rows: must be at least 10, was 3"], errors);
    }

    [Fact]
    public void Parse_NonLoopbackBindWithoutToken_IsAnError()
    {
        var errors = Errors(OnePair + "dashboard:\n  bind: 0.0.0.0\n");
        Assert.Equal(["test.yaml:12:9: dashboard.bind: '0.0.0.0' is reachable from other machines; set dashboard.access_token (e.g. ${DRIFTWATCH_DASHBOARD_TOKEN}) or bind to 127.0.0.1"], errors);
    }

    // Loopback is 127.0.0.0/8 and ::1 (RFC 1122 section 3.2.1.3, RFC 4291 section 2.5.3); ::ffff:a.b.c.d is the
    // IPv4-mapped form of a.b.c.d (RFC 4291 section 2.5.5.2). The loader keeps the one canonical address it read.
    [Theory]
    [InlineData("127.0.0.1", "127.0.0.1")]
    [InlineData("127.0.0.2", "127.0.0.2")]
    [InlineData("::1", "::1")]
    [InlineData("[::1]", "::1")]
    [InlineData("localhost", "127.0.0.1")]
    [InlineData("::ffff:127.0.0.1", "127.0.0.1")]
    public void Parse_LoopbackBindWithoutToken_IsFineAndNormalised(string bind, string normalised)
    {
        var result = ConfigText.Parse(OnePair + $"dashboard:\n  bind: \"{bind}\"\n");
        Assert.True(result.Ok, string.Join("\n", ConfigText.Lines(result)));
        Assert.Equal(normalised, result.Config!.Dashboard.Bind);
    }

    [Theory]
    [InlineData("[::]")]
    [InlineData("::ffff:0.0.0.0")]
    [InlineData("::ffff:192.168.1.20")]
    public void Parse_NonLoopbackBindInAnyWritingWithoutToken_IsAnError(string bind)
    {
        var errors = Errors(OnePair + $"dashboard:\n  bind: \"{bind}\"\n");
        Assert.Equal([$"test.yaml:12:9: dashboard.bind: '{bind}' is reachable from other machines; set dashboard.access_token (e.g. ${{DRIFTWATCH_DASHBOARD_TOKEN}}) or bind to 127.0.0.1"], errors);
    }

    [Theory]
    [InlineData("[127.0.0.1]")]
    [InlineData("[[::1]]")]
    [InlineData("dashboard.internal")]
    public void Parse_BindThatIsNoAddress_IsAnError(string bind)
    {
        var errors = Errors(OnePair + $"dashboard:\n  bind: \"{bind}\"\n");
        Assert.Equal([$"test.yaml:12:9: dashboard.bind: must be an IP address (127.0.0.1, ::1, 0.0.0.0, ::) or localhost, was '{bind}'"], errors);
    }

    [Fact]
    public void Parse_WrongChoice_ListsOptionsAndHint()
    {
        var errors = Errors(OnePair + "    sample:\n      method: randmo\n");
        Assert.Equal(["test.yaml:12:15: pairs[0].sample.method: must be one of auto, tablesample, random, all; was 'randmo' (did you mean 'random'?)"], errors);
    }

    [Fact]
    public void Parse_TablesampleOnSqlite_IsAnError()
    {
        var errors = Errors(OnePair + "    sample:\n      method: tablesample\n");
        Assert.Equal(["test.yaml:12:7: pairs[0].sample: method tablesample needs a postgres or duckdb source; 'shop' is sqlite"], errors);
    }

    [Fact]
    public void Parse_RollingBaselineLongerThanPointRetention_IsAnError()
    {
        var errors = Errors(OnePair + "    baseline:\n      rolling: 60d\n");
        Assert.Equal(["test.yaml:12:7: pairs[0].baseline: a rolling baseline of 60d is longer than store.points_retention (35d); the points it pools would already be deleted"], errors);
    }

    [Fact]
    public void Parse_TwoBaselineKinds_IsAnError()
    {
        var errors = Errors(OnePair + "    baseline:\n      rolling: 7d\n      first_runs: 5\n");
        Assert.Equal(["test.yaml:12:7: pairs[0].baseline: needs exactly one of first_runs, window or rolling; first_runs and rolling are given"], errors);
    }

    [Fact]
    public void Parse_WhereWithStatementSeparator_IsRefused()
    {
        var errors = Errors(OnePair.Replace("table: t\n", "table: t\n    where: \"1=1; delete from t\"\n", StringComparison.Ordinal));
        Assert.Equal(["test.yaml:9:12: pairs[0].where: must be one condition without ';'"], errors);
    }

    [Fact]
    public void Parse_WrongNodeType_SaysWhatWasExpected()
    {
        var errors = Errors("pairs:\n  name: a\n");
        Assert.Equal(["test.yaml:2:3: pairs: must be a list (lines starting with '- '), was a mapping"], errors);
    }

    [Fact]
    public void Parse_SmtpMailingListWithoutServer_IsAnError()
    {
        var errors = Errors(OnePair + "alerting:\n  mailing_lists:\n    - name: team\n      recipients: [a@b.example]\n");
        Assert.Equal(["test.yaml:13:7: alerting.mailing_lists[0].channel: is smtp but alerting.smtp is not set; add the server or use channel: file"], errors);
    }

    [Fact]
    public void Parse_BadRecipient_IsAnError()
    {
        var errors = Errors(OnePair + "alerting:\n  mailing_lists:\n    - name: files\n      channel: file\n      directory: out\n      recipients: [nobody]\n");
        Assert.Equal(["test.yaml:16:20: alerting.mailing_lists[0].recipients[0]: 'nobody' is not a mail address (name@example.org, or Name <name@example.org>)"], errors);
    }

    [Fact]
    public void Parse_ManyMistakes_ReportsAllInFileOrder()
    {
        var yaml = """
            sources:
              - name: shop
                kind: oracle
                connection: shop.db
            pairs:
              - name: a
                source: shop
                table: t
                x: u
                y: v
                sample:
                  rows: 3
                schedule: never
            logging:
              level: loud
            """;
        var errors = Errors(yaml);
        Assert.Equal(
            [
                "test.yaml:3:11: sources[0].kind: must be one of postgres, sqlite, duckdb, mysql; was 'oracle'",
                "test.yaml:12:13: pairs[0].sample.rows: must be at least 10, was 3",
                "test.yaml:13:15: pairs[0].schedule: 'never' has 1 fields; write a Quartz cron expression (seconds minutes hours day-of-month month day-of-week [year], e.g. '0 0 * * * ?') or a five-field crontab line (e.g. '0 * * * *')",
                "test.yaml:15:10: logging.level: must be one of verbose, debug, information, warning, error, fatal; was 'loud'",
            ],
            errors);
    }

    [Fact]
    public void Parse_YamlSyntaxError_HasPosition()
    {
        var errors = Errors("sources:\n  - name: shop\n   kind: sqlite\n");
        var error = Assert.Single(errors);
        Assert.StartsWith("test.yaml:3:", error, StringComparison.Ordinal);
        Assert.Contains("(file): YAML syntax:", error, StringComparison.Ordinal);
    }

    [Fact]
    public void Parse_DuplicateYamlKey_IsAnError()
    {
        var errors = Errors("store:\n  retention: 10d\n  retention: 20d\n");
        Assert.Equal(["test.yaml:3:3: (file): YAML: Duplicate key retention"], errors);
    }

    [Fact]
    public void Parse_EmptyText_IsAnError()
    {
        Assert.Equal(["test.yaml:1:1: (file): the configuration is empty; it needs at least sources and pairs"], Errors("# nothing yet\n"));
    }

    [Fact]
    public void Load_MissingFile_IsAnErrorNotAnException()
    {
        var path = Path.Combine(Path.GetTempPath(), "driftwatch-no-such-" + Guid.NewGuid().ToString("N") + ".yaml");
        var result = DriftWatch.Configuration.ConfigLoader.Load(path, _ => null);
        var error = ConfigText.Single(result);
        // A problem of the whole file has no position: no ":0:0" in the message.
        Assert.Equal($"{path}: cannot read the configuration: no such file", error.ToString());
    }
}
