using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// A saturated absorbance detector reports its ceiling over and over: a run of identical readings at the trace's
/// highest value, at or above ingest.saturation_absorbance (default 2.5 AU; stray light caps most photometers between
/// 2 and 4 AU — common practice, no source). Such points say nothing about concentration, so they are excluded and
/// listed in a warning by line number.
/// </summary>
internal static class SaturationCheck
{
    /// <param name="lineOf">1-based line number of the point with a given index.</param>
    public static Trace Apply(Trace trace, Func<int, int> lineOf, IngestSettings settings, string file, List<Warning> warnings)
    {
        var threshold = settings.SaturationAbsorbance;
        if (threshold <= 0 || trace.Count == 0) return trace;
        var values = trace.Values;
        var max = double.NegativeInfinity; // the values are finite (the readers refuse anything else)
        foreach (var v in values)
            if (v > max) max = v;
        if (max < threshold) return trace;
        var excluded = new List<(int From, int To)>();
        var k = 0;
        while (k < values.Length)
        {
            var end = k;
            while (end + 1 < values.Length && values[end + 1] == values[k]) end++;
            if (values[k] == max && end - k + 1 >= settings.SaturationPoints) excluded.Add((k, end));
            k = end + 1;
        }
        if (excluded.Count == 0) return trace;
        var drop = excluded.Sum(r => r.To - r.From + 1);
        var times = new double[values.Length - drop];
        var kept = new double[values.Length - drop];
        var w = 0;
        var e = 0;
        for (var i = 0; i < values.Length; i++)
        {
            if (e < excluded.Count && i >= excluded[e].From)
            {
                if (i == excluded[e].To) e++;
                continue;
            }
            times[w] = trace.Times[i];
            kept[w++] = values[i];
        }
        var ranges = string.Join(", ", excluded.Select(r => r.From == r.To ? $"{lineOf(r.From)}" : $"{lineOf(r.From)}–{lineOf(r.To)}"));
        warnings.Add(new Warning("saturated-absorbance", $"{file}:{lineOf(excluded[0].From)}",
            $"channel {Fail.Quote(trace.Name)}: {drop} reading{(drop == 1 ? "" : "s")} stuck at {max.ToString("G6", CultureInfo.InvariantCulture)} AU (a saturated detector) excluded, lines {ranges}" +
            (kept.Length < 3 ? $"; only {kept.Length} {(kept.Length == 1 ? "reading remains" : "readings remain")}" : "")) { Channel = trace.Name });
        return trace with { Times = times, Values = kept };
    }
}
