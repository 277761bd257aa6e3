namespace DriftWatch.Demo;

/// <summary>One row of a day's load: when it was recorded (UTC) and its two values.</summary>
internal readonly record struct ScenarioRow(DateTimeOffset At, double X, double Y);
