using System.Globalization;
using System.Reflection;
using System.Runtime.CompilerServices;
using System.Text;

namespace TraceKin.Tests.Architecture;

/// <summary>
/// A text listing of an assembly's public surface, read by reflection: every public type (header line: modifiers,
/// kind, full name, base type and interfaces) and under it, indented, every public or protected member it declares,
/// with C#-like signatures (parameter names and defaults, nullable annotations, get/set/init, required, static,
/// abstract, virtual, override). Members the compiler makes for every record (Equals, GetHashCode, ToString, ==, !=,
/// Deconstruct, EqualityContract, PrintMembers, the clone method) are left out: the header says "record". Types and
/// members are in ordinal order, so the listing changes only when the surface does.
/// </summary>
public static class PublicApi
{
    public static string Listing(IEnumerable<Type> types) =>
        string.Join("\n", Entries(types).Select(e => e.Header + "\n" + string.Concat(e.Members.Select(m => "  " + m + "\n"))));

    public static List<(string Header, List<string> Members)> Entries(IEnumerable<Type> types)
    {
        var nullability = new NullabilityInfoContext();
        return types.Where(t => t.IsVisible && t.GetCustomAttribute<CompilerGeneratedAttribute>() is null)
            .OrderBy(t => Name(t), StringComparer.Ordinal)
            .Select(t => (Header(t), Members(t, nullability).Distinct().Order(StringComparer.Ordinal).ToList()))
            .ToList();
    }

    /// <summary>Lines of <paramref name="actual"/> missing from <paramref name="expected"/> (+) and the reverse (−), each naming its type.</summary>
    public static List<string> Differences(string expected, string actual)
    {
        static HashSet<string> Keys(string text)
        {
            var keys = new HashSet<string>(StringComparer.Ordinal);
            string? type = null;
            foreach (var line in text.Replace("\r\n", "\n").Split('\n'))
            {
                if (line.Length == 0) continue;
                if (line.StartsWith("  ", StringComparison.Ordinal)) keys.Add($"{type} :: {line.Trim()}");
                else keys.Add(type = line);
            }
            return keys;
        }
        var e = Keys(expected);
        var a = Keys(actual);
        return [.. a.Where(k => !e.Contains(k)).Order(StringComparer.Ordinal).Select(k => "+ " + k),
                .. e.Where(k => !a.Contains(k)).Order(StringComparer.Ordinal).Select(k => "- " + k)];
    }

    private static bool IsRecord(Type t) => t.GetMethod("<Clone>$", BindingFlags.Public | BindingFlags.Instance) is not null;

    private static string Header(Type t)
    {
        var sb = new StringBuilder("public ");
        string kind;
        if (t.IsInterface) kind = "interface";
        else if (t.IsEnum) kind = "enum";
        else if (t.IsValueType) kind = IsRecordStruct(t) ? "record struct" : "struct";
        else if (typeof(Delegate).IsAssignableFrom(t)) kind = "delegate";
        else
        {
            if (t.IsAbstract && t.IsSealed) sb.Append("static ");
            else if (t.IsAbstract) sb.Append("abstract ");
            else if (t.IsSealed) sb.Append("sealed ");
            kind = IsRecord(t) ? "record" : "class";
        }
        if (kind == "delegate")
        {
            var invoke = t.GetMethod("Invoke")!;
            return $"public delegate {TypeName(invoke.ReturnType, new NullabilityInfoContext().Create(invoke.ReturnParameter))} {Name(t)}({Parameters(invoke, new NullabilityInfoContext())})";
        }
        sb.Append(kind).Append(' ').Append(Name(t));
        if (t.IsGenericTypeDefinition) sb.Append('<').Append(string.Join(", ", t.GetGenericArguments().Select(a => a.Name))).Append('>');
        var bases = new List<string>();
        if (t.IsEnum) bases.Add(TypeName(Enum.GetUnderlyingType(t)));
        else if (t.BaseType is { } b && b != typeof(object) && b != typeof(ValueType)) bases.Add(TypeName(b));
        if (!t.IsEnum) bases.AddRange(t.GetInterfaces().Where(i => i.IsVisible).Select(i => TypeName(i)).Order(StringComparer.Ordinal));
        if (bases.Count > 0) sb.Append(" : ").Append(string.Join(", ", bases));
        return sb.ToString();
    }

    private static bool IsRecordStruct(Type t) =>
        t.GetMethod("PrintMembers", BindingFlags.NonPublic | BindingFlags.Instance) is { } m && m.GetCustomAttribute<CompilerGeneratedAttribute>() is not null;

    private static bool Visible(MethodBase? m) => m is not null && (m.IsPublic || m.IsFamily || m.IsFamilyOrAssembly);

    private static string Access(MethodBase m) => m.IsPublic ? "public" : "protected";

