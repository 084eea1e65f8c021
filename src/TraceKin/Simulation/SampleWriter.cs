using TraceKin.Analysis;
using System.Globalization;
using System.Text;
using TraceKin.Setup;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Simulation;

/// <summary>How simulated exports are sampled and how noisy they are.</summary>
public sealed record SamplingPlan(double Duration, double Interval, double Noise, int Seed, double DeadTime = 0);

/// <summary>
/// Writes one export per plan row from a simulated rate law, through the forward signal conversion of series.toml
/// (concentration → signal), with seeded Gaussian noise. The text format is the plain one `analyse` reads.
/// </summary>
public static class SampleWriter
{
    public static string ExportText(PlanRow row, SeriesConfig config, SimulatedLaw law, SamplingPlan sampling)
    {
        var count = (int)Math.Floor(sampling.Duration / sampling.Interval) + 1;
        var times = Enumerable.Range(0, count).Select(i => sampling.DeadTime + i * sampling.Interval).ToArray();
        var conc = RateLawSimulator.Integrate(law, row.InitialConcentrations, row.TemperatureK, times);
        var s = config.Signal;
        if (!conc.TryGetValue(s.Species, out var tracked))
            throw Fail.Setting(config.File, "signal.species", Fail.Quote(s.Species), "a species of the simulated law or of plan.csv");
        // A seed per run, derived from the run id, so runs do not share noise and adding a run changes no other.
        var rng = new Random(unchecked(sampling.Seed * 31 + StableHash(row.Run)));
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.AppendLine(ci, $"# simulated by TraceKin {Analysis.SeriesRunner.ToolVersion}; seed {sampling.Seed}");
        sb.AppendLine(ci, $"run: {row.Run}");
        // Times are written from mixing; with a dead time the first sample is not at 0, so the moment of mixing is stated.
        if (sampling.DeadTime > 0) sb.AppendLine("mixed at: 0 s");
        if (row.TemperatureK is { } tk) sb.AppendLine(ci, $"temperature: {tk - 273.15:0.00} °C");
        var (header, unit) = SignalHeader(s);
        sb.AppendLine($"time (s),{header}");
        var signal = Conversion.ToSignal(new Trace($"[{s.Species}]", Quantity.Concentration, Units.MolPerLitre, times, tracked), row, s with { Source = config.File });
        // A gas collector zeroed after mixing reads the gas formed since its zero, set here at the first sample.
        var zeroAt = s.Kind == "gas_volume" && s.ZeroedAfterMixing ? signal.Values[0] - s.ZeroOffset : 0;
        for (var i = 0; i < count; i++)
        {
            var value = unit.FromInternal(signal.Values[i] - zeroAt) + RateLawSimulator.Gaussian(rng, sampling.Noise);
            var text = value.ToString(s.Kind == "absorbance" ? "0.000000" : "G9", ci);
            sb.AppendLine(ci, $"{times[i]:0.###},{text}");
        }
        return sb.ToString();
    }

