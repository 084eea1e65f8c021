using TraceKin.Tests.Support;
using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;

namespace TraceKin.Tests.Reports;

/// <summary>
/// docs/summary.schema.json (JSON Schema draft 2020-12) against summary.json files that analyse really writes. The
/// checker below implements the keywords the schema uses (type, const, required, properties, additionalProperties,
/// items, minItems, maxItems, pattern, local $ref) as the 2020-12 validation vocabulary defines them.
/// </summary>
public sealed class SummarySchemaTests(AnalysedSample sample) : IClassFixture<AnalysedSample>
{
    private static JsonElement Schema { get; } = JsonDocument.Parse(File.ReadAllText(Path.Combine(RepoPaths.Docs, "summary.schema.json"))).RootElement;

    [Fact]
    public void Schema_declares_draft_2020_12()
    {
        Assert.Equal("https://json-schema.org/draft/2020-12/schema", Schema.GetProperty("$schema").GetString());
    }

    [Fact]
    public void Summary_of_the_sample_matches_the_schema()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(sample.SummaryPath));
        Assert.Empty(SchemaCheck.Validate(Schema, doc.RootElement));
        Assert.Equal(8, doc.RootElement.GetProperty("runs").GetArrayLength());
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
            Assert.Empty(SchemaCheck.Validate(Schema, doc.RootElement));
        }
        finally
        {
            Directory.Delete(series, recursive: true);
            Directory.Delete(outDir, recursive: true);
        }
    }

    [Fact]
    public void Every_property_summary_json_writes_is_documented_in_the_schema()
    {
        using var doc = JsonDocument.Parse(File.ReadAllText(sample.SummaryPath));
        var undocumented = SchemaCheck.Undocumented(Schema, doc.RootElement);
        Assert.True(undocumented.Count == 0, "add these to docs/summary.schema.json: " + string.Join(", ", undocumented));
    }

    [Fact]
    public void Checker_finds_a_missing_required_property_and_a_wrong_type()
    {
        // Without this, a checker that accepts everything would pass the tests above.
        var node = JsonNode.Parse(File.ReadAllText(sample.SummaryPath))!;
        node["runs"]![0]!["initialRate"]!.AsObject().Remove("stdError");
        node["orders"]![0]!["dof"] = "five";
        node["runs"]![1]!["sha256"] = "not-a-hash";
        using var doc = JsonDocument.Parse(node.ToJsonString());
        var errors = SchemaCheck.Validate(Schema, doc.RootElement);
        Assert.Contains("$.runs[0].initialRate: missing required property stdError", errors);
        Assert.Contains("$.orders[0].dof: expected integer, found String", errors);
        Assert.Contains(errors, e => e.StartsWith("$.runs[1].sha256: does not match", StringComparison.Ordinal));
        Assert.Equal(3, errors.Count);
    }
}

/// <summary>A small JSON Schema 2020-12 checker for the keywords docs/summary.schema.json uses.</summary>
public static class SchemaCheck
{
    public static List<string> Validate(JsonElement schema, JsonElement instance)
    {
        var errors = new List<string>();
        Check(schema, schema, instance, "$", errors);
        return errors;
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

    private static bool HasType(JsonElement v, string type) => type switch
    {
        "object" => v.ValueKind == JsonValueKind.Object,
        "array" => v.ValueKind == JsonValueKind.Array,
        "string" => v.ValueKind == JsonValueKind.String,
        "number" => v.ValueKind == JsonValueKind.Number,
        "integer" => v.ValueKind == JsonValueKind.Number && v.TryGetDouble(out var d) && Math.Floor(d) == d,
        "boolean" => v.ValueKind is JsonValueKind.True or JsonValueKind.False,
        "null" => v.ValueKind == JsonValueKind.Null,
        _ => throw new NotSupportedException("type " + type),
    };

    private static void Check(JsonElement root, JsonElement schema, JsonElement v, string at, List<string> errors)
    {
        schema = Resolve(root, schema);
        if (schema.ValueKind == JsonValueKind.True) return;
        if (schema.TryGetProperty("type", out var type))
        {
            var types = type.ValueKind == JsonValueKind.Array ? type.EnumerateArray().Select(t => t.GetString()!).ToArray() : [type.GetString()!];
            if (!types.Any(t => HasType(v, t)))
            {
                errors.Add($"{at}: expected {string.Join(" or ", types)}, found {v.ValueKind}");
                return;
            }
        }
        if (schema.TryGetProperty("const", out var c) && c.GetRawText() != v.GetRawText())
            errors.Add($"{at}: expected {c.GetRawText()}, found {v.GetRawText()}");
        if (schema.TryGetProperty("pattern", out var pattern) && v.ValueKind == JsonValueKind.String && !Regex.IsMatch(v.GetString()!, pattern.GetString()!))
            errors.Add($"{at}: does not match {pattern.GetString()}");
        if (v.ValueKind == JsonValueKind.Object)
        {
            if (schema.TryGetProperty("required", out var req))
                foreach (var name in req.EnumerateArray().Select(x => x.GetString()!))
                    if (!v.TryGetProperty(name, out _)) errors.Add($"{at}: missing required property {name}");
            var props = schema.TryGetProperty("properties", out var p) ? p : default;
            foreach (var member in v.EnumerateObject())
            {
                if (props.ValueKind == JsonValueKind.Object && props.TryGetProperty(member.Name, out var sub))
                    Check(root, sub, member.Value, $"{at}.{member.Name}", errors);
                else if (schema.TryGetProperty("additionalProperties", out var extra) && extra.ValueKind == JsonValueKind.Object)
                    Check(root, extra, member.Value, $"{at}.{member.Name}", errors);
                else if (schema.TryGetProperty("additionalProperties", out var no) && no.ValueKind == JsonValueKind.False)
                    errors.Add($"{at}: property {member.Name} is not allowed");
            }
        }
        if (v.ValueKind == JsonValueKind.Array)
        {
            var n = v.GetArrayLength();
            if (schema.TryGetProperty("minItems", out var min) && n < min.GetInt32()) errors.Add($"{at}: {n} items, fewer than {min.GetInt32()}");
            if (schema.TryGetProperty("maxItems", out var max) && n > max.GetInt32()) errors.Add($"{at}: {n} items, more than {max.GetInt32()}");
            if (schema.TryGetProperty("items", out var items))
            {
                var i = 0;
                foreach (var item in v.EnumerateArray()) Check(root, items, item, $"{at}[{i++}]", errors);
            }
        }
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