    private static IEnumerable<string> Members(Type t, NullabilityInfoContext n)
    {
        if (typeof(Delegate).IsAssignableFrom(t) && t != typeof(Delegate)) yield break;
        const BindingFlags all = BindingFlags.Public | BindingFlags.NonPublic | BindingFlags.Instance | BindingFlags.Static | BindingFlags.DeclaredOnly;
        var record = IsRecord(t) || IsRecordStruct(t);
        bool Skip(MemberInfo m) => m.Name.Contains('<') || (record && m.GetCustomAttribute<CompilerGeneratedAttribute>() is not null);

        if (t.IsEnum)
        {
            foreach (var f in t.GetFields(BindingFlags.Public | BindingFlags.Static))
                yield return $"{f.Name} = {Convert.ToString(f.GetRawConstantValue(), CultureInfo.InvariantCulture)}";
            yield break;
        }
        foreach (var f in t.GetFields(all))
        {
            if (!(f.IsPublic || f.IsFamily || f.IsFamilyOrAssembly) || Skip(f)) continue;
            var access = f.IsPublic ? "public" : "protected";
            if (f.IsLiteral) yield return $"{access} const {TypeName(f.FieldType, n.Create(f))} {f.Name} = {Literal(f.GetRawConstantValue(), f.FieldType)}";
            else yield return $"{access} {(f.IsStatic ? "static " : "")}{(f.IsInitOnly ? "readonly " : "")}{TypeName(f.FieldType, n.Create(f))} {f.Name}";
        }
        foreach (var c in t.GetConstructors(all))
        {
            if (!Visible(c) || Skip(c) || c.IsStatic) continue;
            // A record's copy constructor is the compiler's (protected, one parameter of the record's own type).
            if (record && c.GetParameters() is [var only] && only.ParameterType == t) continue;
            yield return $"{Access(c)} {ShortName(t)}({Parameters(c, n)})";
        }
        foreach (var p in t.GetProperties(all))
        {
            var get = p.GetMethod;
            var set = p.SetMethod;
            if (!(Visible(get) || Visible(set)) || Skip(p)) continue;
            var any = Visible(get) ? get! : set!;
            var accessors = new List<string>();
            if (Visible(get)) accessors.Add(get!.IsPublic || !any.IsPublic ? "get;" : "protected get;");
            if (Visible(set))
            {
                var init = set!.ReturnParameter.GetRequiredCustomModifiers().Contains(typeof(IsExternalInit));
                accessors.Add((set.IsPublic || !any.IsPublic ? "" : "protected ") + (init ? "init;" : "set;"));
            }
            var required = p.GetCustomAttribute<RequiredMemberAttribute>() is not null ? "required " : "";
            var indexer = p.GetIndexParameters();
            var name = indexer.Length == 0 ? p.Name : $"this[{string.Join(", ", indexer.Select(x => Parameter(x, n)))}]";
            yield return $"{Access(any)} {Modifiers(any, t)}{required}{TypeName(p.PropertyType, n.Create(p))} {name} {{ {string.Join(" ", accessors)} }}";
        }
        foreach (var e in t.GetEvents(all))
        {
            if (!Visible(e.AddMethod) || Skip(e)) continue;
            yield return $"{Access(e.AddMethod!)} {Modifiers(e.AddMethod!, t)}event {TypeName(e.EventHandlerType!, n.Create(e))} {e.Name}";
        }
        foreach (var m in t.GetMethods(all))
        {
            if (!Visible(m) || m.IsSpecialName && !m.Name.StartsWith("op_", StringComparison.Ordinal) || Skip(m)) continue;
            var generic = m.IsGenericMethodDefinition ? "<" + string.Join(", ", m.GetGenericArguments().Select(a => a.Name)) + ">" : "";
            yield return $"{Access(m)} {Modifiers(m, t)}{TypeName(m.ReturnType, n.Create(m.ReturnParameter))} {m.Name}{generic}({Parameters(m, n)})";
        }
    }

    private static string Modifiers(MethodInfo m, Type declaring)
    {
        if (declaring.IsInterface) return m.IsStatic ? "static " : "";
        if (m.IsStatic) return "static ";
        if (m.IsAbstract) return "abstract ";
        if (m.IsVirtual && m.GetBaseDefinition().DeclaringType != m.DeclaringType) return m.IsFinal ? "sealed override " : "override ";
        if (m.IsVirtual && !m.IsFinal) return "virtual ";
        return "";
    }

    private static string Parameters(MethodBase m, NullabilityInfoContext n)
    {
        var extension = m.IsStatic && m.GetCustomAttribute<ExtensionAttribute>() is not null;
        return string.Join(", ", m.GetParameters().Select((p, i) => (extension && i == 0 ? "this " : "") + Parameter(p, n)));
    }

