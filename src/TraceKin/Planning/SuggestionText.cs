using System.Text;
using TraceKin.Reports;

namespace TraceKin.Planning;

/// <summary>
/// The suggestion in plain lines for the console and suggestion.txt: the current design's weaknesses, the proposed runs,
/// the expected standard errors (Fisher information) and the simulated 95 % interval widths side by side, the chance that
/// AICc tells the two laws apart, why these levels, and the cautions. Numbers through <see cref="ReportNumber.Plain"/>.
/// </summary>
public static class SuggestionText
{
    public const string FileName = "suggestion.txt";

    public static string Format(RunSuggestion s, IReadOnlyList<string> newIds)
    {
        var q = s.Request;
        var sb = new StringBuilder();
        if (q.Existing.Count > 0)
        {
            sb.Append("Current design (").Append(q.Existing.Count).Append(" runs):\n");
            if (s.Weaknesses.Count == 0) sb.Append("  no weakness found in spans, collinearity or temperature levels\n");
            foreach (var w in s.Weaknesses) sb.Append("  - ").Append(w).Append('\n');
        }
        sb.Append("Proposed runs (plan.csv):\n");
        var runs = s.NewRuns;
        for (var i = 0; i < runs.Count; i++)
        {
            sb.Append("  ").Append(newIds[i]).Append(':');
            foreach (var sp in q.Law.Species) sb.Append(" [").Append(sp).Append("]0 = ").Append(ReportNumber.Plain(runs[i].Concentrations[sp] * 1000)).Append(" mmol/L");
            if (runs[i].TemperatureK is { } t) sb.Append(", ").Append(ReportNumber.Plain(t - 273.15)).Append(" °C");
            sb.Append('\n');
        }
        sb.Append("Expected standard error (Fisher information of the weighted fit): parameter, value, now, with the proposed runs, with as many replicates of the current runs\n");
        foreach (var e in s.Predicted)
            sb.Append("  ").Append(e.Parameter).Append(e.Unit.Length > 0 ? $" ({e.Unit})" : "").Append(": ").Append(ReportNumber.Plain(e.Value)).Append(", ")
              .Append(ReportNumber.Plain(e.Now, 3)).Append(", ").Append(ReportNumber.Plain(e.Proposed, 3)).Append(", ").Append(ReportNumber.Plain(e.Replicated, 3)).Append('\n');
        if (s.Simulated.Count > 0)
        {
            sb.Append("Simulated median 95 % interval width (").Append(q.Draws).Append(" draws, seed ").Append(q.Seed).Append(", the series fit TraceKin reports): ")
              .Append(string.Join(", ", s.Simulated.Select(d => d.Name))).Append('\n');
            var targets = s.Simulated[0].Intervals.Select(x => x.Parameter).ToList();
            for (var j = 0; j < targets.Count; j++)
            {
                sb.Append("  ").Append(targets[j]).Append(targets[j] == "Ea" ? " (kJ/mol)" : "").Append(": ");
                sb.Append(string.Join(", ", s.Simulated.Select(d =>
                {
                    var x = d.Intervals[j];
                    var w = ReportNumber.Plain(x.MedianWidth, 3);
                    return x.Fitted < x.Draws ? $"{w} (fitted in {x.Fitted} of {x.Draws})" : w;
                }))).Append('\n');
            }
            if (s.Simulated.All(d => d.Distinguishable is not null))
                sb.Append("Probability that AICc prefers the simulated law by more than 2: ")
                  .Append(string.Join(", ", s.Simulated.Select(d => $"{d.Name} {ReportNumber.Plain(100 * d.Distinguishable!.Value, 2)} %"))).Append('\n');
        }
        sb.Append("Why:\n");
        foreach (var line in s.Explanation) sb.Append("  ").Append(line).Append('\n');
        return sb.ToString();
    }
}
