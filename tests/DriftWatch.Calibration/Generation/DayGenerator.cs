using MathNet.Numerics.Distributions;

namespace DriftWatch.Calibration.Generation;

/// <summary>
/// One day's rows of a healthy pair: the pair's fixed shape plus that day's random variation (slope ±3 %,
/// intercept ±0.15 residual SD, noise SD ±10 %, rows ±30 %) and its weekday effects. The same seed gives the
/// same rows.
/// </summary>
internal static class DayGenerator
{
    public static CalibrationRow[] Generate(PairShape shape, DateOnly date, Random rng)
    {
        ArgumentNullException.ThrowIfNull(shape);
        ArgumentNullException.ThrowIfNull(rng);
        var slope = shape.Slope * (1 + PairShapes.Uniform(rng, -0.03, 0.03));
        var intercept = shape.Intercept + (PairShapes.Uniform(rng, -0.15, 0.15) * shape.NoiseSd);
        var noise = shape.NoiseSd * (1 + PairShapes.Uniform(rng, -0.1, 0.1));
        var weekend = date.DayOfWeek is DayOfWeek.Saturday or DayOfWeek.Sunday;
        var size = shape.BaseRows * (1 + PairShapes.Uniform(rng, -shape.SizeJitter, shape.SizeJitter));
        var xMean = shape.XMean;
        var xSd = shape.XSd;
        if (shape.Family == HealthyFamily.WeeklyVolume && weekend)
        {
            size *= shape.WeekendShare;
            xSd *= 0.6;
        }

        if (shape.Family == HealthyFamily.WeeklyLevel && date.DayOfWeek is DayOfWeek.Monday or DayOfWeek.Friday)
        {
            xMean += shape.LevelLift * xSd;
        }

        var n = (int)Math.Clamp(Math.Round(size), shape.MinRows, shape.MaxRows);
        var rows = new CalibrationRow[n];
        for (var i = 0; i < n; i++)
        {
            rows[i] = Row(shape, rng, slope, intercept, noise, xMean, xSd);
        }

        return rows;
    }

    private static CalibrationRow Row(PairShape shape, Random rng, double slope, double intercept, double noise, double xMean, double xSd)
    {
        switch (shape.Family)
        {
            case HealthyFamily.HeavyTails:
            {
                var x = xMean + (xSd * Z(rng));

                // Var(t₃) = 3: dividing by √3 keeps the noise SD equal to the linear-normal family's.
                return new(x, intercept + (slope * x) + (noise * StudentT.Sample(rng, 0, 1, 3) / Math.Sqrt(3)));
            }

            case HealthyFamily.Heteroscedastic:
            {
                var x = shape.XMean * Math.Exp(0.5 * Z(rng));
                return new(x, intercept + (slope * x) + (noise * (x / shape.XMean) * Z(rng)));
            }

            case HealthyFamily.Curved when shape.Variant == 0:
            {
                var x = xMean + (xSd * Z(rng));
                var u = (x - shape.XMean) / shape.XSd;
                return new(x, intercept + (slope * x) + (shape.Curvature * Math.Abs(slope) * shape.XSd * u * u) + (noise * Z(rng)));
            }

            case HealthyFamily.Curved:
            {
                var x = 2 * shape.XMean * rng.NextDouble();
                return new(x, intercept + (slope * Math.Log(1 + (x / shape.Saturation))) + (noise * Z(rng)));
            }

            case HealthyFamily.Discrete when shape.Variant == 0:
            {
                double x = Poisson.Sample(rng, shape.Lambda) + 1;
                return new(x, Math.Round(intercept + (slope * x) + (noise * Z(rng)), 2));
            }

            case HealthyFamily.Discrete:
            {
                var x = Math.Round(xMean + (xSd * Z(rng)));
                return new(x, Math.Round(intercept + (slope * x) + (noise * Z(rng))));
            }

            case HealthyFamily.SkewedZeroInflated:
            {
                var x = rng.NextDouble() < shape.ZeroShare ? 0 : Math.Round(Math.Exp(shape.LogMu + (shape.LogSigma * Z(rng))), 2);
                return new(x, Math.Round(intercept + (slope * x) + (noise * Z(rng)), 2));
            }

            default:
            {
                var x = xMean + (xSd * Z(rng));
                return new(x, intercept + (slope * x) + (noise * Z(rng)));
            }
        }
    }

    private static double Z(Random rng) => Normal.Sample(rng, 0, 1);
}
