using System.Globalization;
using TraceKin.Fitting;
using Xunit.Abstractions;

namespace TraceKin.Tests.Fitting;

/// <summary>
/// NIST StRD nonlinear regression, all 18 stored problems from both certified starts. Where the fit reports
/// Converged, parameters must match the certified values to ≥ 7 significant digits and standard deviations to ≥ 5
/// (log relative error, McCullough 1998). Where it does not, the exit must say so: a non-converged exit is
/// acceptable, a wrong value marked Converged is not.
/// </summary>
public sealed class NistNonlinearTests(ITestOutputHelper output)
{
    private const double ParameterDigits = 7, ErrorDigits = 5;

    /// <summary>The model of each NIST file, exactly as printed in its header ("Model:" section).</summary>
    internal static Func<double[], double, double> ModelOf(string name) => name switch
    {
        "Misra1a" or "BoxBOD" => (b, x) => b[0] * (1 - Math.Exp(-b[1] * x)),
        "Misra1b" => (b, x) => b[0] * (1 - Math.Pow(1 + b[1] * x / 2, -2)),
        "Misra1c" => (b, x) => b[0] * (1 - Math.Pow(1 + 2 * b[1] * x, -0.5)),
        "Misra1d" => (b, x) => b[0] * b[1] * x / (1 + b[1] * x),
        "Chwirut1" or "Chwirut2" => (b, x) => Math.Exp(-b[0] * x) / (b[1] + b[2] * x),
        "Lanczos1" or "Lanczos2" or "Lanczos3" => (b, x) => b[0] * Math.Exp(-b[1] * x) + b[2] * Math.Exp(-b[3] * x) + b[4] * Math.Exp(-b[5] * x),
        "DanWood" => (b, x) => b[0] * Math.Pow(x, b[1]),
        "MGH09" => (b, x) => b[0] * (x * x + x * b[1]) / (x * x + x * b[2] + b[3]),
        "MGH10" => (b, x) => b[0] * Math.Exp(b[1] / (x + b[2])),
        "Thurber" => (b, x) => (b[0] + b[1] * x + b[2] * x * x + b[3] * x * x * x) / (1 + b[4] * x + b[5] * x * x + b[6] * x * x * x),
        "Bennett5" => (b, x) => b[0] * Math.Pow(b[1] + x, -1 / b[2]),
        "Rat42" => (b, x) => b[0] / (1 + Math.Exp(b[1] - b[2] * x)),
        "Rat43" => (b, x) => b[0] / Math.Pow(1 + Math.Exp(b[1] - b[2] * x), 1 / b[3]),
        "Eckerle4" => (b, x) => b[0] / b[1] * Math.Exp(-0.5 * Math.Pow((x - b[2]) / b[1], 2)),
        _ => throw new ArgumentException(name),
    };

    public static readonly string[] Files =
    [
        "Misra1a", "Chwirut2", "Chwirut1", "Lanczos3", "Misra1b", "Lanczos1", "Lanczos2", "DanWood", "Misra1c", "Misra1d",
        "MGH09", "Thurber", "BoxBOD", "Rat42", "MGH10", "Eckerle4", "Rat43", "Bennett5",
    ];

    public static TheoryData<string, int> Cases()
    {
        var d = new TheoryData<string, int>();
        foreach (var f in Files) { d.Add(f, 1); d.Add(f, 2); }
        return d;
    }

    internal sealed record Outcome(string File, int Start, FitResult Fit, double MinParamDigits, double MinSdDigits, double RssDigits);

    internal static Outcome Solve(string file, int start)
    {
        var nist = NistStrdFile.Read("nonlinear", file + ".dat");
        var names = Enumerable.Range(1, nist.Certified.Length).Select(i => $"b{i}").ToArray();
        var model = new CurveModel(file, names, nist.X.Select(r => r[0]).ToArray(), ModelOf(file));
        var fit = NonlinearLeastSquares.Fit(model, nist.Y, nist.Starts[start - 1], new FitOptions { MaxIterations = 5000 });
        var pd = Enumerable.Range(0, names.Length).Min(j => NistStrdFile.Lre(fit.Parameters[j].Value, nist.Certified[j]));
        var sd = Enumerable.Range(0, names.Length).Min(j => NistStrdFile.Lre(fit.Parameters[j].StdError, nist.CertifiedSd[j]));
        return new Outcome(file, start, fit, pd, sd, NistStrdFile.Lre(fit.ChiSquare, nist.ResidualSumOfSquares));
    }

    // Source: NIST StRD nonlinear regression, <file>.dat, certified values (parameters, standard deviations, RSS).
    [Theory]
    [MemberData(nameof(Cases))]
    public void Fit_from_a_certified_start_matches_the_certified_values_or_says_it_did_not_converge(string file, int start)
    {
        var o = Solve(file, start);
        output.WriteLine(string.Format(CultureInfo.InvariantCulture, "{0,-9} start {1}: exit {2,-13} params {3,5:F1} digits, SDs {4,5:F1} digits, RSS {5,5:F1} digits, {6} iterations",
            file, start, o.Fit.Exit, o.MinParamDigits, o.MinSdDigits, o.RssDigits, o.Fit.Iterations));
        if (o.Fit.Converged)
        {
            // Lanczos1's certified RSS (1.4e-25) sits at the rounding floor of double-precision residuals (y ≈ 1,
            // residuals ≈ 1e-13), so s² and with it the standard deviations are known to about 3 digits only; the
            // parameters themselves are held to the full 7.
            var errorDigits = file == "Lanczos1" ? 3 : ErrorDigits;
            Assert.True(o.MinParamDigits >= ParameterDigits, $"{file} start {start}: marked Converged with only {o.MinParamDigits:F1} correct digits in the parameters\n{o.Fit.ToReport()}");
            Assert.True(o.MinSdDigits >= errorDigits, $"{file} start {start}: only {o.MinSdDigits:F1} correct digits in the standard deviations\n{o.Fit.ToReport()}");
        }
        else
        {
            // An honest failure: not marked Converged, and no standard errors printed as if they were good.
            Assert.NotEqual(FitExit.AtBound, o.Fit.Exit); // these problems are unbounded
            Assert.All(o.Fit.Parameters, p => Assert.True(double.IsNaN(p.StdError)));
            Assert.False(string.IsNullOrEmpty(o.Fit.ExitDetail));
        }
    }

    [Fact]
    public void Table_of_digits_achieved_on_all_problems()
    {
        output.WriteLine("NIST StRD nonlinear regression: minimum log relative error over parameters / standard deviations");
        output.WriteLine("file       start  exit           params  SDs    RSS   iterations");
        var converged = 0;
        foreach (var f in Files)
            for (var s = 1; s <= 2; s++)
            {
                var o = Solve(f, s);
                if (o.Fit.Converged) converged++;
                output.WriteLine(string.Format(CultureInfo.InvariantCulture, "{0,-10} {1,5}  {2,-13} {3,6:F1} {4,5:F1} {5,6:F1} {6,6}",
                    f, s, o.Fit.Exit, o.MinParamDigits, o.MinSdDigits, o.RssDigits, o.Fit.Iterations));
            }
        output.WriteLine($"converged: {converged} of {Files.Length * 2}");
        // Every start-2 (near) problem is solvable by a sound Levenberg–Marquardt code in double precision
        // (NIST StRD documentation); all of them must converge here.
        Assert.All(Files, f => Assert.True(Solve(f, 2).Fit.Converged, $"{f} start 2 did not converge"));
    }
}
