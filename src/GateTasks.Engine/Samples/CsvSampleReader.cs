using System.Globalization;
using System.Text;
using CsvHelper;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Reads a comma-separated sample file with a header row (CsvHelper), in blocks of rows. Every column is
/// read as <see cref="SampleValueType.Float64"/>; cell spellings are those of <see cref="CsvNumber"/>.
/// </summary>
internal sealed class CsvSampleReader : ISampleReader
{
    /// <summary>Rows per batch unless told otherwise: large enough to amortise the per-batch work, small in memory.</summary>
    public const int DefaultBlockRows = 65_536;

    private static readonly CsvReaderOptions Options = new()
    {
        Separator = ',',
        HasHeader = true,
        Mode = CsvMode.Rfc4180,
        DetectSeparatorHint = false,
        SkipEmptyLines = true,
        TrimWhitespace = true,
        TrackLineNumbers = true, // for error locations
        MalformedData = CsvMalformedDataHandling.Throw,
        FieldCountMismatch = CsvFieldCountHandling.Throw,
        MissingField = CsvMissingFieldHandling.Throw,
        FormatProvider = CultureInfo.InvariantCulture,
    };

    /// <summary>The longest header line checked byte by byte (for UTF-8 and the separator); longer headers are checked in their first part.</summary>
    private const int HeaderProbeBytes = 1 << 16;

    private readonly int _blockRows;

