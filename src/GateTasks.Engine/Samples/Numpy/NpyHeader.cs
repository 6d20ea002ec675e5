using System.Buffers.Binary;
using System.Text;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>
/// The header of a NumPy array (a .npy file, or a member of a .npz archive), as the NumPy format description
/// (versions 1.0, 2.0 and 3.0) lays it out: the signature <c>\x93NUMPY</c>, the version, the header's length and a
/// Python dictionary literal with <c>descr</c>, <c>fortran_order</c> and <c>shape</c>. The data follows it.
/// </summary>
internal sealed record NpyHeader(NpyDtype Dtype, long[] Shape, bool FortranOrder, long DataOffset)
{
    /// <summary>The six bytes every NumPy array starts with.</summary>
    public static ReadOnlySpan<byte> Signature => [0x93, (byte)'N', (byte)'U', (byte)'M', (byte)'P', (byte)'Y'];

    /// <summary>The longest header read: NumPy's own reader refuses headers past 10 000 bytes by default; a very wide record can need more.</summary>
    private const int MaxHeaderBytes = 1 << 20;

    /// <summary>The widest record read: a block of records is read whole, so a record must fit in a bounded block (16 MiB: two million float64 fields).</summary>
    private const long MaxItemBytes = 16L << 20;

    /// <summary>Elements in the array (1 for a 0-d array).</summary>
    public long Elements => Shape.Aggregate(1L, (a, d) => checked(a * d));

    /// <summary>Bytes of data the header promises.</summary>
    public long DataBytes => checked(Elements * Dtype.ItemSize);

    /// <summary>
    /// Reads the header at the start of <paramref name="stream"/>, leaving it at the first data byte. Bad headers throw
    /// GATE2012 and a header for Python objects GATE2016, each naming <paramref name="what"/> (e.g. <c>sample file 'a.npy'</c>)
    /// at <paramref name="path"/>.
    /// </summary>
    public static NpyHeader Read(Stream stream, string path, string what)
    {
        Span<byte> prefix = stackalloc byte[12];
        var got = stream.ReadAtLeast(prefix[..10], 10, throwOnEndOfStream: false);
        if (got < 10 || !prefix[..6].SequenceEqual(Signature))
            throw Bad(path, what, got < 6 ? "it is too short to hold a NumPy header" : "it does not start with the NumPy signature \\x93NUMPY");
        var major = prefix[6];
        int headerLength, prefixLength;
        if (major == 1)
        {
            headerLength = BinaryPrimitives.ReadUInt16LittleEndian(prefix[8..]);
            prefixLength = 10;
        }
        else if (major is 2 or 3)
        {
            if (stream.ReadAtLeast(prefix[10..12], 2, throwOnEndOfStream: false) < 2)
                throw Bad(path, what, "its header is cut short");
            var length = BinaryPrimitives.ReadUInt32LittleEndian(prefix[8..]);
            if (length > MaxHeaderBytes) throw Bad(path, what, $"its header claims {length} bytes (more than {MaxHeaderBytes})");
            headerLength = (int)length;
            prefixLength = 12;
        }
        else throw Bad(path, what, $"format version {major}.{prefix[7]} is not one GateTasks reads (1.0, 2.0, 3.0)");

        var bytes = new byte[headerLength];
        if (stream.ReadAtLeast(bytes, headerLength, throwOnEndOfStream: false) < headerLength)
            throw Bad(path, what, "its header is cut short");
        // Versions 1 and 2 write the header in Latin-1, version 3 in UTF-8 (for field names beyond Latin-1).
        var text = (major == 3 ? Encoding.UTF8 : Encoding.Latin1).GetString(bytes);

        Dictionary<string, object?> dict;
        try
        {
            dict = NpyHeaderLiteral.Parse(text) as Dictionary<string, object?>
                   ?? throw new FormatException("the header is not a dictionary");
        }
        catch (FormatException ex)
        {
            throw Bad(path, what, "its header is not the dictionary NumPy writes (" + ex.Message + ")");
        }
        if (!dict.TryGetValue("descr", out var descr) || !dict.TryGetValue("fortran_order", out var fortran) || !dict.TryGetValue("shape", out var shapeValue))
            throw Bad(path, what, "its header lacks one of 'descr', 'fortran_order' and 'shape'");
        if (fortran is not bool fortranOrder) throw Bad(path, what, "its header's 'fortran_order' is not True or False");
        if (shapeValue is not List<object?> dims || dims.Any(d => d is not long n || n < 0))
            throw Bad(path, what, "its header's 'shape' is not a tuple of non-negative integers");
        NpyDtype dtype;
        try
        {
            dtype = NpyDtype.Parse(descr);
        }
        catch (Exception ex) when (ex is FormatException or OverflowException)
        {
            throw Bad(path, what, "its header's 'descr' is not a dtype GateTasks understands (" + ex.Message + ")");
        }
        if (dtype.ItemSize > MaxItemBytes)
            throw Bad(path, what, $"its records are {dtype.ItemSize} bytes wide, more than the {MaxItemBytes} GateTasks reads");
        if (dtype.HoldsObjects)
            throw new GateInputException(ErrorCodes.SampleArrayObjects,
                $"{what} holds Python objects (dtype {dtype.Spelling}), which NumPy stores as a pickle; GateTasks never loads pickles: "
                + "save the columns as numbers (a structured array, or one array per column with numpy.savez)",
                new SourceLocation(path));
        var header = new NpyHeader(dtype, dims.Cast<long>().ToArray(), fortranOrder, prefixLength + headerLength);
        try
        {
            _ = header.DataBytes;
        }
        catch (OverflowException)
        {
            throw Bad(path, what, "its header's shape and dtype need more bytes than a file can hold");
        }
        return header;
    }

    private static GateInputException Bad(string path, string what, string problem) =>
        new(ErrorCodes.SampleArrayHeader, $"{what} is not a readable NumPy array: {problem}", new SourceLocation(path));
}
