using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>How the time column writes its values.</summary>
internal enum TimeForm
{
    /// <summary>A number in a time unit (s, ms, min, h).</summary>
    Number,
    /// <summary>Minutes and seconds, "mm:ss" or "mm:ss.fff"; minutes may exceed 59.</summary>
    MinutesSeconds,
    /// <summary>Hours, minutes and seconds, "hh:mm:ss" or "hh:mm:ss.fff"; hours may exceed 23.</summary>
    HoursMinutesSeconds,
    /// <summary>An ISO 8601 date and time, with or without a UTC offset (ISO 8601-1:2019 §5.4).</summary>
    DateTime,
}

/// <summary>
/// Reads time cells into seconds. Date-times are held as seconds after the first date-time read, so a run that crosses
/// midnight (or a date line) stays monotonic and no precision is lost to large tick counts.
/// </summary>
internal sealed class TimeCells(TimeForm form, UnitInfo? unit)
{
    private long? _originTicks;

    public TimeForm Form { get; } = form;
    public UnitInfo? Unit { get; } = unit;

    /// <summary>UTC ticks of the first date-time read (the origin of the returned seconds), when the form is DateTime.</summary>
    public long? OriginTicks => _originTicks;

    public string Describe() => Form switch
    {
        TimeForm.Number => $"number in {Unit!.Symbol}",
        TimeForm.MinutesSeconds => "mm:ss (minutes and seconds)",
        TimeForm.HoursMinutesSeconds => "hh:mm:ss (hours, minutes and seconds)",
        _ => "ISO 8601 date-time",
    };

    /// <summary>The form a header unit names ("mm:ss", "hh:mm:ss"), or null.</summary>
    public static TimeForm? FormOfUnit(string? unit) => unit?.Trim().ToLowerInvariant() switch
    {
        "mm:ss" or "min:s" or "m:s" or "mm:ss.fff" or "min:sec" => TimeForm.MinutesSeconds,
        "hh:mm:ss" or "h:min:s" or "h:m:s" or "hh:mm:ss.fff" => TimeForm.HoursMinutesSeconds,
        "iso 8601" or "iso8601" or "iso" => TimeForm.DateTime,
        _ => null,
    };

    /// <summary>The form of a first time cell that has no unit: a date-time or a clock reading, else null.</summary>
    public static TimeForm? FormOfCell(ReadOnlySpan<byte> cell)
    {
        if (cell.Length >= 10 && IsDigits(cell[..4]) && cell[4] == (byte)'-') return TimeForm.DateTime;
        var colons = cell.Count((byte)':');
        return colons switch
        {
            1 => TimeForm.MinutesSeconds,
            2 => TimeForm.HoursMinutesSeconds,
            _ => null,
        };
    }

    /// <summary>Seconds for one cell, or false when the cell is not in the column's form.</summary>
    public bool TryRead(ReadOnlySpan<byte> cell, byte decimalSeparator, out double seconds)
    {
        seconds = 0;
        switch (Form)
        {
            case TimeForm.Number:
                if (NumberCell.TryParse(cell, decimalSeparator, out var v) != NumberStatus.Ok) return false;
                seconds = Unit!.ToInternal(v);
                return true;
            case TimeForm.MinutesSeconds:
            case TimeForm.HoursMinutesSeconds:
                return TryClock(cell, Form == TimeForm.HoursMinutesSeconds, out seconds);
            default:
                if (!TryDateTime(cell, out var ticks)) return false;
                _originTicks ??= ticks;
                seconds = (ticks - _originTicks.Value) / (double)TimeSpan.TicksPerSecond;
                return true;
        }
    }

    /// <summary>
    /// Seconds for a moment written in the preamble (the time of mixing), in this column's terms: a date-time, a clock
    /// reading, or a number with an optional time unit ("12.5", "30 s", "0.5 min"). Null when it cannot be read.
    /// </summary>
    public double? ReadMoment(string text)
    {
        var t = text.Trim().Trim('"').Trim();
        var bytes = System.Text.Encoding.UTF8.GetBytes(t);
        if (Form == TimeForm.DateTime)
        {
            if (!TryDateTime(bytes, out var ticks)) return null;
            _originTicks ??= ticks;
            return (ticks - _originTicks.Value) / (double)TimeSpan.TicksPerSecond;
        }
        if (FormOfCell(bytes) is TimeForm.MinutesSeconds or TimeForm.HoursMinutesSeconds && TryClock(bytes, bytes.AsSpan().Count((byte)':') == 2, out var clock))
            return clock;
        var space = t.IndexOf(' ');
        var number = space < 0 ? t : t[..space];
        var unitText = space < 0 ? null : t[(space + 1)..].Trim();
        var unit = unitText is null ? Unit : Units.Find(unitText);
        if (unit is null || unit.Quantity != Quantity.Time) return null;
        var nb = System.Text.Encoding.UTF8.GetBytes(number.Replace(',', '.'));
        return NumberCell.TryParse(nb, (byte)'.', out var v) == NumberStatus.Ok ? unit.ToInternal(v) : null;
    }

    private static bool TryClock(ReadOnlySpan<byte> cell, bool withHours, out double seconds)
    {
        seconds = 0;
        var first = cell.IndexOf((byte)':');
        if (first <= 0) return false;
        double hours = 0;
        long minutes;
        ReadOnlySpan<byte> rest;
        if (withHours)
        {
            if (!TryWhole(cell[..first], out var h)) return false;
            hours = h;
            var afterH = cell[(first + 1)..];
            var second = afterH.IndexOf((byte)':');
            if (second != 2 || !TryWhole(afterH[..second], out minutes) || minutes > 59) return false;
            rest = afterH[(second + 1)..];
        }
        else
        {
            if (!TryWhole(cell[..first], out minutes)) return false;
            rest = cell[(first + 1)..];
        }
        // seconds: two digits, then an optional fraction after '.' or ',' (ISO 8601-1:2019 §3.2.6 allows either)
        if (rest.Length < 2 || !IsDigits(rest[..2])) return false;
        double s = (rest[0] - '0') * 10 + (rest[1] - '0');
        if (rest.Length > 2)
        {
            if (rest[2] is not ((byte)'.' or (byte)',') || rest.Length == 3 || !IsDigits(rest[3..])) return false;
            double scale = 0.1;
            for (var k = 3; k < rest.Length; k++, scale /= 10) s += (rest[k] - '0') * scale;
        }
        if (s >= 60) return false;
        seconds = hours * 3600 + minutes * 60 + s;
        return true;
    }

    private static bool TryWhole(ReadOnlySpan<byte> digits, out long value)
    {
        value = 0;
        if (digits.IsEmpty || digits.Length > 9 || !IsDigits(digits)) return false;
        foreach (var d in digits) value = value * 10 + (d - '0');
        return true;
    }

    private static bool IsDigits(ReadOnlySpan<byte> s)
    {
        foreach (var b in s)
            if ((uint)(b - '0') > 9) return false;
        return true;
    }

    private static bool TryDateTime(ReadOnlySpan<byte> cell, out long utcTicks)
    {
        utcTicks = 0;
        if (cell.Length < 10 || cell.Length > 40 || !IsDigits(cell[..4]) || cell[4] != (byte)'-') return false;
        Span<char> chars = stackalloc char[cell.Length];
        for (var k = 0; k < cell.Length; k++) chars[k] = (char)cell[k];
        // No offset written: the clock is taken as UTC, which keeps differences right except across a daylight-saving change.
        if (!DateTimeOffset.TryParse(chars, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal, out var dto)) return false;
        utcTicks = dto.UtcTicks;
        return true;
    }
}
