using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// The alert state machine, per (pair, finding kind): watching → confirmed → cleared. Pure: the caller loads
/// the open states and snoozes, passes the clock, and stores the decision with its outbox rows in one
/// transaction. Run the outcomes through <see cref="FalseDiscoveryControl.FilterCycle"/> first.
/// <list type="bullet">
/// <item>A kind is confirmed once it was seen in <see cref="AlertingConfig.CriticalConfirmRuns"/> (critical) or
/// <see cref="AlertingConfig.WarningConfirmRuns"/> (warning) successful runs in a row. Info is never confirmed: it
/// stays watching, for the dashboard.</item>
/// <item>check_failing is critical (a pair that cannot be checked is watched by nobody) and is confirmed after
/// <see cref="AlertingConfig.CheckFailingAfter"/> failed or unmeasurable checks in a row; that count is its confirm runs.</item>
/// <item>An info sighting of an alert that is already confirmed keeps it open at its severity, without a notice: a known state.</item>
/// <item>A successful run without the kind clears it; an all-clear notice goes out only for alerts people were told about.</item>
/// <item>A failed or unmeasurable check leaves the pair's other alerts as they were: nothing was learnt about them.
/// (An empty window must never close an alert: "no rows" is not "the fault went away".)</item>
/// <item>Reminder: a confirmed, unacknowledged alert seen again in this run whose last notice is at least
/// <see cref="AlertingConfig.RemindEvery"/> old. Escalation (warning to critical while confirmed) notifies at once,
/// acknowledged or not, because it is news.</item>
/// <item>Snoozed pair: states move as usual, nothing is notified. A confirmed alert nobody heard of is announced
/// (as confirmed) at the first run that sees it again after the snooze ends.</item>
/// </list>
/// </summary>
public static class AlertLifecycle
{
    public static CycleDecision Evaluate(
        IReadOnlyList<PairOutcome> outcomes,
        IReadOnlyList<AlertState> current,
        IReadOnlyDictionary<string, DateTimeOffset> snoozedUntil,
        AlertingConfig config,
        DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(outcomes);
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(snoozedUntil);
        ArgumentNullException.ThrowIfNull(config);

        var open = new Dictionary<(string Pair, FindingKind Kind), Slot>();
        foreach (var state in current.Where(s => s.IsOpen))
        {
            // The store keeps one open alert per (pair, kind); should two slip through, the newer one wins.
            var key = (state.Pair, state.Kind);
            if (!open.TryGetValue(key, out var existing) || existing.State.FirstSeen <= state.FirstSeen)
            {
                open[key] = new Slot(state);
            }
        }

        var touched = new List<Slot>();
        foreach (var outcome in outcomes)
        {
            var snoozed = snoozedUntil.TryGetValue(outcome.Pair, out var until) && until > now;
            if (outcome.Succeeded)
            {
                ApplySuccess(outcome, open, touched, snoozed, config, now);
            }
            else
            {
                ApplyFailure(outcome, open, touched, snoozed, config, now);
            }
        }

        var distinct = touched.Distinct().ToArray();
        var changes = distinct.Select(s => s.State).ToArray();
        var notifications = distinct
            .Where(s => s.Notification is not null)
            .Select(s => new AlertNotification(s.State, s.Notification!.Value))
            .ToArray();
        return new CycleDecision(now, changes, notifications);
    }

    private static void ApplySuccess(PairOutcome outcome, Dictionary<(string, FindingKind), Slot> open, List<Slot> touched, bool snoozed, AlertingConfig config, DateTimeOffset now)
    {
        // Several findings of one kind in one run make one alert, carrying the worst of them.
        var byKind = outcome.Findings
            .Where(f => f.Kind != FindingKind.CheckFailing)
            .GroupBy(f => f.Kind)
            .ToDictionary(g => g.Key, g => g.OrderByDescending(f => f.Severity).First());

        foreach (var (kind, finding) in byKind)
        {
            // An info sighting of an alert people were already told about confirms a known state (an exact pair
            // whose baseline is exact too): the alert stays open at its severity and is not announced again.
            if (finding.Severity == Severity.Info && open.TryGetValue((outcome.Pair, kind), out var known) && known.State.Status == AlertStatus.Confirmed)
            {
                Observe(open, touched, outcome.Pair, kind, known.State.Severity, finding.Message, outcome.RunId, now);
                continue;
            }

            var slot = Observe(open, touched, outcome.Pair, kind, finding.Severity, finding.Message, outcome.RunId, now);
            var confirmRuns = finding.Severity == Severity.Critical ? config.CriticalConfirmRuns : config.WarningConfirmRuns;
            MaybeConfirm(slot, Math.Max(1, confirmRuns), now);
            DecideNotice(slot, snoozed, config, now);
        }

        foreach (var slot in open.Values.Where(s => s.State.Pair == outcome.Pair && !byKind.ContainsKey(s.State.Kind)).ToArray())
        {
            Clear(slot, outcome.RunId, snoozed, now);
            open.Remove((slot.State.Pair, slot.State.Kind));
            touched.Add(slot);
        }
    }

