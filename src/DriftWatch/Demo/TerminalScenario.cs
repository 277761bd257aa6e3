using DriftWatch.Core.Findings;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Demo;

/// <summary>
/// The demo's invented scenario: the daily operations feed of Larkspur Inland Terminal, a fictional inland
/// container terminal. Six tables, one per watched pair, each loaded once a day; five of the pairs are
/// broken on purpose from a given day on, one (cranes) is the control that must stay silent, and on
/// <see cref="RenameDay"/> one table is renamed upstream so its checks start failing.
/// Every value comes from a <see cref="Random"/> seeded with <see cref="Seed"/>, the pair and the day, so a
/// day's load is the same in every run and does not depend on how many days are simulated.
/// </summary>
internal static class TerminalScenario
{
    public const string TerminalName = "Larkspur Inland Terminal";
    public const int Seed = 20261101;
    public const int DefaultDays = 21;
    public const int BaselineRuns = 5;

    /// <summary>Day 1. Loads are recorded between 06:00 and 22:00; the daily check runs at <see cref="CheckTimeOfDay"/>.</summary>
    public static readonly DateTimeOffset FirstDay = new(2026, 11, 1, 0, 0, 0, TimeSpan.Zero);

    public static readonly TimeSpan CheckTimeOfDay = new(23, 30, 0);

    public static readonly ScenarioPair Cranes = new(
        "crane-hours-vs-moves", "crane_shifts", "shift_end", "crane_hours", "container_moves", 600,
        "about 27 moves per crane hour (linear, strong)");

    public static readonly ScenarioPair Weights = new(
        "declared-vs-weighed", "gate_weighings", "weighed_at", "declared_weight_kg", "weighed_weight_kg", 1500,
        "the bridge weighs what the shipper declared, within about 250 kg (strong)");

    public static readonly ScenarioPair Trucks = new(
        "truck-km-vs-fuel", "truck_trips", "arrived_at", "truck_km", "fuel_liters", 800,
        "about 0.31 litres per km (linear)");

    public static readonly ScenarioPair Vessels = new(
        "vessel-teu-vs-discharged", "vessel_discharges", "completed_at", "vessel_teu", "containers_discharged", 300,
        "bigger barges discharge more boxes (strong)");

    public static readonly ScenarioPair Reefers = new(
        "reefer-count-vs-power", "reefer_readings", "read_at", "reefer_count", "power_kwh", 720,
        "about 4.2 kWh per plugged-in reefer (linear)");

    public static readonly ScenarioPair Yard = new(
        "yard-occupancy-vs-gate-wait", "gate_events", "gate_in_at", "yard_occupancy_pct", "gate_wait_minutes", 1000,
        "a fuller yard means slightly longer waits (near-linear)");

    public static IReadOnlyList<ScenarioPair> Pairs { get; } = [Cranes, Weights, Trucks, Vessels, Reefers, Yard];

    /// <summary>The control pair: nothing is injected, and any finding at warning or worse on it is a false alarm.</summary>
    public static ScenarioPair Control => Cranes;

    public const int RenameDay = 19;

    /// <summary>The renamed table's pair: its own fault (day 15) is caught days before the rename hides the table.</summary>
    public static ScenarioPair RenamedPair => Reefers;

    public const string RenamedTo = "reefer_power_readings";

    public const double SentinelValue = 99999;
    public const double SentinelShare = 0.05;
    public const double KmPerMile = 1.609344;

    public static IReadOnlyList<ScenarioFault> Faults { get; } =
    [
        new(Weights.Name, 8, "join bug copies declared into weighed", FindingKind.BecamePerfect),
        new(Trucks.Name, 11, "feed switches distance to miles", FindingKind.SlopeShift),
        new(Vessels.Name, 13, "key misalignment shuffles rows", FindingKind.RelationshipLost),
        new(Reefers.Name, 15, "5% of readings become 99999", FindingKind.OutlierSurge),
        new(Yard.Name, 17, "congestion, waits grow non-linearly", FindingKind.CurvatureAppeared),
        new(Reefers.Name, RenameDay, "table renamed upstream", FindingKind.CheckFailing),
    ];

    /// <summary>Midnight (UTC) of a simulated day, day 1 being <see cref="FirstDay"/>.</summary>
    public static DateTimeOffset DateOf(int day) => FirstDay.AddDays(day - 1);

    /// <summary>When the day's check runs: after the day's load, so the 24-hour window holds exactly that load.</summary>
    public static DateTimeOffset CheckTimeOf(int day) => DateOf(day) + CheckTimeOfDay;

    /// <summary>The simulated day a check time falls on.</summary>
    public static int DayOf(DateTimeOffset at) => (int)Math.Floor((at.ToUniversalTime() - FirstDay).TotalDays) + 1;

    /// <summary>The physical table a pair's rows go into on a day (the renamed one from <see cref="RenameDay"/>).</summary>
    public static string TableOn(ScenarioPair pair, int day) =>
        pair == RenamedPair && day >= RenameDay ? RenamedTo : pair.Table;

