using System.Text.Json;

namespace DriftWatch.Tests.Cli;

/// <summary>What a new user meets first: status words, hints for a mistyped pair, bad ids, a missing file, offline validation.</summary>
public sealed class CliMessagesTests : IDisposable
{
    private readonly AnscombeWorkspace _workspace = new();

    private string Config => _workspace.ConfigPath;

    [Fact]
    public async Task History_Table_UsesTheSameStatusWordAsTheJson()
    {
        Assert.Equal(0, (await CliRun.Of("check", "--config", Config)).ExitCode);

        var table = await CliRun.Of("history", AnscombeWorkspace.PairName, "--config", Config);
        var json = await CliRun.Of("history", AnscombeWorkspace.PairName, "--config", Config, "--format", "json");

        using var document = JsonDocument.Parse(json.Out);
        var word = document.RootElement.GetProperty("runs")[0].GetProperty("status").GetString();
        Assert.Equal("succeeded", word);
        Assert.Contains(" " + word + " ", table.Out, StringComparison.Ordinal);
        Assert.DoesNotContain(" ok ", table.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task History_UnknownPairThatIsTheTailOfAName_SuggestsTheFullName()
    {
        var run = await CliRun.Of("history", "daily_shipments_total_vs_daily_pallets_loaded_by_crew", "--config", Config);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains($"(did you mean '{AnscombeWorkspace.PairName}'?)", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Snooze_PairWithATypo_SuggestsTheClosestName()
    {
        // Two letters swapped ("shfit"): one edit by the optimal-string-alignment distance.
        var typo = AnscombeWorkspace.PairName.Replace("shift", "shfit", StringComparison.Ordinal);

        var run = await CliRun.Of("alerts", "snooze", typo, "--for", "1h", "--config", Config);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains($"(did you mean '{AnscombeWorkspace.PairName}'?)", run.Error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("abc")]
    [InlineData("-3")]
    [InlineData("1.5")]
    public async Task AlertsAck_IdThatIsNotAPositiveWholeNumber_IsAUsageErrorInWords(string id)
    {
        var run = await CliRun.Of("alerts", "ack", id, "--config", Config);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains($"an alert id is a positive whole number such as 12", run.Error, StringComparison.Ordinal);
        Assert.Contains($"was '{id}'", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("System.", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task AlertsAck_UnknownId_SaysSoAndExitsTwo()
    {
        var run = await CliRun.Of("alerts", "ack", "4711", "--config", Config);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("no open alert with id 4711", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task AnyCommand_MissingConfigFile_SaysConfigFileNotFoundWithThePath()
    {
        var missing = Path.Combine(_workspace.Folder, "nowhere.yaml");

        var run = await CliRun.Of("alerts", "list", "--config", missing);

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("error: config file not found: " + missing, run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain(":0:0", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task ValidateOffline_SecretVariablesUnset_PassesAndListsThemAsNotChecked()
    {
        var variable = "DW_TEST_UNSET_" + Guid.NewGuid().ToString("N")[..8].ToUpperInvariant();
        var passwordFile = Path.Combine(_workspace.Folder, "no-such-password.txt");
        var config = Path.Combine(_workspace.Folder, "secrets.yaml");
        File.WriteAllText(config, $$"""
            sources:
              - name: warehouse
                kind: postgres
                connection: ${{{variable}}}
              - name: ledger
                kind: postgres
                connection: Host=db.internal;Database=ledger;Username=reader
                password_file: {{passwordFile}}
            store:
              connection: store.db
            pairs:
              - name: a.b
                source: warehouse
                table: t
                x: x
                y: y
            alerting:
              smtp:
                host: mail.internal
                user: driftwatch
                from: driftwatch@example.org
                password: ${{{variable}}}_MAIL
            """);

        var offline = await CliRun.Of("validate", "--offline", "--config", config);
        var online = await CliRun.Of("validate", "--config", config);

        Assert.Equal(0, offline.ExitCode);
        Assert.Contains($"note: sources[0].connection: environment variable {variable} is not set; not checked offline", offline.Error, StringComparison.Ordinal);
        Assert.Contains("note: sources[1].password_file: ", offline.Error, StringComparison.Ordinal);
        Assert.Contains("not checked offline", offline.Error, StringComparison.Ordinal);
        Assert.Contains("alerting.smtp.password", offline.Error, StringComparison.Ordinal);
        // Without --offline the same secrets are errors, and nothing runs.
        Assert.Equal(2, online.ExitCode);
        Assert.Contains($"environment variable {variable} is not set", online.Error, StringComparison.Ordinal);
    }

    public void Dispose() => _workspace.Dispose();
}
