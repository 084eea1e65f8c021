using System.Globalization;
using System.Text.RegularExpressions;

namespace TraceKin.Tests.Fitting;

/// <summary>
/// Reader for NIST StRD .dat files (NIST/ITL Statistical Reference Datasets; nonlinear and linear regression):
/// starting values, certified values and standard deviations, certified residual statistics and the data
/// (y first, then the predictors).
/// </summary>
public sealed partial record NistStrdFile(
    string Name,
    double[][] Starts,
    double[] Certified,
    double[] CertifiedSd,
    double ResidualSumOfSquares,
    double ResidualSd,
    double RSquared,
    double[] Y,
    double[][] X)
{
    public static string PathOf(string kind, string file) =>
        Path.Combine(AppContext.BaseDirectory, "TestData", "nist-strd", kind, file);

    public static NistStrdFile Read(string kind, string file)
    {
        var lines = File.ReadAllLines(PathOf(kind, file));
        var ci = CultureInfo.InvariantCulture;
        double P(string s) => double.Parse(s, NumberStyles.Float, ci);
        var s1 = new List<double>(); var s2 = new List<double>(); var cert = new List<double>(); var sd = new List<double>();
        double rss = double.NaN, rsd = double.NaN, r2 = double.NaN;
        var y = new List<double>(); var x = new List<double[]>();
        var inData = false;
        for (var i = 0; i < lines.Length; i++)
        {
            var line = lines[i];
            if (inData)
            {
                var parts = line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
                if (parts.Length == 0) continue;
                y.Add(P(parts[0]));
                x.Add(parts.Skip(1).Select(P).ToArray());
                continue;
            }
            if (DataHeader().IsMatch(line)) { inData = true; continue; }
            var m = NonlinearParam().Match(line);
            if (m.Success && kind == "nonlinear")
            {
                s1.Add(P(m.Groups[2].Value)); s2.Add(P(m.Groups[3].Value));
                cert.Add(P(m.Groups[4].Value)); sd.Add(P(m.Groups[5].Value));
                continue;
            }
            m = LinearParam().Match(line);
            if (m.Success && kind == "linear") { cert.Add(P(m.Groups[2].Value)); sd.Add(P(m.Groups[3].Value)); continue; }
            if (line.TrimStart().StartsWith("Residual Sum of Squares:", StringComparison.Ordinal)) rss = P(Last(line));
            else if (line.TrimStart().StartsWith("Residual Standard Deviation:", StringComparison.Ordinal)) rsd = P(Last(line));
            else if (line.TrimStart().StartsWith("Standard Deviation", StringComparison.Ordinal) && i > 0 && lines[i - 1].Trim() == "Residual") rsd = P(Last(line));
            else if (line.TrimStart().StartsWith("R-Squared", StringComparison.Ordinal)) r2 = P(Last(line));
            else if (line.TrimStart().StartsWith("Residual ", StringComparison.Ordinal) && kind == "linear" && !line.Contains("Standard", StringComparison.Ordinal))
            {
                // ANOVA row: "Residual  dof  SS  MS"
                var parts = line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
                if (parts.Length >= 3) rss = P(parts[2]);
            }
        }
        return new NistStrdFile(Path.GetFileNameWithoutExtension(file), [s1.ToArray(), s2.ToArray()], cert.ToArray(), sd.ToArray(),
            rss, rsd, r2, y.ToArray(), x.ToArray());
    }

    private static string Last(string line) => line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries)[^1];

    /// <summary>Log relative error, McCullough (1998), Am. Stat. 52, 358: −log10(|q − c| / |c|), capped at 15.</summary>
    public static double Lre(double estimate, double certified)
    {
        if (!double.IsFinite(estimate)) return 0;
        var rel = certified == 0 ? Math.Abs(estimate) : Math.Abs(estimate - certified) / Math.Abs(certified);
        return rel == 0 ? 15 : Math.Min(15, -Math.Log10(rel));
    }

    [GeneratedRegex(@"^Data:\s+y\b")]
    private static partial Regex DataHeader();
    [GeneratedRegex(@"^\s*b(\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$")]
    private static partial Regex NonlinearParam();
    [GeneratedRegex(@"^\s*B(\d+)\s+(\S+)\s+(\S+)\s*$")]
    private static partial Regex LinearParam();
}
