using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Tests.Alerting;

// The lifecycle rules under test are DriftWatch's own specification (docs and AlertingConfig defaults);
// confirming a signal over runs in a row and repeating unanswered notices are common practice, the numbers are ours.
public sealed class AlertLifecycleTests
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 2, 8, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Evaluate_CriticalFinding_IsConfirmedOnTheFirstRun()
    {
        var driver = new Driver();

        var decision = driver.Run(T0, Ok("orders", Critical(FindingKind.BecamePerfect)));

        var alert = Assert.Single(decision.Changes);
        Assert.Equal(AlertStatus.Confirmed, alert.Status);
        Assert.Equal(T0, alert.ConfirmedAt);
        Assert.Equal(T0, alert.LastNotifiedAt);
        var notice = Assert.Single(decision.Notifications);
        Assert.Equal(NotificationKind.Confirmed, notice.Kind);
        Assert.Same(alert, notice.Alert);
    }

    [Fact]
    public void Evaluate_Warning_IsWatchedForOneRunAndConfirmedOnTheSecond()
    {
        var driver = new Driver();

        var first = driver.Run(T0, Ok("orders", Warning(FindingKind.SlopeShift)));
        var second = driver.Run(T0.AddHours(1), Ok("orders", Warning(FindingKind.SlopeShift)));

        Assert.Equal(AlertStatus.Watching, Assert.Single(first.Changes).Status);
        Assert.Empty(first.Notifications);
        var confirmed = Assert.Single(second.Changes);
        Assert.Equal(AlertStatus.Confirmed, confirmed.Status);
        Assert.Equal(2, confirmed.ConsecutiveRuns);
        Assert.Equal(T0, confirmed.FirstSeen);
        Assert.Equal(NotificationKind.Confirmed, Assert.Single(second.Notifications).Kind);
    }

    [Fact]
    public void Evaluate_WarningConfirmRunsThree_ConfirmsOnlyOnTheThirdRun()
    {
        var driver = new Driver(new AlertingConfig { WarningConfirmRuns = 3 });

        var runs = Enumerable.Range(0, 3).Select(i => driver.Run(T0.AddHours(i), Ok("orders", Warning(FindingKind.SlopeShift)))).ToArray();

        Assert.Equal([0, 0, 1], runs.Select(r => r.Notifications.Count));
    }

    [Fact]
    public void Evaluate_WatchedWarningThenCleanRun_ClearsQuietly()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Warning(FindingKind.SlopeShift)));

        var clean = driver.Run(T0.AddHours(1), Ok("orders"));

        var cleared = Assert.Single(clean.Changes);
        Assert.Equal(AlertStatus.Cleared, cleared.Status);
        Assert.Equal(T0.AddHours(1), cleared.ClearedAt);
        Assert.Empty(clean.Notifications);
    }

    [Fact]
    public void Evaluate_InfoFinding_IsNeverConfirmedNorNotified()
    {
        var driver = new Driver();

        var runs = Enumerable.Range(0, 5).Select(i => driver.Run(T0.AddDays(i), Ok("orders", new Finding(FindingKind.Curvature, Severity.Info, 0.001, 0.03, "slight bend")))).ToArray();

        Assert.All(runs, r => Assert.Empty(r.Notifications));
        var last = Assert.Single(runs[^1].Changes);
        Assert.Equal(AlertStatus.Watching, last.Status);
        Assert.Equal(5, last.ConsecutiveRuns);
    }

    [Fact]
    public void Evaluate_StillConfirmed_RemindsOnlyOnceTheIntervalHasPassed()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));

        var early = driver.Run(T0.AddHours(23), Ok("orders", Critical(FindingKind.SignFlip)));
        var due = driver.Run(T0.AddHours(24), Ok("orders", Critical(FindingKind.SignFlip)));
        var afterReminder = driver.Run(T0.AddHours(30), Ok("orders", Critical(FindingKind.SignFlip)));

        Assert.Empty(early.Notifications);
        var reminder = Assert.Single(due.Notifications);
        Assert.Equal(NotificationKind.Reminder, reminder.Kind);
        Assert.Equal(T0.AddHours(24), reminder.Alert.LastNotifiedAt);
        Assert.Equal(T0, reminder.Alert.ConfirmedAt);
        Assert.Empty(afterReminder.Notifications);
    }

    [Fact]
    public void Evaluate_CleanRunAfterTheInterval_SendsAllClearNotReminder()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));

        var clean = driver.Run(T0.AddHours(25), Ok("orders"));

        var notice = Assert.Single(clean.Notifications);
        Assert.Equal(NotificationKind.Cleared, notice.Kind);
        Assert.Equal(AlertStatus.Cleared, notice.Alert.Status);
        Assert.Equal(T0.AddHours(25), notice.Alert.ClearedAt);
        Assert.Empty(driver.Open);
    }

    [Fact]
    public void Evaluate_KindReturnsAfterClearing_OpensANewAlert()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));
        driver.Run(T0.AddHours(1), Ok("orders"));

        var again = driver.Run(T0.AddHours(2), Ok("orders", Critical(FindingKind.SignFlip)));

        var alert = Assert.Single(again.Changes);
        Assert.Equal(0, alert.Id);
        Assert.Equal(T0.AddHours(2), alert.FirstSeen);
        Assert.Equal(NotificationKind.Confirmed, Assert.Single(again.Notifications).Kind);
        Assert.Equal(2, driver.All.Count);
    }

    [Fact]
    public void Evaluate_SnoozedPair_TracksStateButNotifiesNothing_ThenAnnouncesAfterTheSnooze()
    {
        var driver = new Driver();
        driver.Snooze("orders", T0.AddHours(12));

        var during = driver.Run(T0, Ok("orders", Critical(FindingKind.BecamePerfect)));
        var after = driver.Run(T0.AddHours(13), Ok("orders", Critical(FindingKind.BecamePerfect)));

        var tracked = Assert.Single(during.Changes);
        Assert.Equal(AlertStatus.Confirmed, tracked.Status);
        Assert.Null(tracked.LastNotifiedAt);
        Assert.Empty(during.Notifications);
        Assert.Equal(NotificationKind.Confirmed, Assert.Single(after.Notifications).Kind);
    }

    [Fact]
    public void Evaluate_SnoozedPair_ClearsWithoutAllClearNotice()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.BecamePerfect)));
        driver.Snooze("orders", T0.AddDays(1));

        var clean = driver.Run(T0.AddHours(2), Ok("orders"));

        Assert.Equal(AlertStatus.Cleared, Assert.Single(clean.Changes).Status);
        Assert.Empty(clean.Notifications);
    }

    [Fact]
    public void Evaluate_SnoozeOfAnotherPair_DoesNotSuppress()
    {
        var driver = new Driver();
        driver.Snooze("invoices", T0.AddDays(1));

        var decision = driver.Run(T0, Ok("orders", Critical(FindingKind.BecamePerfect)));

        Assert.Single(decision.Notifications);
    }

    [Fact]
    public void Evaluate_AcknowledgedAlert_GetsNoReminderButStillClearsWithNotice()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));
        driver.Ack("orders", FindingKind.SignFlip, T0.AddHours(1));

        var later = driver.Run(T0.AddHours(48), Ok("orders", Critical(FindingKind.SignFlip)));
        var clean = driver.Run(T0.AddHours(49), Ok("orders"));

        Assert.Empty(later.Notifications);
        Assert.Equal(AlertStatus.Confirmed, Assert.Single(later.Changes).Status);
        var notice = Assert.Single(clean.Notifications);
        Assert.Equal(NotificationKind.Cleared, notice.Kind);
        Assert.Equal(T0.AddHours(1), notice.Alert.AckedAt);
    }

    [Fact]
    public void Evaluate_ConfirmedWarningBecomesCritical_NotifiesEscalationAtOnce()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Warning(FindingKind.CorrelationShift)));
        driver.Run(T0.AddHours(1), Ok("orders", Warning(FindingKind.CorrelationShift)));

        var worse = driver.Run(T0.AddHours(2), Ok("orders", Critical(FindingKind.CorrelationShift)));

        var notice = Assert.Single(worse.Notifications);
        Assert.Equal(NotificationKind.Escalated, notice.Kind);
        Assert.Equal(Severity.Critical, notice.Alert.Severity);
    }

    [Fact]
    public void Evaluate_SeveralFindingsOfOneKind_MakeOneAlertWithTheWorst()
    {
        var driver = new Driver();

        var decision = driver.Run(T0, Ok("orders", Warning(FindingKind.Outliers, "few"), Critical(FindingKind.Outliers, "many")));

        var alert = Assert.Single(decision.Changes);
        Assert.Equal(Severity.Critical, alert.Severity);
        Assert.Equal("many", alert.Message);
    }

    [Fact]
    public void Evaluate_CheckFailing_IsConfirmedAfterKFailuresAndClearsOnSuccess()
    {
        var driver = new Driver(new AlertingConfig { CheckFailingAfter = 3 });

        var failures = Enumerable.Range(1, 3).Select(k => driver.Run(T0.AddHours(k), PairOutcome.Failure("orders", k, k, $"timeout #{k}"))).ToArray();
        var success = driver.Run(T0.AddHours(4), Ok("orders"));

        Assert.Equal([0, 0, 1], failures.Select(f => f.Notifications.Count));
        var confirmed = failures[2].Notifications[0].Alert;
        Assert.Equal(FindingKind.CheckFailing, confirmed.Kind);
        Assert.Equal(Severity.Critical, confirmed.Severity);
        Assert.Equal(3, confirmed.ConsecutiveRuns);
        Assert.Equal("timeout #3", confirmed.Message);
        var recovery = Assert.Single(success.Notifications);
        Assert.Equal(NotificationKind.Cleared, recovery.Kind);
        Assert.Equal(FindingKind.CheckFailing, recovery.Alert.Kind);
    }

    [Fact]
    public void Evaluate_FailedCheck_LeavesThePairsOtherAlertsAlone()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));

        var failed = driver.Run(T0.AddHours(30), PairOutcome.Failure("orders", 9, 1, "connection refused"));

        var change = Assert.Single(failed.Changes);
        Assert.Equal(FindingKind.CheckFailing, change.Kind);
        Assert.Equal(AlertStatus.Watching, change.Status);
        Assert.Empty(failed.Notifications);
        Assert.Contains(driver.Open, a => a.Kind == FindingKind.SignFlip && a.Status == AlertStatus.Confirmed);
    }

    [Fact]
    public void Evaluate_UnmeasurableChecks_NeverClearAnOpenCriticalAndConfirmCheckFailingAfterK()
    {
        // An empty window says nothing about the fault: the notified sign_flip must stay confirmed through every
        // unmeasurable check, while check_failing counts those checks exactly like failed ones.
        var driver = new Driver(new AlertingConfig { CheckFailingAfter = 3 });
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));

        var empties = Enumerable.Range(1, 3)
            .Select(k => driver.Run(T0.AddHours(k), PairOutcome.Unmeasurable("orders", 10 + k, k, "No rows in the window: there is nothing to measure of y against x.")))
            .ToArray();

        Assert.All(empties, d => Assert.DoesNotContain(d.Changes, c => c.Status == AlertStatus.Cleared));
        Assert.All(empties, d => Assert.DoesNotContain(d.Notifications, n => n.Kind == NotificationKind.Cleared));
        Assert.Contains(driver.Open, a => a.Kind == FindingKind.SignFlip && a.Status == AlertStatus.Confirmed);
        Assert.Equal([0, 0, 1], empties.Select(d => d.Notifications.Count));
        var failing = Assert.Single(empties[^1].Notifications).Alert;
        Assert.Equal(FindingKind.CheckFailing, failing.Kind);
        Assert.Equal(Severity.Critical, failing.Severity);
        Assert.Equal(3, failing.ConsecutiveRuns);
        Assert.Equal("The check ran but could not measure the pair: No rows in the window: there is nothing to measure of y against x.", failing.Message);
    }

    [Fact]
    public void Evaluate_SucceededRunAfterUnmeasurable_ClearsCheckFailing()
    {
        var driver = new Driver(new AlertingConfig { CheckFailingAfter = 1 });
        driver.Run(T0, PairOutcome.Unmeasurable("orders", 1, 1, "Only 4 usable rows."));

        var back = driver.Run(T0.AddHours(1), Ok("orders"));

        var cleared = Assert.Single(back.Changes);
        Assert.Equal(FindingKind.CheckFailing, cleared.Kind);
        Assert.Equal(AlertStatus.Cleared, cleared.Status);
        Assert.Equal(NotificationKind.Cleared, Assert.Single(back.Notifications).Kind);
    }

    [Fact]
    public void Evaluate_FailedThenUnmeasurable_CountTogether()
    {
        // The monitor counts both kinds in one streak; the lifecycle takes its count as the confirm runs.
        var driver = new Driver(new AlertingConfig { CheckFailingAfter = 2 });

        var failed = driver.Run(T0, PairOutcome.Failure("orders", 1, 1, "connection refused"));
        var empty = driver.Run(T0.AddHours(1), PairOutcome.Unmeasurable("orders", 2, 2, "No rows in the window."));

        Assert.Empty(failed.Notifications);
        Assert.Equal(NotificationKind.Confirmed, Assert.Single(empty.Notifications).Kind);
        Assert.Equal(2, Assert.Single(empty.Changes).ConsecutiveRuns);
    }

    [Fact]
    public void Evaluate_OnlyPairsInTheCycle_AreTouched()
    {
        var driver = new Driver();
        driver.Run(T0, Ok("orders", Critical(FindingKind.SignFlip)));

        var other = driver.Run(T0.AddHours(1), Ok("invoices"));

        Assert.Empty(other.Changes);
        Assert.Single(driver.Open);
    }

    private static PairOutcome Ok(string pair, params Finding[] findings) => PairOutcome.Success(pair, 1, findings);

    private static Finding Critical(FindingKind kind, string message = "critical change") => new(kind, Severity.Critical, null, 1.0, message);

    private static Finding Warning(FindingKind kind, string message = "warning change") => new(kind, Severity.Warning, 0.001, 0.3, message);

    /// <summary>Plays the store's part: keeps states between cycles, assigns ids, records acks and snoozes.</summary>
    private sealed class Driver(AlertingConfig? config = null)
    {
        private readonly AlertingConfig _config = config ?? new AlertingConfig();
        private readonly Dictionary<string, DateTimeOffset> _snoozes = [];
        private long _nextId = 1;

        public List<AlertState> All { get; } = [];

        public IReadOnlyList<AlertState> Open => [.. All.Where(a => a.IsOpen)];

        public CycleDecision Run(DateTimeOffset now, params PairOutcome[] outcomes)
        {
            var decision = AlertLifecycle.Evaluate(outcomes, Open, _snoozes, _config, now);
            foreach (var state in decision.Changes)
            {
                if (state.Id == 0)
                {
                    All.Add(state with { Id = _nextId++ });
                }
                else
                {
                    All[All.FindIndex(a => a.Id == state.Id)] = state;
                }
            }

            return decision;
        }

        public void Snooze(string pair, DateTimeOffset until) => _snoozes[pair] = until;

        public void Ack(string pair, FindingKind kind, DateTimeOffset at)
        {
            var index = All.FindIndex(a => a.IsOpen && a.Pair == pair && a.Kind == kind);
            All[index] = All[index] with { AckedAt = at };
        }
    }
}
