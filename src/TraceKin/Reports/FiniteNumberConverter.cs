using System.Text.Json;
using System.Text.Json.Serialization;

namespace TraceKin.Reports;

/// <summary>
/// How summary.json writes a number: round-trip exact (the shortest text that reads back as the same double,
/// Utf8JsonWriter's own formatting), and null when it is not finite, since JSON has no NaN or infinity (RFC 8259 §6).
/// Reading gives NaN back for null, so a file read and written again is unchanged.
/// </summary>
internal sealed class FiniteNumberConverter : JsonConverter<double>
{
    public override bool HandleNull => true;

    public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options) =>
        reader.TokenType == JsonTokenType.Null ? double.NaN : reader.GetDouble();

    public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
    {
        if (double.IsFinite(value)) writer.WriteNumberValue(value);
        else writer.WriteNullValue();
    }
}
