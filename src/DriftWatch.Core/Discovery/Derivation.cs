namespace DriftWatch.Core.Discovery;

public enum DerivationKind
{
    /// <summary>Equal on every row.</summary>
    Copy,

    /// <summary>An exact straight line, y = a + b·x.</summary>
    Affine,

    /// <summary>An exact monotone, non-linear function (|ρ| = 1 without |r| = 1).</summary>
    Monotone,
}

/// <summary>
/// A column that is an exact copy or function of another on every sampled row, with r = ±1 over the whole table
/// where the kind is linear: the data smell a survey exists to show. <see cref="Equation"/> names the columns.
/// </summary>
/// <param name="From">The column it follows: the first of its group in catalogue order.</param>
/// <param name="R">Pearson's r over the whole table.</param>
/// <param name="Slope">b of y = a + b·x for a copy or affine derivation.</param>
/// <param name="Intercept">a of y = a + b·x for a copy or affine derivation.</param>
public sealed record Derivation(string Column, string From, DerivationKind Kind, string Equation, double? R, long N, double? Slope, double? Intercept);
