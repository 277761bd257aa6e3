using System.Text.Json;
using DriftWatch.Core.History;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Tests.Spool;

public sealed class RunSpoolTests : IDisposable
{
    private readonly SpoolFixture _fixture = new(maxRuns: 3);

    [Fact]
    public void Append_ThreeRunsThenRestart_PeeksThemInArrivalOrderAndKeepsCounting()
    {
        var spool = _fixture.OpenSpool();
        Assert.True(spool.TryAppend(SpoolFixture.Run("b", 1)));
        Assert.True(spool.TryAppend(SpoolFixture.Run("a", 2)));

        // A restarted worker finds both, in the order they arrived (not by pair name), and appends after them.
        var restarted = _fixture.OpenSpool();
        Assert.Equal(2, restarted.Count);
        Assert.True(restarted.TryAppend(SpoolFixture.Run("c", 3)));
        var order = new List<string>();
        while (restarted.Peek() is { } entry)
        {
            order.Add(entry.Run.Pair);
            restarted.Remove(entry);
        }

        Assert.Equal(["b", "a", "c"], order);
        Assert.Equal(0, restarted.Count);
        Assert.Equal(0, restarted.Status.Bytes);
    }

    [Fact]
    public void TryAppend_BeyondMaxRuns_RefusesTheRunSaysSoAndKeepsTheOthers()
    {
        var spool = _fixture.OpenSpool();
        for (var hour = 0; hour < 3; hour++)
        {
            Assert.True(spool.TryAppend(SpoolFixture.Run("orders", hour)));
        }

        Assert.False(spool.TryAppend(SpoolFixture.Run("orders", 3)));

        var status = spool.Status;
        Assert.Equal((3, true, 1L), (status.Runs, status.Full, status.DroppedRuns));
        var error = Assert.Single(_fixture.SpoolLog.Lines, l => l.Level == LogLevel.Error);
        Assert.Contains("SPOOL FULL", error.Message, StringComparison.Ordinal);
        Assert.Contains("orders", error.Message, StringComparison.Ordinal);
        Assert.Equal(3, Directory.GetFiles(spool.RunsDirectory).Length);
    }

    [Fact]
    public void TryAppend_BeyondMaxBytes_RefusesTheRun()
    {
        var run = SpoolFixture.Run("orders", 0);
        var size = SpoolFileFormat.Encode(run).Length;
        // Room for one run and a half: the second does not fit.
        var spool = new RunSpool(_fixture.Options with { MaxRuns = 100, MaxBytes = size + (size / 2) }, _fixture.SpoolLog);

        Assert.True(spool.TryAppend(run));
        Assert.False(spool.TryAppend(SpoolFixture.Run("orders", 1)));
        Assert.Equal((1, (long)size, true), (spool.Status.Runs, spool.Status.Bytes, spool.Status.Full));
    }

    [Fact]
    public void Peek_TruncatedFileInTheMiddle_IsMovedAsideWithAMessageAndTheOthersStillCome()
    {
        var spool = _fixture.OpenSpool();
        spool.TryAppend(SpoolFixture.Run("orders", 0));
        spool.TryAppend(SpoolFixture.Run("orders", 1));
        spool.TryAppend(SpoolFixture.Run("orders", 2));
        var second = Directory.GetFiles(spool.RunsDirectory).Order(StringComparer.Ordinal).ElementAt(1);
        var bytes = File.ReadAllBytes(second);
        File.WriteAllBytes(second, bytes[..(bytes.Length / 2)]);

        var restarted = _fixture.OpenSpool();
        var hours = new List<int>();
        while (restarted.Peek() is { } entry)
        {
            hours.Add((int)(entry.Run.StartedAt - SpoolFixture.T0).TotalHours);
            restarted.Remove(entry);
        }

        Assert.Equal([0, 2], hours);
        Assert.Equal(1, restarted.Status.UnreadableFiles);
        Assert.True(File.Exists(Path.Combine(restarted.UnreadableDirectory, Path.GetFileName(second))));
        var warning = Assert.Single(_fixture.SpoolLog.Lines, l => l.Level == LogLevel.Warning && l.Message.Contains("cannot be read", StringComparison.Ordinal));
        Assert.Contains(Path.GetFileName(second), warning.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Open_LeftoverTempFiles_PromotesTheWholeOneAndSetsAsideTheTruncatedOne()
    {
        var spool = _fixture.OpenSpool();
        spool.TryAppend(SpoolFixture.Run("orders", 0));
        var first = Directory.GetFiles(spool.RunsDirectory).Single();
        // A crash after the fsync but before the rename, and one during the write.
        File.WriteAllBytes(Path.Combine(spool.RunsDirectory, "000000000002.json.tmp"), SpoolFileFormat.Encode(SpoolFixture.Run("orders", 1)));
        File.WriteAllBytes(Path.Combine(spool.RunsDirectory, "000000000003.json.tmp"), File.ReadAllBytes(first)[..40]);

        var restarted = _fixture.OpenSpool();

        Assert.Equal(2, restarted.Count);
        Assert.Equal(1, restarted.Status.UnreadableFiles);
        Assert.Empty(Directory.GetFiles(restarted.RunsDirectory, "*.tmp"));
    }

    [Fact]
    public void Encode_ThenDecode_GivesBackEveryPartOfTheRun()
    {
        var run = SpoolFixture.Run("orders", 5) with { JudgedAgainst = null };

        var back = SpoolFileFormat.DecodeRun(SpoolFileFormat.Encode(run));

        // Compared through the store's own JSON of each part: what the store would write from either.
        Assert.Equal((run.Pair, run.StartedAt, run.FinishedAt, run.Status, run.SampleMethod, run.RunKey), (back.Pair, back.StartedAt, back.FinishedAt, back.Status, back.SampleMethod, back.RunKey));
        Assert.Equal(StoreJson.Serialize(run.Profile), StoreJson.Serialize(back.Profile));
        Assert.Equal(StoreJson.Serialize(run.SourceFigures), StoreJson.Serialize(back.SourceFigures));
        Assert.Equal(run.Points!.X, back.Points!.X);
        Assert.Equal(run.Points.Y, back.Points.Y);
        var finding = Assert.Single(back.Findings);
        Assert.Equal(run.Findings[0].Message, finding.Message);
        Assert.True(double.IsNaN(finding.Effect!.Value));
        Assert.Equal(0.004, finding.PValue);
    }

    [Fact]
    public void DecodeRun_NotJson_ThrowsFormatExceptionNamingThePosition()
    {
        var ex = Assert.Throws<FormatException>(() => SpoolFileFormat.DecodeRun("{\"format\": 1, \"run\": {"u8.ToArray()));
        Assert.IsType<JsonException>(ex.InnerException);
    }

    public void Dispose() => _fixture.Dispose();
}
