namespace TraceKin.Cli;

/// <summary>
/// Process exit codes: 0 all runs analysed, 2 some input rejected (or, for `watch`, a series that failed), 1 a usage
/// error or an output folder that cannot be used or written (a file where the folder belongs, a link inside it,
/// no permission, another tracekin holding it).
/// </summary>
public static class ExitCodes
{
    public const int Ok = 0;
    public const int Usage = 1;
    /// <summary>The same code as <see cref="Usage"/>: the output folder cannot be used or an output was not written.</summary>
    public const int CannotWrite = 1;
    public const int SomeRejected = 2;
}
