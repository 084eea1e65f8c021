using System.Text.Json;
using TraceKin.Series;

namespace TraceKin.Reports;

/// <summary>How every JSON output writes numbers (round-trip exact, null when not finite) and the shapes shared by its blocks.</summary>
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

    /// <summary>The fields of an estimate: value, stdError, unit, dof, ci95 [low, high], method.</summary>
    public static void EstimateFields(Utf8JsonWriter w, double value, double stdError, string unit, int dof, double low, double high, string method)
    {
        Num(w, "value", value);
        Num(w, "stdError", stdError);
        w.WriteString("unit", unit);
        w.WriteNumber("dof", dof);
        Pair(w, "ci95", low, high);
        w.WriteString("method", method);
    }

    /// <summary>An array of reaction orders.</summary>
    public static void Orders(Utf8JsonWriter w, string name, IReadOnlyList<Order> orders)
    {
        w.WriteStartArray(name);
        foreach (var o in orders)
        {
            w.WriteStartObject();
            w.WriteString("species", o.Species);
            Num(w, "value", o.Value);
            Num(w, "stdError", o.StdError);
            w.WriteNumber("dof", o.Dof);
            Pair(w, "ci95", o.Ci95Low, o.Ci95High);
            Num(w, "lawChoiceStdError", o.LawChoiceStdError);
            w.WriteString("method", o.Method);
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }
}
