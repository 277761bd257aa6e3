using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Discovery;

/// <summary>What a survey of one table found: columns derived from others, and the pairs worth watching.</summary>
public sealed record DiscoveryResult(IReadOnlyList<Derivation> Derivations, IReadOnlyList<Candidate> Candidates, int ProfiledPairs);

/// <summary>
/// Turns a table's correlation matrix and shared sample into derivations and candidate pairs. Each pair at or above
/// the bound is profiled by <see cref="Profiler"/> on the shared sample, so exactness, shape and ρ are the ones a
/// watched pair would get. A pair the profile calls exact (a copy, an affine or a monotone function) is a derivation
/// when the whole table agrees; columns linked by derivations form a group led by its first column in catalogue
/// order, and a derived column's other pairs repeat its leader's, so they are not offered again.
/// </summary>
public static class TableDiscovery
{
    /// <summary>The default bound on |r| for a candidate.</summary>
    public const double DefaultMinR = 0.5;

    /// <summary>
    /// |r| over the whole table at which a sample's exact line is also the table's: 1 − |r| is about n·ε for an
    /// exact line rounded to doubles, and at least ~1e-8 once a single row of thousands is off it by a unit in the
    /// 4th digit.
    /// </summary>
    public const double ExactTableR = 1 - 1e-9;

    public static DiscoveryResult Assess(CorrelationMatrix matrix, SharedSample sample, double minR, Thresholds thresholds, IProgress<(int Done, int Total)>? progress = null)
    {
        ArgumentNullException.ThrowIfNull(matrix);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(thresholds);
        var k = matrix.Columns.Count;
        var bound = Math.Min(minR, ExactTableR);
        var pairs = new List<(int I, int J, double R)>();
        for (var i = 0; i < k; i++)
        {
            for (var j = i + 1; j < k; j++)
            {
                if (matrix.R(i, j) is { } r && Math.Abs(r) >= bound)
                {
                    pairs.Add((i, j, r));
                }
            }
        }

        var profiles = new Dictionary<(int, int), RelationshipProfile>();
        for (var p = 0; p < pairs.Count; p++)
        {
            var (i, j, _) = pairs[p];
            profiles[(i, j)] = Profiler.Profile(sample.Pair(i, j), thresholds);
            progress?.Report((p + 1, pairs.Count));
        }

        var exact = pairs.Where(p => KindOf(profiles[(p.I, p.J)], p.R) is not null).ToList();
        var groups = new UnionFind(k);
        foreach (var (i, j, _) in exact)
        {
            groups.Join(i, j);
        }

        var derivations = new List<Derivation>();
        var derived = new HashSet<int>();
        for (var m = 0; m < k; m++)
        {
            var leader = groups.Leader(m);
            if (leader == m)
            {
                continue;
            }

            // The edge to the leader when it was measured, else the first edge that ties the column to its group.
            var edge = exact.Where(e => e.I == leader && e.J == m).Concat(exact.Where(e => e.J == m)).Concat(exact.Where(e => e.I == m)).FirstOrDefault();
            var profile = profiles[(edge.I, edge.J)];
            string x = matrix.Columns[edge.I], y = matrix.Columns[edge.J];
            var kind = KindOf(profile, edge.R)!.Value;
            derived.Add(m);
            // The column is m; on the rare edge that has it as x (tied only to later members), the equation reads the other way.
            derivations.Add(new Derivation(
                matrix.Columns[m],
                edge.J == m ? x : y,
                kind,
                Equation(kind, profile, x, y),
                edge.R,
                matrix.N(edge.I, edge.J),
                kind == DerivationKind.Monotone ? null : profile.Slope,
                kind == DerivationKind.Monotone ? null : profile.Intercept));
        }

        var candidates = pairs
            .Where(p => Math.Abs(p.R) >= minR && !derived.Contains(p.I) && !derived.Contains(p.J) && KindOf(profiles[(p.I, p.J)], p.R) is null)
            .Select(p =>
            {
                var profile = profiles[(p.I, p.J)];
                return new Candidate(matrix.Columns[p.I], matrix.Columns[p.J], p.R, matrix.N(p.I, p.J), profile.SpearmanRho, profile.Shape, profile.ShapeReason, profile.NUsed, profile.DerivedShare);
            })
            .OrderByDescending(c => Math.Abs(c.R))
            .ThenBy(c => c.X, StringComparer.Ordinal)
            .ThenBy(c => c.Y, StringComparer.Ordinal)
            .ToList();
        return new DiscoveryResult(derivations, candidates, pairs.Count);
    }

    /// <summary>The Core's exactness on the sample, confirmed by the whole table's r for the linear kinds.</summary>
    private static DerivationKind? KindOf(RelationshipProfile profile, double tableR)
    {
        if (profile.ExactAffine && Math.Abs(tableR) >= ExactTableR)
        {
            return profile.ExactIdentity ? DerivationKind.Copy : DerivationKind.Affine;
        }

        return profile.ExactMonotone ? DerivationKind.Monotone : null;
    }

    /// <summary>The profile's "y = 2.5·x + 1" with the columns' names: "total = 2.5·net + 1".</summary>
    private static string Equation(DerivationKind kind, RelationshipProfile profile, string x, string y)
    {
        if (kind == DerivationKind.Monotone || profile.Equation is not { } equation || !equation.StartsWith("y = ", StringComparison.Ordinal))
        {
            var direction = profile.SpearmanRho >= 0 ? "increasing" : "decreasing";
            return $"{y} = f({x}), f exact, {direction} and not linear";
        }

        return y + " = " + equation["y = ".Length..].Replace("x", x, StringComparison.Ordinal);
    }

    private sealed class UnionFind
    {
        private readonly int[] _parent;

        public UnionFind(int count) => _parent = [.. Enumerable.Range(0, count)];

        /// <summary>The smallest index of the group: its first column in catalogue order.</summary>
        public int Leader(int a) => _parent[a] == a ? a : _parent[a] = Leader(_parent[a]);

        public void Join(int a, int b)
        {
            int la = Leader(a), lb = Leader(b);
            if (la != lb)
            {
                _parent[Math.Max(la, lb)] = Math.Min(la, lb);
            }
        }
    }
}
