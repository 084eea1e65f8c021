using TraceKin.Tests.Support;
using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using Json.Schema;

namespace TraceKin.Tests.Reports;

/// <summary>
/// docs/summary.schema.json (JSON Schema draft 2020-12) against summary.json files that analyse really writes, validated
/// by JsonSchema.Net (a general implementation of the 2020-12 specification), plus a check that every property written
/// is declared in the schema, so a renamed property fails even where the schema lets unknown properties through.
/// </summary>
public sealed class SummarySchemaTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{
    [Fact]
    public void Schema_declares_draft_2020_12()
    {
        Assert.Equal("https://json-schema.org/draft/2020-12/schema", SchemaCheck.SchemaDocument.GetProperty("$schema").GetString());
    }

    [Theory]
    [InlineData("violet-complex-acid", 8)]
    [InlineData("amber-ester-warmth", 15)]
    [InlineData("teal-lactonase-plate", 32)]
    public void Summary_of_each_demo_series_matches_the_schema_and_declares_every_property(string demo, int runs)
    {
        using var outDir = new RepoPaths.TempDir();
        AnalysedSample.Analyse(RepoPaths.Sample(demo), outDir.Path, plots: true);
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir.Path, "summary.json")));
        Assert.Empty(SchemaCheck.Check(doc.RootElement));
        Assert.Equal(runs, doc.RootElement.GetProperty("runs").GetArrayLength());
    }

    [Fact]
    public void Summary_without_plots_matches_the_schema()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(sample.NoPlotsDir, "summary.json")));
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("runs")[0].GetProperty("plotFile").ValueKind);
        Assert.Empty(SchemaCheck.Check(doc.RootElement));
    }

    [Fact]
    public void Summary_with_a_rejected_file_and_warnings_matches_the_schema()
    {
        var series = RepoPaths.NewTempDir("tracekin-schema-series");
        var outDir = RepoPaths.NewTempDir("tracekin-schema-out");
        try
        {
            RepoPaths.CopyDir(RepoPaths.Sample("violet-complex-acid"), series);
            File.WriteAllText(Path.Combine(series, "plan.csv"), File.ReadAllText(Path.Combine(series, "plan.csv")).TrimEnd() + "\nR9,missing.csv,25.0,0.40,100,JS\n");
            File.WriteAllText(Path.Combine(series, "stray.csv"), "time (s),A530\n0,0.1\n");
            AnalysedSample.Analyse(series, outDir, plots: false);
            using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir, "summary.json")));
            Assert.Equal(1, doc.RootElement.GetProperty("rejected").GetArrayLength());
            Assert.True(doc.RootElement.GetProperty("warnings").GetArrayLength() >= 1);
            Assert.Empty(SchemaCheck.Check(doc.RootElement));
        }
        finally
        {
            Directory.Delete(series, recursive: true);
            Directory.Delete(outDir, recursive: true);
        }
    }

    private JsonNode Sample() => JsonNode.Parse(File.ReadAllText(sample.SummaryPath))!;

    private static List<string> CheckOf(JsonNode node)
    {
        using var doc = JsonDocument.Parse(node.ToJsonString());
        return SchemaCheck.Check(doc.RootElement);
    }

    private static void Rename(JsonObject o, string from, string to)
    {
        var v = o[from];
        o.Remove(from);
        o[to] = v;
    }

    [Fact]
    public void The_unchanged_sample_passes_so_the_cases_below_fail_for_their_change_alone()
    {
        Assert.Empty(CheckOf(Sample()));
    }

    [Fact]
    public void Removing_a_required_property_fails()
    {
        var node = Sample();
        node.AsObject().Remove("rateConstant");
        node["runs"]![0]!["initialRate"]!.AsObject().Remove("stdError");
        var errors = CheckOf(node);
        Assert.Contains(errors, e => e.StartsWith("/: required:", StringComparison.Ordinal) && e.Contains("rateConstant", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("/runs/0/initialRate: required:", StringComparison.Ordinal) && e.Contains("stdError", StringComparison.Ordinal));
        Assert.Equal(2, errors.Count);
    }

    [Fact]
    public void Renaming_a_required_property_fails_as_missing_and_as_undeclared()
    {
        var node = Sample();
        Rename(node["powerLaw"]!.AsObject(), "curvature", "curvatures");
        var errors = CheckOf(node);
        Assert.Contains(errors, e => e.StartsWith("/powerLaw: required:", StringComparison.Ordinal) && e.Contains("curvature", StringComparison.Ordinal));
        Assert.Contains("$.powerLaw.curvatures: not declared in the schema", errors);
        Assert.Equal(2, errors.Count);
    }

    [Fact]
    public void Renaming_an_optional_property_fails_as_undeclared()
    {
        // initialRate.modelStdError is not required, and initialRate lets unknown properties through.
        var node = Sample();
        Rename(node["runs"]![2]!["initialRate"]!.AsObject(), "modelStdError", "modelStdErr");
        Assert.Equal(["$.runs[].initialRate.modelStdErr: not declared in the schema"], CheckOf(node));
    }

    [Fact]
    public void A_wrong_type_a_value_outside_an_enum_and_a_pattern_mismatch_fail()
    {
        var node = Sample();
        node["orders"]![0]!["dof"] = "five";
        node["powerLaw"]!["orderVerdicts"]![0]!["verdict"] = "maybe";
        node["runs"]![1]!["sha256"] = "not-a-hash";
        var errors = CheckOf(node);
        Assert.Contains(errors, e => e.StartsWith("/orders/0/dof: type:", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("/powerLaw/orderVerdicts/0/verdict: enum:", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("/runs/1/sha256: pattern:", StringComparison.Ordinal));
        Assert.Equal(3, errors.Count);
    }
}

/// <summary>summary.json against docs/summary.schema.json: JsonSchema.Net's validation plus every written property declared.</summary>
public static class SchemaCheck
{
    private static readonly string SchemaText = File.ReadAllText(Path.Combine(RepoPaths.Docs, "summary.schema.json"));

    public static JsonElement SchemaDocument { get; } = JsonDocument.Parse(SchemaText).RootElement.Clone();

    private static readonly JsonSchema Schema = JsonSchema.FromText(SchemaText);

    /// <summary>Every schema error and every undeclared property, each as one line.</summary>
    public static List<string> Check(JsonElement instance) =>
        [.. Validate(instance), .. Undocumented(SchemaDocument, instance).Select(p => p + ": not declared in the schema")];

    /// <summary>The schema's errors, as "instance location: keyword: message" (location as a JSON Pointer, "/" for the root).</summary>
    public static List<string> Validate(JsonElement instance)
    {
        var result = Schema.Evaluate(instance, new EvaluationOptions { OutputFormat = OutputFormat.List });
        if (result.IsValid) return [];
        var errors = new List<string>();
        foreach (var d in result.Details ?? [])
            foreach (var (keyword, message) in d.Errors ?? new Dictionary<string, string>())
            {
                var at = d.InstanceLocation.ToString();
                errors.Add($"{(at.Length == 0 ? "/" : at)}: {keyword}: {message}");
            }
        return errors.Distinct().ToList();
    }

    private static JsonElement Resolve(JsonElement root, JsonElement schema)
    {
        while (schema.ValueKind == JsonValueKind.Object && schema.TryGetProperty("$ref", out var r))
        {
            var path = r.GetString()!;
            if (!path.StartsWith("#/", StringComparison.Ordinal)) throw new NotSupportedException("only local $ref: " + path);
            var target = root;
            foreach (var part in path[2..].Split('/')) target = target.GetProperty(part);
            schema = target;
        }
        return schema;
    }

    /// <summary>Paths of object properties in <paramref name="instance"/> that the schema neither declares nor allows as additional.</summary>
    public static List<string> Undocumented(JsonElement schema, JsonElement instance)
    {
        var found = new List<string>();
        Walk(schema, schema, instance, "$", found);
        return found.Distinct().ToList();
    }

    private static void Walk(JsonElement root, JsonElement schema, JsonElement v, string at, List<string> found)
    {
        schema = Resolve(root, schema);
        if (schema.ValueKind != JsonValueKind.Object) return;
        if (v.ValueKind == JsonValueKind.Object)
        {
            var props = schema.TryGetProperty("properties", out var p) ? p : default;
            var extra = schema.TryGetProperty("additionalProperties", out var x) ? x : default;
            foreach (var m in v.EnumerateObject())
            {
                if (props.ValueKind == JsonValueKind.Object && props.TryGetProperty(m.Name, out var sub)) Walk(root, sub, m.Value, $"{at}.{m.Name}", found);
                else if (extra.ValueKind == JsonValueKind.Object) Walk(root, extra, m.Value, $"{at}.{m.Name}", found);
                else if (extra.ValueKind != JsonValueKind.True) found.Add(Regex.Replace($"{at}.{m.Name}", @"\[\d+\]", "[]"));
            }
        }
        else if (v.ValueKind == JsonValueKind.Array && schema.TryGetProperty("items", out var items))
            foreach (var item in v.EnumerateArray()) Walk(root, items, item, at + "[]", found);
    }
}
