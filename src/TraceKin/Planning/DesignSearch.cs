using MathNet.Numerics.LinearAlgebra;

namespace TraceKin.Planning;

/// <summary>One proposed condition and how many identical runs it gets.</summary>
public sealed record DesignPoint(RunConditions Conditions, int Runs);

/// <summary>
/// Finds new runs that maximise a <see cref="DesignCriterion"/> of the Fisher information of the existing runs plus the
/// new ones, by searching the allowed ranges (no closed-form optimum is assumed). First a greedy pass adds the new
/// conditions one at a time from a grid over the ranges (Wynn 1970's sequential construction, from memory); then
/// coordinate exchange (Meyer &amp; Nachtsheim 1995, from memory) moves each condition along each coordinate in turn to the
/// best place given all the others — a scan of the whole range and a golden-section refinement around the best scanned
/// level — until a full sweep improves nothing. Deterministic: no random starts.
/// </summary>
internal static class DesignSearch
{
    private const int ScanLevels = 41;
    private const int MaxSweeps = 40;
    /// <summary>Coordinates (on the unit scale of each range) closer than this are one support point.</summary>
    private const double MergeDistance = 0.01;

    public static IReadOnlyList<DesignPoint> Find(DesignLaw law, double[] theta, RateNoise noise, IReadOnlyList<RunConditions> existing,
        DesignSpace space, int newRuns, int replicates, DesignCriterion criterion)
    {
        var m = newRuns / replicates;
        var d = space.Dimension;
        var baseInfo = FisherInformation.Of(law, theta, existing, noise);
        var grid = Grid(d);
        // A whisper of the grid's own information keeps the greedy pass defined while the design is still singular
        // (a new study starts from no runs); it is 10⁻⁹ of one run's and left out of the final score.
        var ridge = Matrix<double>.Build.Dense(baseInfo.RowCount, baseInfo.RowCount);
        var gridInfo = FisherInformation.Of(law, theta, grid.Select(u => space.At(u)), noise);
        for (var i = 0; i < ridge.RowCount; i++) ridge[i, i] = 1e-9 * gridInfo[i, i] / grid.Count;
        var start = baseInfo + ridge;

        var points = new List<double[]>();
        var pointInfo = new List<Matrix<double>>();
        var current = start.Clone();
        for (var k = 0; k < m; k++)
        {
            double best = double.NegativeInfinity;
            double[]? bestU = null;
            foreach (var u in grid)
            {
                var s = criterion.Score(current + Info(space.At(u), replicates), law);
                if (s > best + 1e-12) { best = s; bestU = u; }
            }
            bestU ??= grid[0];
            points.Add((double[])bestU.Clone());
            var info = Info(space.At(bestU), replicates);
            pointInfo.Add(info);
            current += info;
        }

        var runs = Enumerable.Repeat(replicates, m).ToList();
        Sweep(points, runs, pointInfo, ref current);
        // Conditions that ended up together (the optimum is flat near a support point, so they agree to a few parts in
        // 10⁵) are merged into one support point with their runs summed, which is then moved as a block.
        var order = Enumerable.Range(0, m).OrderBy(k => points[k], Lexicographic.Instance).ToList();
        var mergedU = new List<double[]>();
        var mergedRuns = new List<int>();
        foreach (var k in order)
        {
            var same = mergedU.FindIndex(q => q.Zip(points[k], (a, b) => Math.Abs(a - b)).All(e => e < MergeDistance));
            if (same >= 0)
            {
                var n = mergedRuns[same];
                for (var a = 0; a < d; a++) mergedU[same][a] = (mergedU[same][a] * n + points[k][a] * runs[k]) / (n + runs[k]);
                mergedRuns[same] += runs[k];
            }
            else { mergedU.Add((double[])points[k].Clone()); mergedRuns.Add(runs[k]); }
        }
        var mergedInfo = mergedU.Select((u, k) => Info(space.At(u), mergedRuns[k])).ToList();
        current = mergedInfo.Aggregate(start.Clone(), (acc, x) => acc + x);
        Sweep(mergedU, mergedRuns, mergedInfo, ref current);
        return mergedU.Select((u, k) => new DesignPoint(space.At(u), mergedRuns[k])).ToList();

        Matrix<double> Info(RunConditions x, int count) => FisherInformation.Of(law, theta, [x], noise) * count;

        // Coordinate exchange: each point in turn, along each coordinate, to the best place given the others.
        void Sweep(List<double[]> pts, List<int> mult, List<Matrix<double>> infos, ref Matrix<double> total)
        {
            var score = criterion.Score(total, law);
            for (var sweep = 0; sweep < MaxSweeps && d > 0; sweep++)
            {
                var improved = false;
                for (var k = 0; k < pts.Count; k++)
                {
                    for (var axis = 0; axis < d; axis++)
                    {
                        var others = total - infos[k];
                        var u = (double[])pts[k].Clone();
                        var count = mult[k];
                        double F(double v)
                        {
                            u[axis] = v;
                            return criterion.Score(others + Info(space.At(u), count), law);
                        }
                        var (bestV, bestS) = (pts[k][axis], score);
                        var bestI = -1;
                        for (var i = 0; i < ScanLevels; i++)
                        {
                            var si = F((double)i / (ScanLevels - 1));
                            if (si > bestS + 1e-12) { bestS = si; bestI = i; bestV = (double)i / (ScanLevels - 1); }
                        }
                        // Refine inside the bracket around the best scanned level (or around the point's own place).
                        var centre = bestI >= 0 ? bestV : pts[k][axis];
                        var (gv, gs) = Golden(F, Math.Max(0, centre - 1.0 / (ScanLevels - 1)), Math.Min(1, centre + 1.0 / (ScanLevels - 1)));
                        if (gs > bestS) { bestS = gs; bestV = gv; }
                        if (bestS > score + 1e-12 * Math.Max(1, Math.Abs(score)))
                        {
                            pts[k][axis] = bestV;
                            var info = Info(space.At(pts[k]), count);
                            total = others + info;
                            infos[k] = info;
                            score = criterion.Score(total, law);
                            improved = true;
                        }
                    }
                }
                if (!improved) break;
            }
        }
    }