    /// <summary>One day's load of one pair, faults included, ordered by time.</summary>
    public static IReadOnlyList<ScenarioRow> RowsFor(ScenarioPair pair, int day)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var index = IndexOf(pair);
        var random = new Random(unchecked(Seed + (7919 * (index + 1)) + (104729 * day)));
        var n = pair.RowsPerDay;
        var times = new DateTimeOffset[n];
        for (var i = 0; i < n; i++)
        {
            // Whole seconds between 06:00 and 22:00: the stored text has no fractions.
            times[i] = DateOf(day).AddHours(6).AddSeconds(Math.Floor(ContinuousUniform.Sample(random, 0, 16 * 3600)));
        }

        Array.Sort(times);
        var values = index switch
        {
            0 => CraneShifts(random, n),
            1 => GateWeighings(random, n, day),
            2 => TruckTrips(random, n, day),
            3 => VesselDischarges(random, n, day),
            4 => ReeferReadings(random, n, day),
            _ => GateEvents(random, n, day),
        };
        var rows = new ScenarioRow[n];
        for (var i = 0; i < n; i++)
        {
            rows[i] = new ScenarioRow(times[i], values[i].X, values[i].Y);
        }

        return rows;
    }

    private static int IndexOf(ScenarioPair pair)
    {
        for (var i = 0; i < Pairs.Count; i++)
        {
            if (Pairs[i] == pair)
            {
                return i;
            }
        }

        throw new ArgumentException($"'{pair.Name}' is not a pair of the scenario.", nameof(pair));
    }

    private static bool FaultActive(ScenarioPair pair, int day) =>
        Faults.Any(f => f.Pair == pair.Name && f.Expected != FindingKind.CheckFailing && day >= f.Day);

    private static (double X, double Y)[] CraneShifts(Random random, int n)
    {
        var rows = new (double, double)[n];
        for (var i = 0; i < n; i++)
        {
            var hours = Math.Round(ContinuousUniform.Sample(random, 2, 12), 2);
            var moves = Math.Max(0, Math.Round((27 * hours) + Normal.Sample(random, 0, 12)));
            rows[i] = (hours, moves);
        }

        return rows;
    }

    private static (double X, double Y)[] GateWeighings(Random random, int n, int day)
    {
        var copied = FaultActive(Weights, day);
        var rows = new (double, double)[n];
        for (var i = 0; i < n; i++)
        {
            var declared = Math.Round(ContinuousUniform.Sample(random, 4000, 30000) / 10) * 10;
            // Declarations are estimates and the bridge has its own error: together about 250 kg either way.
            var weighed = Math.Round((declared + Normal.Sample(random, 0, 250)) / 10) * 10;
            rows[i] = (declared, copied ? declared : weighed);
        }

        return rows;
    }

    private static (double X, double Y)[] TruckTrips(Random random, int n, int day)
    {
        var miles = FaultActive(Trucks, day);
        var rows = new (double, double)[n];
        for (var i = 0; i < n; i++)
        {
            var km = ContinuousUniform.Sample(random, 15, 400);
            var litres = Math.Round(2 + (0.31 * km) + Normal.Sample(random, 0, 5), 1);
            rows[i] = (Math.Round(miles ? km / KmPerMile : km, 1), litres);
        }

        return rows;
    }

    private static (double X, double Y)[] VesselDischarges(Random random, int n, int day)
    {
        var teu = new double[n];
        var discharged = new double[n];
        for (var i = 0; i < n; i++)
        {
            teu[i] = Math.Round(ContinuousUniform.Sample(random, 80, 400));
            discharged[i] = Math.Max(0, Math.Round((0.45 * teu[i]) + Normal.Sample(random, 0, 12)));
        }

        if (FaultActive(Vessels, day))
        {
            // The join now matches each call with another call's discharge report.
            random.Shuffle(discharged);
        }

        return [.. teu.Zip(discharged)];
    }

    private static (double X, double Y)[] ReeferReadings(Random random, int n, int day)
    {
        var rows = new (double X, double Y)[n];
        for (var i = 0; i < n; i++)
        {
            var count = (double)DiscreteUniform.Sample(random, 10, 180);
            rows[i] = (count, Math.Round((4.2 * count) + Normal.Sample(random, 0, 20), 1));
        }

        if (FaultActive(Reefers, day))
        {
            // A meter that cannot be read now reports 99999 instead of nothing.
            var broken = Enumerable.Range(0, n).ToArray();
            random.Shuffle(broken);
            foreach (var i in broken.Take((int)Math.Round(SentinelShare * n)))
            {
                rows[i] = (rows[i].X, SentinelValue);
            }
        }

        return rows;
    }

    private static (double X, double Y)[] GateEvents(Random random, int n, int day)
    {
        var congested = FaultActive(Yard, day);
        var rows = new (double, double)[n];
        for (var i = 0; i < n; i++)
        {
            var occupancy = Math.Round(ContinuousUniform.Sample(random, 35, 95), 1);
            var wait = 4 + (0.25 * occupancy) + Normal.Sample(random, 0, 2.5);
            if (congested)
            {
                // Above two thirds full, every extra point of occupancy costs more than the one before.
                var over = Math.Max(0, occupancy - 65);
                wait += 0.02 * over * over;
            }

            rows[i] = (occupancy, Math.Max(0, Math.Round(wait, 1)));
        }

        return rows;
    }
}
