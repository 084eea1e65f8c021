using System.Text.Json;
using System.Text.Json.Serialization;

namespace TraceKin.Reports;

/// <summary>
/// The source-generated serialiser of summary.json's records: camelCase names, indented, every double through
/// <see cref="FiniteNumberConverter"/>, text through <see cref="SummaryTextEncoder"/>.
/// </summary>
[JsonSourceGenerationOptions(
    WriteIndented = true,
    PropertyNamingPolicy = JsonKnownNamingPolicy.CamelCase,
    DefaultIgnoreCondition = JsonIgnoreCondition.Never,
    Converters = [typeof(FiniteNumberConverter)])]
[JsonSerializable(typeof(SummaryRecord))]
internal sealed partial class SummaryJsonContext : JsonSerializerContext
{
    /// <summary>The context summary.json is written with (the generated options plus the encoder, which an attribute cannot name).</summary>
    public static SummaryJsonContext Writer { get; } = new(new JsonSerializerOptions
    {
        WriteIndented = true,
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        DefaultIgnoreCondition = JsonIgnoreCondition.Never,
        Converters = { new FiniteNumberConverter() },
        Encoder = SummaryTextEncoder.Instance,
    });
}
