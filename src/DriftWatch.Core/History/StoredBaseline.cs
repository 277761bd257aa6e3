using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.History;

/// <summary>
/// The reference a pair is compared with: a profile of pooled points plus a bounded reservoir of those
/// points (for plots and the Kolmogorov–Smirnov test).
/// </summary>
public sealed record StoredBaseline(
    string Pair,
    BaselinePolicyKind Policy,
    string PolicyText,
    DateTimeOffset CreatedAt,
    DateTimeOffset CoversFrom,
    DateTimeOffset CoversTo,
    int RunCount,
    RelationshipProfile Profile,
    PairedSample Points,
    bool Accepted = false);