    /// <summary>
    /// One plate export in the grid layout (docs/formats.md, "Plate exports") for every plan row that names this file:
    /// a grid of <paramref name="plateRows"/> × <paramref name="plateColumns"/> wells per reading, each planned well its
    /// row's simulated signal (a blank row, role "blank", holds no reacting enzyme: its law runs at rate zero), every
    /// other well the signal of nothing reacting, all plus a baseline that drifts by <paramref name="baselineDrift"/>
    /// signal units per second (a background common to the plate, which the blank wells record).
    /// </summary>
    public static string PlateText(IReadOnlyList<PlanRow> rows, SeriesConfig config, SimulatedLaw law, SamplingPlan sampling,
        int plateRows, int plateColumns, double baselineDrift)
    {
        var count = (int)Math.Floor(sampling.Duration / sampling.Interval) + 1;
        var times = Enumerable.Range(0, count).Select(i => sampling.DeadTime + i * sampling.Interval).ToArray();
        var s = config.Signal;
        var (_, unit) = SignalHeader(s);
        var byWell = rows.ToDictionary(r => WellName.Normalise(r.Channel) ?? throw Fail.At("plan.csv", r.ChannelCell.Line, r.ChannelCell.Column,
            Fail.Quote(r.Channel ?? ""), "a well name such as \"B7\" for a run on a plate"), r => r);
        var wells = new double[plateRows * plateColumns][];
        for (var r = 0; r < plateRows; r++)
            for (var c = 0; c < plateColumns; c++)
            {
                var name = $"{WellName.RowLetters(r)}{c + 1}";
                var row = byWell.GetValueOrDefault(name) ?? new PlanRow(name, rows[0].File, rows[0].TemperatureK, new Dictionary<string, double>(), new Dictionary<string, string>(), 0);
                var active = byWell.ContainsKey(name) && row.Role != "blank";
                wells[r * plateColumns + c] = SignalValues(row, config, active ? law : law with { RateConstant = 0 }, sampling, times, unit);
                byWell.Remove(name);
            }
        if (byWell.Count > 0)
            throw Fail.At("plan.csv", byWell.First().Value.ChannelCell.Line, byWell.First().Value.ChannelCell.Column, $"well {byWell.First().Key}",
                $"a well of a {plateRows} × {plateColumns} plate (A1–{WellName.RowLetters(plateRows - 1)}{plateColumns})");
        var ci = CultureInfo.InvariantCulture;
        var sb = new StringBuilder();
        sb.AppendLine(ci, $"# simulated by TraceKin {Analysis.SeriesRunner.ToolVersion}; seed {sampling.Seed}");
        sb.AppendLine(ci, $"plate: {plateRows * plateColumns} wells");
        sb.AppendLine();
        for (var i = 0; i < count; i++)
        {
            sb.AppendLine(ci, $"time (s),{times[i]:0.###}");
            for (var c = 1; c <= plateColumns; c++) sb.Append(ci, $",{c}");
            sb.AppendLine();
            for (var r = 0; r < plateRows; r++)
            {
                sb.Append(WellName.RowLetters(r));
                for (var c = 0; c < plateColumns; c++)
                    sb.Append(',').Append((wells[r * plateColumns + c][i] + baselineDrift * times[i]).ToString(s.Kind == "absorbance" ? "0.00000" : "G9", ci));
                sb.AppendLine();
            }
            sb.AppendLine();
        }
        return sb.ToString();
    }

    /// <summary>A run's simulated signal at each time, in the export's unit, with the run's own seeded noise.</summary>
    private static double[] SignalValues(PlanRow row, SeriesConfig config, SimulatedLaw law, SamplingPlan sampling, double[] times, UnitInfo unit)
    {
        var s = config.Signal;
        var conc = RateLawSimulator.Integrate(law, row.InitialConcentrations, row.TemperatureK, times);
        var tracked = conc.TryGetValue(s.Species, out var t) ? t : new double[times.Length];
        var rng = new Random(unchecked(sampling.Seed * 31 + StableHash(row.Run)));
        var signal = Conversion.ToSignal(new Trace($"[{s.Species}]", Quantity.Concentration, Units.MolPerLitre, times, tracked), row, s with { Source = config.File });
        var result = new double[times.Length];
        for (var i = 0; i < result.Length; i++) result[i] = unit.FromInternal(signal.Values[i]) + RateLawSimulator.Gaussian(rng, sampling.Noise);
        return result;
    }

    /// <summary>The signal column's header and the unit its numbers are written in: signal.channel when set, else a default per kind.</summary>
    private static (string Header, UnitInfo Unit) SignalHeader(SignalSettings s)
    {
        var column = SignalKinds.Find(s.Kind)?.SampleColumn ?? ("A", Units.Absorbance);
        var header = s.Channel ?? column.Header;
        var open = header.LastIndexOfAny(['(', '[']);
        var unit = open >= 0 ? Units.Find(header[(open + 1)..].TrimEnd(')', ']', ' ')) : null;
        return (header, unit ?? Units.Find(column.Unit)!);
    }

    private static int StableHash(string s)
    {
        var h = 17;
        foreach (var ch in s) h = unchecked(h * 31 + ch);
        return h;
    }
}
