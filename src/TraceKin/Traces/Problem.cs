namespace TraceKin.Traces;

/// <summary>
/// A located reason why an input was rejected. Line and column are 1-based numbers; a problem with a file as a whole
/// (empty, missing) is at line 1, column 1, and a problem with a file that a plan.csv cell names is at that cell
/// (<see cref="Input"/> names the file). Only a settings problem built before its key was located carries 0
/// (<see cref="Fail.Setting"/>); SeriesConfig locates it in series.toml.
/// <paramref name="Key"/> names the setting (e.g. <c>signal.path_length</c>) when the problem is in series.toml.
/// </summary>
public sealed record Problem(string File, int Line, int Column, string Found, string Expected, string Hint, string? Key = null)
{
    /// <summary>
    /// The input this problem rejects when the problem is located in another file: an export that plan.csv names
    /// (<see cref="File"/> is then plan.csv, with the line and column of the cell). Null when it is <see cref="File"/> itself.
    /// </summary>
    public string? Input { get; init; }

    public string Message
    {
        get
        {
            var where = File;
            if (Line > 0) where += $":{Line}";
            if (Column > 0) where += $":{Column}";
            var key = Key is null ? "" : $" [{Key}]";
            var hint = string.IsNullOrWhiteSpace(Hint) ? "" : $" Hint: {Hint}";
            return $"{where}{key}: found {Found}; expected {Expected}.{hint}";
        }
    }

    public override string ToString() => Message;
}

/// <summary>The one exception type for bad input. Thrown only through <see cref="Fail"/>.</summary>
public sealed class InputException(Problem problem) : Exception(problem.Message)
{
    public Problem Problem { get; } = problem;
}

/// <summary>Every throw for bad input goes through here, so every message locates itself.</summary>
public static class Fail
{
    /// <summary>Bad content at a 1-based line and column number of a file.</summary>
    public static InputException At(string file, int line, int column, string found, string expected, string hint = "") =>
        new(new Problem(file, line, column, Truncate(found), expected, hint));

    /// <summary>A bad or missing setting, named by its dotted key.</summary>
    public static InputException Setting(string file, string key, string found, string expected, string hint = "", int line = 0) =>
        new(new Problem(file, line, 0, Truncate(found), expected, hint, key));

    /// <summary>Quote a found cell for a message: at most 60 characters, control characters made visible.</summary>
    public static string Quote(ReadOnlySpan<char> text)
    {
        var sb = new System.Text.StringBuilder("\"");
        foreach (var ch in text.Length > 60 ? text[..60] : text)
            sb.Append(char.IsControl(ch) ? $"\\u{(int)ch:X4}" : ch.ToString());
        if (text.Length > 60) sb.Append('…');
        return sb.Append('"').ToString();
    }

    private static string Truncate(string s) => s.Length <= 200 ? s : s[..200] + "…";
}
