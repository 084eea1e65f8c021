namespace TraceKin.Series;

/// <summary>
/// Adaptive, L-stable, linearly implicit integrator for one scalar ODE y' = f(y) (autonomous): the two-stage
/// second-order Rosenbrock method ROS2 with γ = 1 + 1/√2 (Verwer, Spee, Blom &amp; Hundsdorfer 1999, SIAM J. Sci. Comput.
/// 20, 1456, eq. 2.1):
///   (1 − γhJ)·k1 = f(y_n),  (1 − γhJ)·k2 = f(y_n + h·k1) − 2·k1,  y_{n+1} = y_n + (3/2)h·k1 + (1/2)h·k2,
/// with J = f'(y_n). The local error is estimated against the embedded first-order solution y_n + h·k1 (linearly
/// implicit Euler) and the step is controlled by h_new = h·min(4, max(0.2, 0.9·(tol/err)^(1/2))) (Hairer &amp; Wanner,
/// Solving ODEs II, §IV.8, from memory). Being linearly implicit it stays stable for stiff rate laws.
/// </summary>
internal static class Rosenbrock2
{
    private static readonly double Gamma = 1 + 1 / Math.Sqrt(2);

    /// <summary>
    /// Integrates from y(0) = <paramref name="y0"/> and writes y at each of <paramref name="times"/> (ascending, ≥ 0).
    /// Returns false when the step size collapses (the solution cannot be followed).
    /// </summary>
    public static bool Solve(Func<double, double> f, Func<double, double> dfdy, double y0, ReadOnlySpan<double> times, Span<double> result,
        double relTol = 1e-6, double absTol = 1e-15)
    {
        double t = 0, y = y0;
        var h = times.Length > 0 && times[^1] > 0 ? times[^1] * 1e-4 : 1e-6;
        for (var i = 0; i < times.Length; i++)
        {
            var target = times[i];
            var guard = 0;
            while (t < target)
            {
                if (++guard > 1_000_000) return false;
                var step = Math.Min(h, target - t);
                var fy = f(y);
                var j = dfdy(y);
                var m = 1 - Gamma * step * j;
                if (m == 0 || !double.IsFinite(m)) { h *= 0.25; continue; }
                var k1 = fy / m;
                var k2 = (f(y + step * k1) - 2 * k1) / m;
                var next = y + 1.5 * step * k1 + 0.5 * step * k2;
                var err = Math.Abs(0.5 * step * (k1 + k2));
                var scale = absTol + relTol * Math.Max(Math.Abs(y), Math.Abs(next));
                var ratio = err / scale;
                if (!double.IsFinite(next) || ratio > 1)
                {
                    h = step * Math.Max(0.2, 0.9 / Math.Sqrt(double.IsFinite(ratio) ? ratio : 100));
                    if (h < 1e-14 * Math.Max(1, target)) return false;
                    continue;
                }
                t += step;
                y = next;
                var grow = ratio > 0 ? 0.9 / Math.Sqrt(ratio) : 4;
                h = step * Math.Min(4, Math.Max(0.2, grow));
            }
            result[i] = y;
        }
        return true;
    }
}
