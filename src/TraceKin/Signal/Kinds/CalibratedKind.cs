using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>kind = "calibrated": any signal read through a [signal.calibration] table of standards (<see cref="CalibratedConversion"/>).</summary>
internal sealed class CalibratedKind : ISignalKind
{
    public string Name => "calibrated";

    public (string Header, string Unit) SampleColumn => ("signal (AU)", Units.Absorbance);

    public void Validate(SignalSettings x, TomlSection s)
    {
        if (x.Calibration is null)
            throw Fail.Setting(s.File, s.KeyName("calibration"), "nothing", "a [signal.calibration] table of standards for kind = \"calibrated\"", "");
    }

    public SignalModel Build(SignalRun run) => run.Settings.Calibration is null
        ? throw run.Missing("calibration", "a [signal.calibration] table of standards for kind = \"calibrated\"")
        : CalibratedConversion.Build(run, null, null);
}