    private CsvSampleReader(string path, IReadOnlyList<SampleColumn> columns, int blockRows)
    {
        Path = path;
        Columns = columns;
        _blockRows = blockRows;
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long? RowCount => null;

    /// <inheritdoc />
    public long MetadataBytes => 0; // the header's names are all it keeps

    /// <summary>Opens <paramref name="path"/> and reads its header row.</summary>
    /// <param name="path">The CSV file.</param>
    /// <param name="blockRows">Rows per batch.</param>
    public static CsvSampleReader Open(string path, int blockRows = DefaultBlockRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(blockRows, 1);
        var (firstLine, lineNumber) = FirstLine(path);
        RequireUtf8(path, firstLine, lineNumber);
        using var csv = CreateReader(path);
        var header = Guard(path, () => csv.Headers.ToArray());
        RequireCommaSeparated(path, header, firstLine, lineNumber);
        return new CsvSampleReader(path, DescribeHeader(path, header), blockRows);
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1)
    {
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        return Batches(indices);
    }

    /// <inheritdoc />
    public void Dispose()
    {
        // Each read opens its own file handle and closes it when enumeration ends; nothing is held between reads.
    }

    private IEnumerable<SampleBatch> Batches(int[] indices)
    {
        using var csv = CreateReader(Path);
        RequireHeaderUnchanged(csv);
        var buffers = indices.Select(_ => new double[_blockRows]).ToArray();
        // The line each row was read from (one number a row, not a cell), so a bad value found later, such as a
        // weight that is not finite, is reported at its line and column.
        var lines = new long[_blockRows];
        CellOrigin Locate(int row, int column) => Origin(lines[row], indices[column]);
        var rows = 0;
        while (Guard(Path, csv.Read))
        {
            lines[rows] = csv.LineNumber;
            for (var c = 0; c < indices.Length; c++)
                buffers[c][rows] = ParseCell(csv, indices[c]);
            if (++rows == _blockRows)
            {
                yield return new SampleBatch(buffers, rows) { Locate = Locate };
                rows = 0;
            }
        }
        if (rows > 0) yield return new SampleBatch(buffers, rows) { Locate = Locate };
    }

    // The columns were named when the file was opened; a header changed since would put other columns under them.
    private void RequireHeaderUnchanged(CsvReader csv)
    {
        var header = Guard(Path, () => csv.Headers.ToArray());
        if (header.Length == Columns.Count && header.Select(h => h.Trim()).SequenceEqual(Columns.Select(c => c.Name), StringComparer.Ordinal))
            return;
        throw SampleInputErrors.Unreadable(Path,
            "it changed after the sample was opened (its header row is no longer the one read then); a sample must not change while it is read");
    }

    // Reads the file again up to the record at <paramref name="line"/> (an error path only): where its field starts
    // and how it is written.
    private CellOrigin Origin(long line, int field)
    {
        var at = (int)Math.Min(line, int.MaxValue);
        using var csv = CreateReader(Path);
        while (Guard(Path, csv.Read))
        {
            if (csv.LineNumber < line) continue;
            var column = CharacterColumn(csv, field);
            var cell = csv.GetSpan(field);
            var written = cell.Trim(" \t"u8).IsEmpty ? "an empty cell (a missing value)" : $"'{Utf8Escapes.Show(cell)}'";
            return new CellOrigin(new SourceLocation(Path, at, column), $"line {line}, column {column}", written);
        }
        return new CellOrigin(new SourceLocation(Path, at), $"line {line}", "a value that is not a finite number");
    }

    private double ParseCell(CsvReader csv, int field)
    {
        var cell = csv.GetSpan(field);
        if (CsvNumber.TryParse(cell, out var value)) return value;
        var name = Columns[field].Name;
        throw new GateInputException(
            ErrorCodes.SampleCsvValue,
            $"'{Utf8Escapes.Show(cell)}' in column '{name}' (field {field + 1} of the record) is not a number; "
            + "expected a decimal number, an empty cell, nan, inf, -inf, true or false",
            new SourceLocation(Path, (int)Math.Min(csv.LineNumber, int.MaxValue), CharacterColumn(csv, field)));
    }

    // The 1-based character column where a field starts: the raw fields before it (quotes and all) and their separators.
    private static int CharacterColumn(CsvReader csv, int field)
    {
        var column = 1;
        for (var k = 0; k < field; k++) column += Encoding.UTF8.GetCharCount(csv.GetRawSpan(k)) + 1;
        return column;
    }

    private static CsvReader CreateReader(string path)
    {
        var stream = SampleInputErrors.OpenRead(path, FileOptions.SequentialScan);
        try
        {
            return CsvReader.Create(stream, Options, leaveOpen: false);
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            stream.Dispose();
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
    }

    // CsvHelper reports bad quoting and ragged records as CsvFormatException with the line; I/O errors as IOException.
    private static T Guard<T>(string path, Func<T> read)
    {
        try
        {
            return read();
        }
        catch (CsvFormatException ex)
        {
            throw SampleInputErrors.Unreadable(path, "malformed CSV (" + SampleInputErrors.Describe(ex) + ")", ex,
                (int)Math.Min(ex.LineNumber, int.MaxValue));
        }
        catch (Exception ex) when (ex is IOException or DecoderFallbackException)
        {
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
    }

    /// <summary>The first non-empty line's bytes (at most <see cref="HeaderProbeBytes"/>) and its line number.</summary>
    private static (byte[] Line, int Number) FirstLine(string path)
    {
        using var stream = SampleInputErrors.OpenRead(path, FileOptions.SequentialScan);
        var buffer = new byte[HeaderProbeBytes];
        int read;
        try
        {
            read = stream.ReadAtLeast(buffer, buffer.Length, throwOnEndOfStream: false);
        }
        catch (IOException ex)
        {
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
        var text = buffer.AsSpan(0, read);
        var number = 1;
        while (true)
        {
            var end = text.IndexOfAny((byte)'\n', (byte)'\r');
            var line = end < 0 ? text : text[..end];
            if (!line.Trim(" \t"u8).IsEmpty || end < 0) return (line.ToArray(), number);
            if (text[end] == (byte)'\n' || end + 1 >= text.Length || text[end + 1] != (byte)'\n') number++;
            text = text[(end + 1)..];
        }
    }

    // The header is read as UTF-8; a byte that is not (a file saved as Latin-1 or UTF-16) would become a
    // replacement character in a column name, and a contract's name would then miss it without a visible reason.
    private static void RequireUtf8(string path, byte[] line, int lineNumber)
    {
        var bad = Utf8Escapes.FirstInvalid(line);
        if (bad < 0) return;
        var column = Encoding.UTF8.GetCharCount(line.AsSpan(0, bad)) + 1;
        var fieldStart = line.AsSpan(0, bad).LastIndexOf((byte)',') + 1;
        var fieldEnd = line.AsSpan(bad).IndexOf((byte)',');
        var field = line.AsSpan(fieldStart, fieldEnd < 0 ? line.Length - fieldStart : bad - fieldStart + fieldEnd);
        var utf16 = line.Length >= 2 && ((line[0] == 0xFF && line[1] == 0xFE) || (line[0] == 0xFE && line[1] == 0xFF))
            ? " (it starts with a UTF-16 byte-order mark: the file is UTF-16)" : "";
        throw new GateInputException(ErrorCodes.SampleUnreadable,
            $"sample file '{path}': the header row holds the byte \\x{line[bad]:X2} at line {lineNumber}, column {column}, which is not UTF-8{utf16}, "
            + $"in the column name '{Utf8Escapes.Show(field)}'; GateTasks reads CSV files as UTF-8: save the file as UTF-8",
            new SourceLocation(path, lineNumber, column));
    }

    // A header that parses as one column holding semicolons (or tabs) is almost surely a file in another dialect,
    // which would otherwise surface as "column not found" for every feature. Such files often write decimal commas
    // too, so they are refused with a plain word rather than guessed at.
    private static void RequireCommaSeparated(string path, string[] header, byte[] line, int lineNumber)
    {
        if (header.Length != 1) return;
        foreach (var (separator, name) in new[] { ((byte)';', "semicolon"), ((byte)'\t', "tab") })
        {
            var at = line.AsSpan().IndexOf(separator);
            if (at < 0 || header[0].Split((char)separator).Count(p => p.Trim().Length > 0) < 2) continue;
            var count = line.AsSpan().Count(separator);
            var column = Encoding.UTF8.GetCharCount(line.AsSpan(0, at)) + 1;
            throw new GateInputException(ErrorCodes.SampleUnreadable,
                $"sample file '{path}' looks {name}-separated: its header row '{Utf8Escapes.Show(line)}' holds no comma but {count} {name}{(count == 1 ? "" : "s")} "
                + $"(the first at line {lineNumber}, column {column}); GateTasks reads comma-separated values (RFC 4180, '.' as the decimal point): "
                + "write the file with ',' between fields",
                new SourceLocation(path, lineNumber, column));
        }
    }

    private static IReadOnlyList<SampleColumn> DescribeHeader(string path, string[] header)
    {
        if (header.Length == 0)
            throw SampleInputErrors.Unreadable(path, "the file is empty; a header row naming the columns is required");

        var seen = new HashSet<string>(StringComparer.Ordinal);
        var columns = new List<SampleColumn>(header.Length);
        var numeric = 0;
        for (var i = 0; i < header.Length; i++)
        {
            var name = header[i].Trim();
            if (name.Length == 0)
                throw new GateInputException(ErrorCodes.SampleUnreadable,
                    $"sample file '{path}': field {i + 1} of the header row has no column name",
                    new SourceLocation(path, 1, i + 1));
            if (!seen.Add(name))
                throw new GateInputException(ErrorCodes.SampleUnreadable,
                    $"sample file '{path}': column '{name}' appears twice in the header row",
                    new SourceLocation(path, 1, i + 1));
            if (double.TryParse(name, NumberStyles.Float, CultureInfo.InvariantCulture, out _)) numeric++;
            columns.Add(new SampleColumn(name, SampleValueType.Float64, Nullable: true));
        }
        // A first line of numbers is data, not names: the header is missing and the first event would be lost.
        if (numeric == header.Length)
            throw new GateInputException(ErrorCodes.SampleUnreadable,
                $"sample file '{path}': the first line holds numbers, not column names; a header row is required",
                new SourceLocation(path, 1, 1));
        return columns;
    }
}
