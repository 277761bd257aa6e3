namespace DriftWatch.Calibration.Generation;

/// <summary>
/// The fixed character of one healthy pair, drawn once from its seed; <see cref="DayGenerator"/> adds the
/// day-to-day variation. Members a family does not use keep their defaults.
/// </summary>
/// <param name="Variant">Families with two flavours (curved, discrete) use 0 or 1.</param>
/// <param name="Slope">b of the linear part (for the saturating curve: the amplitude A).</param>
/// <param name="NoiseSd">The residual SD before the day's ±10 %.</param>
/// <param name="BaseRows">The day's rows before the day's ±30 %.</param>
/// <param name="MinRows">Daily sizes are clamped to [MinRows, MaxRows] (the crossing family stays within 35k–70k).</param>
internal sealed record PairShape(
    HealthyFamily Family,
    int Variant,
    double Intercept,
    double Slope,
    double NoiseSd,
    double XMean,
    double XSd,
    int BaseRows,
    int MinRows,
    int MaxRows)
{
    /// <summary>The day's table size varies by ±this share (0.3: the ±30 % of real loads).</summary>
    public double SizeJitter { get; init; } = 0.3;

    /// <summary>Curved, quadratic: y gains Curvature·|b|·XSd·u² with u = (x − XMean)/XSd.</summary>
    public double Curvature { get; init; }

    /// <summary>Curved, saturating: h in a + A·ln(1 + x/h).</summary>
    public double Saturation { get; init; }

    /// <summary>Discrete, counts: the Poisson mean of the item count.</summary>
    public double Lambda { get; init; }

    /// <summary>Skewed: share of exact zeros in x, and the lognormal's μ and σ.</summary>
    public double ZeroShare { get; init; }

    public double LogMu { get; init; }

    public double LogSigma { get; init; }

    /// <summary>Weekly volume: the weekend day's share of a weekday's rows.</summary>
    public double WeekendShare { get; init; } = 1;

    /// <summary>Weekly level: x's mean rises by this many SDs on Mondays and Fridays.</summary>
    public double LevelLift { get; init; }
}
