using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>One run's signal channel turned into concentrations, with everything worth saying about it.</summary>
/// <param name="Concentration">The followed species' concentration trace, mol/L.</param>
/// <param name="Model">The conversion that was used.</param>
/// <param name="StdErrors">Per-point standard error of each concentration, mol/L, when the conversion gives one (calibration curves); else null.</param>
/// <param name="Warnings">Readings outside the linear range or the standards, wavelengths that disagree, points that could not be converted.</param>
public sealed record RunConversionResult(Trace Concentration, SignalModel Model, double[]? StdErrors, IReadOnlyList<Warning> Warnings);

/// <summary>
/// Applies a run's <see cref="SignalModel"/> to its export: picks the channel, subtracts a reference channel,
/// converts point by point (with each point's temperature where that matters), and checks the result.
/// </summary>
internal static class RunConversion
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static RunConversionResult Convert(RunExport export, PlanRow row, SignalSettings s)
    {
        var model = SignalModel.For(s, row, export);
        var channel = export.Channel(s.Channel);
        var warnings = new List<Warning>();
        var where = $"{export.File} (run {row.Run})";
        CheckQuantity(channel, model, s, warnings, where);

        var raw = channel.Values;
        // the channel itself when there is nothing to subtract (it is only read from here on)
        var signal = raw;
        if (s.ReferenceChannel is { } refName)
        {
            var reference = export.Channel(refName, "signal.reference_channel");
            if (reference.Count != channel.Count)
                throw Fail.Setting(s.Source, "signal.reference_channel", $"{reference.Count} points in {Fail.Quote(reference.Name)}", $"{channel.Count} points, as in the signal channel");
            signal = new double[raw.Length];
            for (var i = 0; i < signal.Length; i++) signal[i] = raw[i] - reference.Values[i];
        }

        if (s.Kind == "absorbance")
        {
            var over = 0;
            foreach (var a in raw)
                if (a > s.LinearLimit) over++;
            if (over > 0)
                warnings.Add(new Warning("absorbance-above-linear-range", where,
                    $"{over} of {raw.Length} absorbance readings exceed {s.LinearLimit.ToString("G4", Inv)} (largest {raw.Max().ToString("G4", Inv)}); " +
                    "Beer–Lambert may not hold there (signal.linear_limit)"));
        }

        var temperatures = PointTemperatures(export, channel, model);
        var conc = GC.AllocateUninitializedArray<double>(signal.Length); // every entry is written below
        var toConcentration = model.ToConcentration;
        if (temperatures is null && model.ToConcentrations is { } all)
            all(signal, conc);
        else if (temperatures is null)
        {
            var t = model.Temperature ?? double.NaN;
            for (var i = 0; i < conc.Length; i++) conc[i] = toConcentration(signal[i], t);
        }
        else
            for (var i = 0; i < conc.Length; i++) conc[i] = toConcentration(signal[i], temperatures[i]);

        double[]? stdErrors = null;
        if (model.Curve is { } curve)
        {
            stdErrors = new double[signal.Length];
            var outside = 0;
            var fallback = model.Temperature ?? double.NaN;
            for (var i = 0; i < signal.Length; i++)
            {
                var y = model.CurveInput(signal[i], temperatures?[i] ?? fallback);
                if (!curve.Covers(y)) outside++;
                stdErrors[i] = curve.StdError(y);
            }
            if (outside > 0)
                warnings.Add(new Warning("outside-standards", where,
                    $"{outside} of {signal.Length} signal readings lie outside the standards ({curve.SignalMin.ToString("G4", Inv)} to {curve.SignalMax.ToString("G4", Inv)}); " +
                    "their concentrations are extrapolated"));
        }

        var bad = 0;
        foreach (var c in conc)
            if (!double.IsFinite(c)) bad++;
        if (bad > 0)
            warnings.Add(new Warning("conversion-undefined", where, $"{bad} of {conc.Length} readings could not be converted (the calibration curve never reaches them)"));

        if (s.CheckChannel is { } checkName && s.Kind == "absorbance")
            CheckSecondWavelength(export, s, conc, signal.Length, checkName, warnings, where);

        var trace = channel.WithValues($"[{s.Species}]", Quantity.Concentration, Units.MolPerLitre, conc);
        return new RunConversionResult(trace, model, stdErrors, warnings);
    }

    /// <summary>
    /// The forward direction, for simulation: a concentration trace of the followed species → the signal the
    /// instrument would record. <paramref name="temperature"/> supplies point temperatures where they matter.
    /// </summary>
    public static Trace ToSignal(Trace concentration, PlanRow row, SignalSettings s, Trace? temperature = null)
    {
        var model = SignalModel.For(s, row);
        var t = new double[concentration.Count];
        for (var i = 0; i < t.Length; i++)
            t[i] = temperature is null ? model.Temperature ?? s.ReferenceTemperature : Interpolate(temperature, concentration.Times[i]);
        var values = new double[concentration.Count];
        for (var i = 0; i < values.Length; i++) values[i] = model.ToSignal(concentration.Values[i], t[i]);
        return new Trace(s.Channel ?? s.Kind, model.SignalQuantity, model.SignalUnit, concentration.Times, values, model.SignalUnit);
    }

    private static void CheckQuantity(Trace channel, SignalModel model, SignalSettings s, List<Warning> warnings, string where)
    {
        if (model.SignalQuantity == Quantity.Other || channel.Quantity == model.SignalQuantity) return;
        // A column without a unit is read as absorbance; for another kind its numbers are taken as in the internal unit.
        if (channel.Quantity == Quantity.Absorbance && (channel.SourceUnit is null || channel.SourceUnit.Length == 0 || channel.SourceUnit == Units.Absorbance))
        {
            warnings.Add(new Warning("signal-unit-assumed", where,
                $"channel {Fail.Quote(channel.Name)} gives no {Units.Describe(model.SignalQuantity)} unit; its values are taken as {model.SignalUnit}"));
            return;
        }
        throw Fail.Setting(s.Source, "signal.kind", $"kind {Fail.Quote(s.Kind)} for channel {Fail.Quote(channel.Name)} measured in {channel.SourceUnit ?? channel.Unit}",
            $"a channel that measures {Units.Describe(model.SignalQuantity)} ({string.Join(", ", Units.Examples(model.SignalQuantity))})",
            "set signal.channel to the right column, or signal.kind to what it measures");
    }

    /// <summary>Each point's own temperature, K, interpolated from a temperature column; null when the run's temperature (<see cref="SignalModel.Temperature"/>) serves every point.</summary>
    private static double[]? PointTemperatures(RunExport export, Trace channel, SignalModel model)
    {
        var aux = model.UsesPointTemperature
            ? export.Auxiliary.Concat(export.Channels).FirstOrDefault(a => a.Quantity == Quantity.Temperature && a.Count > 0)
            : null;
        if (aux is null) return null;
        var result = new double[channel.Count];
        for (var i = 0; i < result.Length; i++) result[i] = Interpolate(aux, channel.Times[i]);
        return result;
    }

    /// <summary>Linear interpolation in a trace, held constant beyond its ends.</summary>
    private static double Interpolate(Trace trace, double time)
    {
        var t = trace.Times;
        var v = trace.Values;
        if (time <= t[0]) return v[0];
        if (time >= t[^1]) return v[^1];
        var j = Array.BinarySearch(t, time);
        if (j >= 0) return v[j];
        j = ~j;
        var f = (time - t[j - 1]) / (t[j] - t[j - 1]);
        return v[j - 1] + f * (v[j] - v[j - 1]);
    }

    /// <summary>
    /// A second analytical wavelength, converted on its own by Beer–Lambert, must give the same concentrations;
    /// the largest difference, relative to the concentration range of the run, must stay within signal.check_tolerance.
    /// </summary>
    private static void CheckSecondWavelength(RunExport export, SignalSettings s, double[] conc, int n, string checkName, List<Warning> warnings, string where)
    {
        var check = export.Channel(checkName, "signal.check_channel");
        if (check.Count != n)
            throw Fail.Setting(s.Source, "signal.check_channel", $"{check.Count} points in {Fail.Quote(check.Name)}", $"{n} points, as in the signal channel");
        var bl = new BeerLambert(s.CheckMolarAbsorptivity!.Value, s.PathLength, s.CheckBlank).Response;
        double worst = 0, lo = double.PositiveInfinity, hi = double.NegativeInfinity;
        for (var i = 0; i < n; i++)
        {
            if (!double.IsFinite(conc[i])) continue;
            worst = Math.Max(worst, Math.Abs(conc[i] - bl.ToConcentration(check.Values[i])));
            lo = Math.Min(lo, conc[i]);
            hi = Math.Max(hi, conc[i]);
        }
        var range = hi - lo > 0 ? hi - lo : Math.Max(Math.Abs(hi), Math.Abs(lo));
        var rel = range > 0 ? worst / range : worst > 0 ? double.PositiveInfinity : 0;
        if (rel > s.CheckTolerance)
            warnings.Add(new Warning("wavelengths-disagree", where,
                $"concentrations from {Fail.Quote(check.Name)} differ from the signal channel's by up to {(100 * rel).ToString("F1", Inv)} % of the run's range " +
                $"(signal.check_tolerance = {(100 * s.CheckTolerance).ToString("G3", Inv)} %); check the molar absorptivities, blanks, or for another absorbing species"));
    }
}
