namespace DriftWatch.Calibration.Generation;

/// <summary>The kinds of healthy pair the suite simulates; each is a property of real data, not a fault.</summary>
internal enum HealthyFamily
{
    LinearNormal,
    HeavyTails,
    Heteroscedastic,
    Curved,
    Discrete,
    SkewedZeroInflated,
    Weak,
    Negative,
    WeeklyVolume,
    WeeklyLevel,
    CrossingCutoff,
    Small,
}

/// <summary>Names and one-line descriptions for the report header.</summary>
internal static class HealthyFamilies
{
    public static IReadOnlyList<HealthyFamily> All { get; } = Enum.GetValues<HealthyFamily>();

    public static string Name(HealthyFamily family) => family switch
    {
        HealthyFamily.LinearNormal => "linear-normal",
        HealthyFamily.HeavyTails => "heavy-tails",
        HealthyFamily.Heteroscedastic => "heteroscedastic",
        HealthyFamily.Curved => "curved",
        HealthyFamily.Discrete => "discrete-ties",
        HealthyFamily.SkewedZeroInflated => "skewed-zeros",
        HealthyFamily.Weak => "weak",
        HealthyFamily.Negative => "negative",
        HealthyFamily.WeeklyVolume => "weekly-volume",
        HealthyFamily.WeeklyLevel => "weekly-level",
        HealthyFamily.CrossingCutoff => "crossing-cutoff",
        HealthyFamily.Small => "small",
        _ => throw new ArgumentOutOfRangeException(nameof(family), family, null),
    };

    public static string Describe(HealthyFamily family) => family switch
    {
        HealthyFamily.LinearNormal => "x ~ Normal, y = a + b·x + Normal noise, r 0.6–0.9",
        HealthyFamily.HeavyTails => "as linear-normal but the noise is Student t with 3 df (scaled to the same SD)",
        HealthyFamily.Heteroscedastic => "x lognormal (σ 0.5), noise SD proportional to x",
        HealthyFamily.Curved => "stable curve: half quadratic in x (curvature ≈ 0.3–0.6 of the slope over 1 SD), half saturating a + A·ln(1 + x/h)",
        HealthyFamily.Discrete => "many ties: half item counts (Poisson + 1) against money rounded to cents, half integer minutes against integer counts",
        HealthyFamily.SkewedZeroInflated => "x lognormal spend rounded to cents with 30–50 % exact zeros, y linear in x",
        HealthyFamily.Weak => "as linear-normal with r 0.25–0.35",
        HealthyFamily.Negative => "as linear-normal with b < 0, r −0.9 to −0.6",
        HealthyFamily.WeeklyVolume => "weekend days load 50–60 % of the rows, and x's SD narrows to 60 % on them (range restriction)",
        HealthyFamily.WeeklyLevel => "x's mean is 0.5–1 SD higher on Mondays and Fridays; y follows the same line",
        HealthyFamily.CrossingCutoff => "linear-normal tables of 35k–70k rows a day, crossing sample.all_rows_below (50,000) from day to day",
        HealthyFamily.Small => "linear-normal tables of 500–5,000 rows",
        _ => throw new ArgumentOutOfRangeException(nameof(family), family, null),
    };
}
