using System.Security.Cryptography;
using System.Text.RegularExpressions;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>The configuration file of a running worker is edited badly, then well.</summary>
[Collection(UsesPostgres.Name)]
public sealed partial class ConfigReloadTests(PostgresServer server)
{
    private const string OldPair = "km-vs-litres";
    private const string NewPair = "litres-vs-km";

    [Fact]
    public async Task InvalidEditRefusedWithPosition_OldPairsGoOn_ValidEditAddsPairChecked_EachMailOnce()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        var setup = new WorkerSetup { Pairs = [new PairSpec(OldPair, FaultBench.SourceTable)] };
        bench.WriteConfig(setup);
        var firstHash = FileHash(bench.ConfigPath);
        using var worker = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("a succeeded run", async _ => (await bench.RunsAsync(OldPair)).Any(r => r.Status == "succeeded"), worker.OutputLog);
        var loaded = (await bench.HealthReportAsync())!.Value.GetProperty("configuration");
        // The hash /healthz shows is SHA-256 of the file's bytes, as sha256sum computes it (System.Security.Cryptography).
        Assert.Equal(firstHash, loaded.GetProperty("sha256").GetString());
        var loadedAt = loaded.GetProperty("loaded_at").GetString();

        // A schedule that is no cron expression, on a new pair: the whole file is refused, the new pair too.
        bench.WriteConfig(setup with { Pairs = [.. setup.Pairs, new PairSpec(NewPair, FaultBench.SourceTable, "every now and then")] });
        string[] errors = [];
        await Eventually.TrueAsync("the refused reload on /healthz", async ct =>
        {
            if (await bench.HealthReportAsync(ct) is { } report
                && report.GetProperty("configuration").GetProperty("last_reload_error") is { ValueKind: System.Text.Json.JsonValueKind.Object } error)
            {
                errors = [.. error.GetProperty("errors").EnumerateArray().Select(e => e.GetString()!)];
                return errors.Any(e => e.Contains("schedule", StringComparison.Ordinal));
            }

            return false;
        }, worker.OutputLog);
        // file:line:column: key: message, pointing at the bad schedule's line of the file as written.
        var badLine = Array.FindIndex(File.ReadAllLines(bench.ConfigPath), l => l.Contains("every now and then", StringComparison.Ordinal)) + 1;
        var schedule = Assert.Single(errors, e => e.Contains("schedule", StringComparison.Ordinal));
        var position = FilePosition().Match(schedule);
        Assert.True(position.Success, "no file:line:column in " + schedule);
        Assert.Equal(bench.ConfigPath, position.Groups["file"].Value);
        Assert.Equal(badLine, int.Parse(position.Groups["line"].Value, System.Globalization.CultureInfo.InvariantCulture));
        var refused = (await bench.HealthReportAsync())!.Value.GetProperty("configuration");
        Assert.Equal(firstHash, refused.GetProperty("sha256").GetString());
        Assert.Equal(loadedAt, refused.GetProperty("loaded_at").GetString());

        // The old pair goes on being checked under the configuration in force; the new one is not.
        var lastBefore = (await bench.RunsAsync(OldPair))[^1].Id;
        await Eventually.TrueAsync("a run of the old pair after the refused reload", async _ =>
            (await bench.RunsAsync(OldPair)).Any(r => r.Id > lastBefore && r.Status == "succeeded"), worker.OutputLog);
        Assert.Empty(await bench.RunsAsync(NewPair));

        // The same edit, well written: applied at once.
        bench.WriteConfig(setup with { Pairs = [.. setup.Pairs, new PairSpec(NewPair, FaultBench.SourceTable)] });
        var secondHash = FileHash(bench.ConfigPath);
        Assert.NotEqual(firstHash, secondHash);
        await Eventually.TrueAsync("/healthz showing the new file in force and no reload error", async ct =>
            await bench.HealthReportAsync(ct) is { } report
            && report.GetProperty("configuration") is var configuration
            && configuration.GetProperty("sha256").GetString() == secondHash
            && configuration.GetProperty("last_reload_error").ValueKind == System.Text.Json.JsonValueKind.Null, worker.OutputLog);
        await Eventually.TrueAsync("a succeeded run of the added pair", async _ =>
            (await bench.RunsAsync(NewPair)).Any(r => r.Status == "succeeded"), worker.OutputLog);
        Assert.Contains(worker.Output, l => l.Contains("Reload: pair", StringComparison.Ordinal) && l.Contains(NewPair, StringComparison.Ordinal) && l.Contains("added", StringComparison.Ordinal));
        Assert.True(await bench.HealthyAsync());
        // The reloads broke nothing for the old pair: every run of it so far succeeded.
        Assert.All(await bench.RunsAsync(OldPair), r => Assert.Equal("succeeded", r.Status));

        await worker.TerminateAsync();
        Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        await bench.AssertEveryMailOnceAsync();
    }

    private static string FileHash(string path) => Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(path)));

    [GeneratedRegex(@"^(?<file>.+):(?<line>\d+):(?<column>\d+): ")]
    private static partial Regex FilePosition();
}
