using System.Reflection;
using System.Runtime.InteropServices;

/// <summary>
/// Bytes held by an object graph, by where they hang (a path of TraceKin property names) and by type: a reflection
/// walk that counts each object once (the first path to reach it gets it), with the runtime's own object sizes
/// (CoreCLR's method table: base size at offset 4, component size in the low half of the flags for arrays and
/// strings). Benchmark-only: it reads runtime internals that no product code may rely on.
/// </summary>
internal sealed class HeapWalk
{
    private readonly HashSet<object> _seen = new(ReferenceEqualityComparer.Instance);
    private readonly Dictionary<Type, FieldInfo[]> _fields = [];
    public Dictionary<string, (long Bytes, long Count)> ByPath { get; } = new(StringComparer.Ordinal);
    public Dictionary<string, (long Bytes, long Count)> ByType { get; } = new(StringComparer.Ordinal);
    public long Bytes { get; private set; }
    /// <summary>Bytes of strings equal to one met before (what sharing one copy of each text would save), by path.</summary>
    public Dictionary<string, (long Bytes, long Count)> RepeatedText { get; } = new(StringComparer.Ordinal);
    private readonly HashSet<string> _texts = new(StringComparer.Ordinal);

    private const int MaxDepth = 3;

    public void Walk(object root, string label)
    {
        var stack = new Stack<(object Obj, string Label, int Depth)>();
        stack.Push((root, label, 0));
        while (stack.Count > 0)
        {
            var (obj, at, depth) = stack.Pop();
            if (!_seen.Add(obj)) continue;
            var t = obj.GetType();
            if (Skipped(t)) continue;
            var size = SizeOf(obj, t);
            Bytes += size;
            Add(ByPath, at, size);
            Add(ByType, Name(t), size);
            if (obj is Delegate d)
            {
                if (d.Target is { } target) stack.Push((target, at, depth));
                continue;
            }
            if (t.IsArray)
            {
                var e = t.GetElementType()!;
                if (e.IsPrimitive || e.IsEnum || e.IsPointer) continue;
                foreach (var item in (Array)obj)
                    if (item is not null)
                    {
                        if (e.IsValueType) Fields(item, e, at, depth, stack);
                        else stack.Push((item, at, depth));
                    }
                continue;
            }
            if (obj is string text)
            {
                if (!_texts.Add(text)) Add(RepeatedText, at, size);
                continue;
            }
            Fields(obj, t, at, depth, stack);
        }
    }

    private void Fields(object holder, Type t, string at, int depth, Stack<(object, string, int)> stack)
    {
        var ours = t.Namespace?.StartsWith("TraceKin", StringComparison.Ordinal) == true;
        foreach (var f in FieldsOf(t))
        {
            var ft = f.FieldType;
            if (ft.IsPrimitive || ft.IsEnum || ft.IsPointer || ft == typeof(IntPtr) || ft == typeof(UIntPtr)) continue;
            var v = f.GetValue(holder);
            if (v is null) continue;
            var label = ours && depth < MaxDepth ? at + "." + Clean(f.Name) : at;
            var d = ours ? depth + 1 : depth;
            if (ft.IsValueType) Fields(v, ft, label, d, stack); // a struct's references, inside its holder's size
            else stack.Push((v, label, d));
        }
    }

    private FieldInfo[] FieldsOf(Type t)
    {
        if (_fields.TryGetValue(t, out var fs)) return fs;
        var all = new List<FieldInfo>();
        for (var b = t; b is not null && b != typeof(object); b = b.BaseType)
            all.AddRange(b.GetFields(BindingFlags.Instance | BindingFlags.Public | BindingFlags.NonPublic | BindingFlags.DeclaredOnly));
        return _fields[t] = all.ToArray();
    }

    private static bool Skipped(Type t) =>
        typeof(Type).IsAssignableFrom(t) || typeof(MemberInfo).IsAssignableFrom(t) || t.Namespace?.StartsWith("System.Reflection", StringComparison.Ordinal) == true ||
        typeof(Assembly).IsAssignableFrom(t) || t == typeof(Thread);

    private static long SizeOf(object obj, Type t)
    {
        var mt = t.TypeHandle.Value;
        var flags = (uint)Marshal.ReadInt32(mt);
        long size = Marshal.ReadInt32(mt, 4);
        if ((flags & 0x80000000u) != 0)
        {
            var component = flags & 0xFFFF;
            long n = obj is string s ? s.Length : ((Array)obj).LongLength;
            size += component * n;
        }
        return (size + 7) & ~7L;
    }

    private static string Clean(string field) =>
        field.StartsWith('<') && field.IndexOf('>') is var end and > 0 ? field[1..end] : field.TrimStart('_');

    private static string Name(Type t) => t.IsGenericType && t.Name.IndexOf('`') is var tick and > 0
        ? t.Name[..tick] + "<" + string.Join(",", t.GetGenericArguments().Select(Name)) + ">"
        : t.Name;

    private static void Add(Dictionary<string, (long Bytes, long Count)> d, string key, long size)
    {
        d.TryGetValue(key, out var v);
        d[key] = (v.Bytes + size, v.Count + 1);
    }
}