    private static void ApplyFailure(PairOutcome outcome, Dictionary<(string, FindingKind), Slot> open, List<Slot> touched, bool snoozed, AlertingConfig config, DateTimeOffset now)
    {
        var message = string.IsNullOrWhiteSpace(outcome.Error) ? "The check failed." : outcome.Error;
        var slot = Observe(open, touched, outcome.Pair, FindingKind.CheckFailing, Severity.Critical, message, outcome.RunId, now);

        // The monitor's count from the history is authoritative (it survives alerts being cleared by hand).
        if (outcome.ConsecutiveFailures > 0)
        {
            slot.State = slot.State with { ConsecutiveRuns = outcome.ConsecutiveFailures };
        }

        MaybeConfirm(slot, Math.Max(1, config.CheckFailingAfter), now);
        DecideNotice(slot, snoozed, config, now);
    }

    private static Slot Observe(Dictionary<(string, FindingKind), Slot> open, List<Slot> touched, string pair, FindingKind kind, Severity severity, string message, long? runId, DateTimeOffset now)
    {
        if (open.TryGetValue((pair, kind), out var slot))
        {
            slot.Previous = slot.State;
            slot.State = slot.State with
            {
                Severity = severity,
                ConsecutiveRuns = slot.State.ConsecutiveRuns + 1,
                LastSeen = now,
                Message = message,
                LastRunId = runId ?? slot.State.LastRunId,
            };
        }
        else
        {
            slot = new Slot(new AlertState(0, pair, kind, severity, AlertStatus.Watching, 1, now, now, null, null, null, null, message, runId))
            {
                Previous = null,
            };
            open[(pair, kind)] = slot;
        }

        touched.Add(slot);
        return slot;
    }

    private static void MaybeConfirm(Slot slot, int confirmRuns, DateTimeOffset now)
    {
        var state = slot.State;
        if (state.Status == AlertStatus.Watching && state.Severity >= Severity.Warning && state.ConsecutiveRuns >= confirmRuns)
        {
            slot.State = state with { Status = AlertStatus.Confirmed, ConfirmedAt = now };
        }
    }

    private static void DecideNotice(Slot slot, bool snoozed, AlertingConfig config, DateTimeOffset now)
    {
        var state = slot.State;
        if (snoozed || state.Status != AlertStatus.Confirmed || state.Severity < Severity.Warning)
        {
            return;
        }

        NotificationKind? kind;
        if (state.LastNotifiedAt is null)
        {
            kind = state.IsAcked ? null : NotificationKind.Confirmed;
        }
        else if (slot.Previous is { Status: AlertStatus.Confirmed } previous && state.Severity > previous.Severity)
        {
            kind = NotificationKind.Escalated;
        }
        else if (!state.IsAcked && now - state.LastNotifiedAt.Value >= config.RemindEvery)
        {
            kind = NotificationKind.Reminder;
        }
        else
        {
            kind = null;
        }

        if (kind is not null)
        {
            slot.State = state with { LastNotifiedAt = now };
            slot.Notification = kind;
        }
    }

    private static void Clear(Slot slot, long? runId, bool snoozed, DateTimeOffset now)
    {
        var wasNotified = slot.State.LastNotifiedAt is not null;
        slot.Previous = slot.State;
        slot.State = slot.State with
        {
            Status = AlertStatus.Cleared,
            ClearedAt = now,
            LastRunId = runId ?? slot.State.LastRunId,
        };
        slot.Notification = wasNotified && !snoozed ? NotificationKind.Cleared : null;
    }

    private sealed class Slot(AlertState state)
    {
        public AlertState State { get; set; } = state;

        /// <summary>The state before this cycle's latest observation; null for an alert new in this cycle.</summary>
        public AlertState? Previous { get; set; } = state;

        public NotificationKind? Notification { get; set; }
    }
}
