namespace TraceKin.Ingest;

/// <summary>
/// The 1-based line number of every kept row, held as runs of rows on consecutive lines: a file whose rows follow one
/// another needs one run however long it is, and the fast row reader records nothing per row. Rows are added in order.
/// </summary>
internal sealed class RowLineMap
{
    // run k: rows from _firstRow[k] on lie on lines _firstLine[k], _firstLine[k] + 1, …
    private readonly List<int> _firstRow = [];
    private readonly List<int> _firstLine = [];

    /// <summary>Rows recorded so far.</summary>
    public int Count { get; private set; }

    /// <summary>Records that row number <see cref="Count"/> is on <paramref name="line"/>.</summary>
    public void Add(int line) => AddRun(line, 1);

    /// <summary>Records <paramref name="rows"/> rows on consecutive lines from <paramref name="firstLine"/>.</summary>
    public void AddRun(int firstLine, int rows)
    {
        if (rows <= 0) return;
        var n = _firstRow.Count;
        if (n == 0 || _firstLine[n - 1] + (Count - _firstRow[n - 1]) != firstLine)
        {
            _firstRow.Add(Count);
            _firstLine.Add(firstLine);
        }
        Count += rows;
    }

    public int this[int row]
    {
        get
        {
            if ((uint)row >= (uint)Count) throw new ArgumentOutOfRangeException(nameof(row));
            var k = _firstRow.BinarySearch(row);
            if (k < 0) k = ~k - 1;
            return _firstLine[k] + (row - _firstRow[k]);
        }
    }
}
