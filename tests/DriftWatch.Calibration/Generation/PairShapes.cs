namespace DriftWatch.Calibration.Generation;

/// <summary>Draws the fixed character of a pair of a family (see <see cref="HealthyFamilies.Describe"/>).</summary>
internal static class PairShapes
{
    public static PairShape Draw(HealthyFamily family, int variant, Random rng, int? rows = null)
    {
        ArgumentNullException.ThrowIfNull(rng);
        var r = family switch
        {
            HealthyFamily.Weak => Uniform(rng, 0.25, 0.35),
            _ => Uniform(rng, 0.6, 0.9),
        };
        var sign = family == HealthyFamily.Negative ? -1.0 : 1.0;
        var xMean = LogUniform(rng, 20, 500);
        var xSd = xMean * Uniform(rng, 0.15, 0.3);
        var slope = sign * LogUniform(rng, 0.1, 10);
        var intercept = Uniform(rng, -1, 1) * Math.Abs(slope) * xMean;
        var noiseFactor = Math.Sqrt((1 / (r * r)) - 1);
        var (baseRows, minRows, maxRows) = family switch
        {
            HealthyFamily.CrossingCutoff => ((int)Uniform(rng, 42_000, 58_000), 35_000, 70_000),
            HealthyFamily.Small => ((int)LogUniform(rng, 500, 5_000), 350, 6_500),
            _ => ((int)LogUniform(rng, 2_000, 20_000), 1_000, 26_000),
        };
        if (rows is { } fixedRows)
        {
            (baseRows, minRows, maxRows) = (fixedRows, 1, int.MaxValue);
        }

        var shape = new PairShape(family, variant, intercept, slope, Math.Abs(slope) * xSd * noiseFactor, xMean, xSd, baseRows, minRows, maxRows);
        switch (family)
        {
            case HealthyFamily.Heteroscedastic:
            {
                // x = XMean·exp(0.5 z): Var(x) = XMean²·e^0.25·(e^0.25 − 1); E[(x/XMean)²] = e^0.5 scales the noise.
                var sdX = xMean * Math.Sqrt(Math.Exp(0.25) * (Math.Exp(0.25) - 1));
                return shape with { XSd = sdX, NoiseSd = Math.Abs(slope) * sdX * noiseFactor / Math.Sqrt(Math.Exp(0.5)) };
            }

            case HealthyFamily.Curved when variant == 0:
                return shape with { Curvature = Uniform(rng, 0.3, 0.6) };
            case HealthyFamily.Curved:
            {
                // x uniform on [0, 2·XMean], h = XMean/4: y rises steeply, then flattens. The signal's SD is about 0.55·A.
                var amplitude = Math.Abs(slope) * xMean;
                return shape with { Slope = amplitude, Saturation = xMean / 4, NoiseSd = 0.55 * amplitude * noiseFactor };
            }

            case HealthyFamily.Discrete when variant == 0:
            {
                // Item counts (Poisson + 1) against an amount in money: price per item, rounded to cents.
                var lambda = Uniform(rng, 3, 12);
                var price = Uniform(rng, 2, 40);
                return shape with { Lambda = lambda, Slope = price, Intercept = Uniform(rng, 0, 5), XMean = lambda + 1, XSd = Math.Sqrt(lambda), NoiseSd = price * Math.Sqrt(lambda) * noiseFactor };
            }

            case HealthyFamily.Discrete:
            {
                // Integer minutes against an integer count: few distinct values on both axes.
                var mean = Uniform(rng, 20, 60);
                var sd = Uniform(rng, 5, 12);
                var b = Uniform(rng, 0.2, 0.6);
                return shape with { XMean = mean, XSd = sd, Slope = b, Intercept = Uniform(rng, 0, 5), NoiseSd = b * sd * noiseFactor };
            }

            case HealthyFamily.SkewedZeroInflated:
            {
                var zeros = Uniform(rng, 0.3, 0.5);
                var mu = Uniform(rng, 2.5, 4);
                var sigma = Uniform(rng, 0.8, 1.2);
                var m1 = (1 - zeros) * Math.Exp(mu + (sigma * sigma / 2));
                var m2 = (1 - zeros) * Math.Exp((2 * mu) + (2 * sigma * sigma));
                var sdX = Math.Sqrt(m2 - (m1 * m1));
                return shape with { ZeroShare = zeros, LogMu = mu, LogSigma = sigma, XMean = m1, XSd = sdX, NoiseSd = Math.Abs(slope) * sdX * noiseFactor };
            }

            case HealthyFamily.WeeklyVolume:
                return shape with { WeekendShare = Uniform(rng, 0.5, 0.6) };
            case HealthyFamily.WeeklyLevel:
                return shape with { LevelLift = Uniform(rng, 0.5, 1.0) };
            default:
                return shape;
        }
    }

    internal static double Uniform(Random rng, double from, double to) => from + ((to - from) * rng.NextDouble());

    internal static double LogUniform(Random rng, double from, double to) => Math.Exp(Uniform(rng, Math.Log(from), Math.Log(to)));
}
