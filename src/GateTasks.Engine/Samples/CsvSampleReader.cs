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

    /// <summary>Opens <paramref name="path"/> and reads its header row.</summary>
    /// <param name="path">The CSV file.</param>
    /// <param name="blockRows">Rows per batch.</param>
    public static CsvSampleReader Open(string path, int blockRows = DefaultBlockRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(blockRows, 1);
        using var csv = CreateReader(path);
        var header = Guard(path, () => csv.Headers.ToArray());
        return new CsvSampleReader(path, DescribeHeader(path, header), blockRows);
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns)
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
        var buffers = indices.Select(_ => new double[_blockRows]).ToArray();
        var rows = 0;
        while (Guard(Path, csv.Read))
        {
            for (var c = 0; c < indices.Length; c++)
                buffers[c][rows] = ParseCell(csv, indices[c]);
            if (++rows == _blockRows)
            {
                yield return new SampleBatch(buffers, rows);
                rows = 0;
            }
        }
        if (rows > 0) yield return new SampleBatch(buffers, rows);
    }

    private double ParseCell(CsvReader csv, int field)
    {
        var cell = csv.GetSpan(field);
        if (CsvNumber.TryParse(cell, out var value)) return value;
        var name = Columns[field].Name;
        throw new GateInputException(
            ErrorCodes.SampleCsvValue,
            $"'{Encoding.UTF8.GetString(cell)}' in column '{name}' (field {field + 1} of the record) is not a number; "
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
