namespace TraceKin.Setup;

/// <summary>
/// Marks an opt-in setting whose property is null unless series.toml sets it: the settings list of the report
/// (Reports/SettingsProvenance) shows it only when it is set, so adding such a key leaves the report of every series
/// that does not use it as it was.
/// </summary>
[AttributeUsage(AttributeTargets.Property)]
internal sealed class ShownOnlyWhenSetAttribute : Attribute;
