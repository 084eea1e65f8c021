using System.Collections.Concurrent;
using System.Globalization;
using System.Text;
using TraceKin.Signal;
using TraceKin.Traces;

namespace TraceKin.Analysis;

/// <summary>
/// One copy of each value that repeats from run to run, for the runs one analysis keeps once their per-point arrays
/// are gone (<see cref="RunThinning.Strip(RunResult, bool, SharedValues?)"/>): method and rule texts, unit and law
/// names, the export's format decisions and metadata, the conversion's constants, emptied traces, empty lists. At
/// 20,000 runs these copies were about half of what a run retained. Only equal values are shared (equal text, equal
/// pairs in the same order), so every output reads the same; the copies live as long as the analysis's result.
/// Thread-safe (the workers strip runs side by side).
/// </summary>
internal sealed class SharedValues
{
    private static readonly IReadOnlyDictionary<string, string> NoMetadata = new Dictionary<string, string>();

    private readonly ConcurrentDictionary<string, string> _texts = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, KeyValuePair<string, string>[]> _pairs = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, KeyValuePair<string, double>[]> _budgets = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, IReadOnlyDictionary<string, string>> _metadata = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, Trace[]> _traces = new(StringComparer.Ordinal);

    /// <summary>The one copy of a text that repeats between runs (a method, a rule, a unit, a law's name).</summary>
    public string Text(string text) => _texts.GetOrAdd(text, text);

    public string? MaybeText(string? text) => text is null ? null : Text(text);

    /// <summary>Key/value pairs (format decisions, conversion constants): one array per distinct content.</summary>
    public IReadOnlyList<KeyValuePair<string, string>> Pairs(IReadOnlyList<KeyValuePair<string, string>> pairs)
    {
        if (pairs.Count == 0) return [];
        return _pairs.GetOrAdd(KeyOf(pairs), _ => pairs.Select(p => new KeyValuePair<string, string>(Text(p.Key), Text(p.Value))).ToArray());
    }

    /// <summary>Named numbers (the uncertainty budget), equal only when every number has the same bits.</summary>
    public IReadOnlyList<KeyValuePair<string, double>> Budget(IReadOnlyList<KeyValuePair<string, double>> budget)
    {
        if (budget.Count == 0) return [];
        var key = new StringBuilder();
        foreach (var (k, v) in budget)
            Field(key, k).Append('\u0002').Append(BitConverter.DoubleToInt64Bits(v).ToString(CultureInfo.InvariantCulture)).Append('\u0002');
        return _budgets.GetOrAdd(key.ToString(), _ => budget.Select(p => new KeyValuePair<string, double>(Text(p.Key), p.Value)).ToArray());
    }

    /// <summary>An export's preamble metadata; equal content in the same order shares one dictionary.</summary>
    public IReadOnlyDictionary<string, string> Metadata(IReadOnlyDictionary<string, string> metadata)
    {
        if (metadata.Count == 0) return NoMetadata;
        return _metadata.GetOrAdd(KeyOf(metadata), metadata);
    }

    /// <summary>A content key for text pairs in their order.</summary>
    private static string KeyOf(IEnumerable<KeyValuePair<string, string>> pairs)
    {
        var key = new StringBuilder();
        foreach (var (k, v) in pairs) Field(Field(key, k).Append('\u0002'), v).Append('\u0002');
        return key.ToString();
    }

    /// <summary>Traces with their points already removed: equal names, quantities and units share one array of traces.</summary>
    public IReadOnlyList<Trace> EmptyTraces(IReadOnlyList<Trace> traces)
    {
        if (traces.Count == 0) return [];
        var key = new StringBuilder();
        foreach (var t in traces) Describe(key, t);
        return _traces.GetOrAdd(key.ToString(), _ => traces.Select(t => Empty(t)).ToArray());
    }

    /// <summary>A trace without points, shared with every equal one.</summary>
    public Trace EmptyTrace(Trace trace) => EmptyTraces([trace])[0];

    private readonly ConcurrentDictionary<ConvertedRun, ConvertedRun> _conversions = new(new SameConversion());

    /// <summary>A conversion already stripped of its points and sharing its parts: one object for every equal one.</summary>
    public ConvertedRun Conversion(ConvertedRun stripped) => _conversions.GetOrAdd(stripped, stripped);

    /// <summary>Equal parts by reference (they are the shared copies), numbers by their bits (so 0 and −0 stay apart).</summary>
    private sealed class SameConversion : IEqualityComparer<ConvertedRun>
    {
        public bool Equals(ConvertedRun? a, ConvertedRun? b) =>
            ReferenceEquals(a, b) || (a is not null && b is not null && a.StdErrors is null && b.StdErrors is null
                && ReferenceEquals(a.Concentration, b.Concentration) && a.Species == b.Species
                && Bits(a.Coefficient) == Bits(b.Coefficient) && Bits(a.RelativeSystematicUncertainty) == Bits(b.RelativeSystematicUncertainty)
                && ReferenceEquals(a.ConstantsUsed, b.ConstantsUsed) && ReferenceEquals(a.UncertaintyBudget, b.UncertaintyBudget)
                && ReferenceEquals(a.Warnings, b.Warnings) && a.Equals(b)); // the record's own equality covers any later member

        public int GetHashCode(ConvertedRun c) => HashCode.Combine(c.Species, Bits(c.Coefficient), Bits(c.RelativeSystematicUncertainty),
            System.Runtime.CompilerServices.RuntimeHelpers.GetHashCode(c.ConstantsUsed));

        private static long Bits(double x) => BitConverter.DoubleToInt64Bits(x);
    }

    /// <summary>A list of warnings, shared when empty (the warnings themselves already share their codes and file names).</summary>
    public static IReadOnlyList<Warning> Warnings(IReadOnlyList<Warning> warnings) => warnings.Count == 0 ? [] : warnings;

    private Trace Empty(Trace t) => t with
    {
        Name = Text(t.Name), Unit = Text(t.Unit), SourceUnit = MaybeText(t.SourceUnit), Times = [], Values = [],
    };

    private static void Describe(StringBuilder key, Trace t)
    {
        Field(key, t.Name).Append('\u0002').Append((int)t.Quantity).Append('\u0002');
        Field(key, t.Unit).Append('\u0002');
        if (t.SourceUnit is null) key.Append('\u0004');
        else Field(key, t.SourceUnit);
        key.Append('\u0003');
    }

    /// <summary>A field of a content key: its length first, so no text can be mistaken for two.</summary>
    private static StringBuilder Field(StringBuilder key, string text) =>
        key.Append(text.Length.ToString(CultureInfo.InvariantCulture)).Append(':').Append(text);
}
