using System.Globalization;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Signal;

/// <summary>
/// The [signal] table while it is read: the section and the unit keys every kind shares (path_length_unit,
/// temperature_unit, pressure_unit, volume_unit, conductivity_unit), so a kind's <see cref="ISignalKind.Read"/> turns
/// its values into internal units the same way as the others.
/// </summary>
public sealed class SignalTable
{
    public TomlSection Section { get; }
    public UnitInfo TemperatureUnit { get; }
    public UnitInfo PressureUnit { get; }
    public UnitInfo VolumeUnit { get; }
    public UnitInfo ConductivityUnit { get; }
    private readonly string _lengthUnit;

    internal SignalTable(TomlSection s)
    {
        Section = s;
        _lengthUnit = s.Choice("path_length_unit", "cm", "cm", "mm");
        TemperatureUnit = SignalSettings.UnitOf(s, "temperature_unit", "K", Quantity.Temperature);
        PressureUnit = SignalSettings.UnitOf(s, "pressure_unit", "Pa", Quantity.Pressure);
        VolumeUnit = SignalSettings.UnitOf(s, "volume_unit", "mL", Quantity.GasVolume);
        ConductivityUnit = SignalSettings.UnitOf(s, "conductivity_unit", "S/m", Quantity.Conductivity);
    }

    /// <summary>A length in path_length_unit, in cm.</summary>
    public double Cm(double v) => _lengthUnit == "mm" ? v / 10 : v;

    /// <summary>A temperature key in temperature_unit, in K, range-checked; null when absent.</summary>
    public double? Temperature(string key)
    {
        var s = Section;
        if (s.Double(key) is not { } v) return null;
        var k = TemperatureUnit.ToInternal(v);
        if (!(k > 0 && k < 1000))
            throw Fail.Setting(s.File, s.KeyName(key), $"{v.ToString(CultureInfo.InvariantCulture)} {TemperatureUnit.Symbol}", "a temperature between 0 K and 1000 K",
                "set temperature_unit = \"°C\" for Celsius");
        return k;
    }

    /// <summary>A number ≥ 0, or null when absent.</summary>
    public double? NonNegative(string key) => SignalSettings.NonNegative(Section, key);
}