    private static string Parameter(ParameterInfo p, NullabilityInfoContext n)
    {
        var type = p.ParameterType;
        var prefix = "";
        if (type.IsByRef)
        {
            prefix = p.IsOut ? "out " : p.IsIn ? "in " : "ref ";
            type = type.GetElementType()!;
        }
        if (p.GetCustomAttribute<ParamArrayAttribute>() is not null) prefix = "params ";
        var text = $"{prefix}{TypeName(type, n.Create(p))} {p.Name}";
        if (p.HasDefaultValue) text += " = " + Literal(p.RawDefaultValue, type);
        return text;
    }

    private static string Literal(object? v, Type type)
    {
        var t = Nullable.GetUnderlyingType(type) ?? type;
        return v switch
        {
            null => "null",
            string s => Quoted(s),
            char c => $"'{c}'",
            bool b => b ? "true" : "false",
            double d => d.ToString("R", CultureInfo.InvariantCulture),
            float f => f.ToString("R", CultureInfo.InvariantCulture),
            _ when t.IsEnum => Enum.IsDefined(t, Enum.ToObject(t, v)) ? $"{TypeName(t)}.{Enum.ToObject(t, v)}" : $"({TypeName(t)}){Convert.ToString(v, CultureInfo.InvariantCulture)}",
            _ => Convert.ToString(v, CultureInfo.InvariantCulture) ?? "",
        };
    }

    /// <summary>A string literal on one line: backslash, quote and control characters escaped as in C#.</summary>
    private static string Quoted(string s)
    {
        var sb = new StringBuilder("\"");
        foreach (var c in s)
            sb.Append(c switch
            {
                '\\' => "\\\\",
                '"' => "\\\"",
                '\n' => "\\n",
                '\r' => "\\r",
                '\t' => "\\t",
                _ when char.IsControl(c) => $"\\u{(int)c:X4}",
                _ => c.ToString(),
            });
        return sb.Append('"').ToString();
    }

    private static readonly Dictionary<Type, string> Keywords = new()
    {
        [typeof(void)] = "void", [typeof(object)] = "object", [typeof(string)] = "string", [typeof(bool)] = "bool",
        [typeof(byte)] = "byte", [typeof(sbyte)] = "sbyte", [typeof(char)] = "char", [typeof(short)] = "short",
        [typeof(ushort)] = "ushort", [typeof(int)] = "int", [typeof(uint)] = "uint", [typeof(long)] = "long",
        [typeof(ulong)] = "ulong", [typeof(float)] = "float", [typeof(double)] = "double", [typeof(decimal)] = "decimal",
        [typeof(nint)] = "nint", [typeof(nuint)] = "nuint",
    };

    /// <summary>The type's full name with C# keywords, generic arguments, T? and tuple syntax; no nullability when <paramref name="info"/> is null.</summary>
    public static string TypeName(Type t, NullabilityInfo? info = null)
    {
        if (t.IsByRef) return TypeName(t.GetElementType()!, info);
        if (Nullable.GetUnderlyingType(t) is { } under) return TypeName(under, info?.GenericTypeArguments.FirstOrDefault()) + "?";
        var q = !t.IsValueType && info?.ReadState == NullabilityState.Nullable ? "?" : "";
        if (t.IsArray) return TypeName(t.GetElementType()!, info?.ElementType) + "[" + new string(',', t.GetArrayRank() - 1) + "]" + q;
        if (t.IsPointer) return TypeName(t.GetElementType()!) + "*";
        if (Keywords.TryGetValue(t, out var k)) return k + q;
        if (t.IsGenericParameter) return t.Name + q;
        var args = t.GetGenericArguments();
        if (t.IsGenericType && t.GetGenericTypeDefinition().FullName?.StartsWith("System.ValueTuple`", StringComparison.Ordinal) == true)
            return "(" + string.Join(", ", args.Select((a, i) => TypeName(a, info?.GenericTypeArguments.ElementAtOrDefault(i)))) + ")";
        var name = Name(t.IsGenericType ? t.GetGenericTypeDefinition() : t);
        if (args.Length > 0) name += "<" + string.Join(", ", args.Select((a, i) => TypeName(a, info?.GenericTypeArguments.ElementAtOrDefault(i)))) + ">";
        return name + q;
    }

    /// <summary>Namespace-qualified name, nested types joined with '.', without the generic arity suffix.</summary>
    private static string Name(Type t)
    {
        var outer = t.DeclaringType is { } d && !t.IsGenericParameter ? Name(d) + "." : (t.Namespace is { } ns ? ns + "." : "");
        return outer + ShortName(t);
    }

    private static string ShortName(Type t)
    {
        var name = t.Name;
        var tick = name.IndexOf('`');
        return tick < 0 ? name : name[..tick];
    }
}
