namespace TraceKin.Traces;

/// <summary>
/// Something the user should see that does not stop the analysis. <paramref name="Where"/> names the run,
/// file (and line, when known) or series setting it concerns; <paramref name="Code"/> is a short stable
/// identifier (kebab-case) that tests and scripts can match on.
/// </summary>
public sealed record Warning(string Code, string Where, string Message)
{
    /// <summary>The export channel the warning concerns (a reader's warning about one column or well), or null: in a
    /// file shared by many runs it belongs to that channel's run only.</summary>
    public string? Channel { get; init; }

    public override string ToString() => $"{Where}: {Message}";
}