    /// <summary>Golden-section search for the maximum of f on [a, b] (Kiefer 1953; Press et al., Numerical Recipes, 3rd ed., §10.2, from memory).</summary>
    private static (double X, double F) Golden(Func<double, double> f, double a, double b)
    {
        var r = (Math.Sqrt(5) - 1) / 2;
        double c = b - r * (b - a), d = a + r * (b - a);
        double fc = f(c), fd = f(d);
        for (var i = 0; i < 60 && b - a > 1e-9; i++)
        {
            if (fc >= fd) { b = d; d = c; fd = fc; c = b - r * (b - a); fc = f(c); }
            else { a = c; c = d; fc = fd; d = a + r * (b - a); fd = f(d); }
        }
        return fc >= fd ? (c, fc) : (d, fd);
    }

    /// <summary>Levels 0, ⅛, …, 1 per coordinate (5 levels beyond three coordinates), full factorial.</summary>
    private static List<double[]> Grid(int d)
    {
        var levels = d <= 3 ? 9 : 5;
        var list = new List<double[]>();
        if (d == 0) { list.Add([]); return list; }
        var idx = new int[d];
        while (true)
        {
            list.Add(idx.Select(i => (double)i / (levels - 1)).ToArray());
            var a = 0;
            while (a < d && ++idx[a] == levels) idx[a++] = 0;
            if (a == d) break;
        }
        return list;
    }

    private sealed class Lexicographic : IComparer<double[]>
    {
        public static readonly Lexicographic Instance = new();
        public int Compare(double[]? x, double[]? y)
        {
            for (var i = 0; i < x!.Length; i++)
            {
                var c = x[i].CompareTo(y![i]);
                if (c != 0) return c;
            }
            return 0;
        }
    }
}
