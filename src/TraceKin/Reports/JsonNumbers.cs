using System.Text.Json;

namespace TraceKin.Reports;

/// <summary>How every JSON output writes numbers: round-trip exact, and null when not finite.</summary>
internal static class JsonNumbers
{
    public static void Num(Utf8JsonWriter w, string name, double? v)
    {
        w.WritePropertyName(name);
        Val(w, v);
    }

    public static void Val(Utf8JsonWriter w, double? v)
    {
        if (v is { } d && double.IsFinite(d)) w.WriteNumberValue(d);
        else w.WriteNullValue();
    }

    /// <summary>An interval as a two-element array [low, high].</summary>
    public static void Pair(Utf8JsonWriter w, string name, double a, double b)
    {
        w.WriteStartArray(name);
        Val(w, a);
        Val(w, b);
        w.WriteEndArray();
    }
}
