using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text;

namespace GateTasks.Engine.References;

/// <summary>
/// The SHA-256 a reference carries over its own content (format 2 on), so that a cell or a header value edited
/// after the build is caught on every read, with or without an acceptance ledger. The canonical content is the
/// header's JSON text exactly as stored, with the digest's own value replaced by <see cref="Placeholder"/>, then
/// every histogram row in file order: the feature name and the row's part (<c>below</c>, <c>bin</c>, <c>above</c>), each
/// in UTF-8 followed by a zero byte, the bin number as a little-endian int32 (−1 on the below and above rows, which
/// have none), and lower, upper, Σw, Σw² as little-endian IEEE 754 doubles.
/// </summary>
internal sealed class ReferenceDigest : IDisposable
{
    /// <summary>The header key that holds the digest.</summary>
    public const string Key = "content_sha256";

    /// <summary>What stands in the digest's place while it is computed: 64 zeros.</summary>
    public static readonly string Placeholder = new('0', 64);

    private readonly IncrementalHash _hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
    private readonly byte[] _row = new byte[4 + 4 * 8];

    /// <summary>Starts with the header text, in which the digest's value is <see cref="Placeholder"/>.</summary>
    public ReferenceDigest(string headerWithPlaceholder) => AppendText(headerWithPlaceholder);

    private ReferenceDigest()
    {
    }

    /// <summary>
    /// Starts with a stored header whose digest entry (<see cref="Entry"/> of the recorded value) stands at
    /// <paramref name="entryAt"/>, <paramref name="entryLength"/> characters long, taken as the placeholder's entry: the
    /// same bytes as the header with the entry replaced, without copying a header of megabytes twice. The entry begins
    /// and ends with an ASCII quote, so the three parts encode as the whole does.
    /// </summary>
    public static ReferenceDigest OfSealed(string header, int entryAt, int entryLength)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(entryAt);
        var digest = new ReferenceDigest();
        digest.AppendText(header.AsSpan(0, entryAt));
        digest.AppendText(Entry(Placeholder));
        digest.AppendText(header.AsSpan(entryAt + entryLength));
        return digest;
    }

    // UTF-8 in slices through one buffer, as Encoding.UTF8.GetBytes would give it whole: the encoder stops a slice
    // before a surrogate pair it cannot finish and replaces a lone surrogate as GetBytes does.
    private void AppendText(ReadOnlySpan<char> text)
    {
        var encoder = Encoding.UTF8.GetEncoder();
        var buffer = new byte[Math.Min(1 << 16, Encoding.UTF8.GetMaxByteCount(Math.Max(text.Length, 2)))];
        while (true)
        {
            encoder.Convert(text, buffer, flush: true, out var used, out var written, out var completed);
            _hash.AppendData(buffer, 0, written);
            text = text[used..];
            if (completed) return;
        }
    }

    /// <summary>Adds one histogram row.</summary>
    public void Add(string feature, string part, int? bin, double lower, double upper, double sumW, double sumW2)
    {
        _hash.AppendData(Encoding.UTF8.GetBytes(feature));
        _hash.AppendData([0]);
        _hash.AppendData(Encoding.UTF8.GetBytes(part));
        _hash.AppendData([0]);
        BinaryPrimitives.WriteInt32LittleEndian(_row, bin ?? -1);
        BinaryPrimitives.WriteDoubleLittleEndian(_row.AsSpan(4), lower);
        BinaryPrimitives.WriteDoubleLittleEndian(_row.AsSpan(12), upper);
        BinaryPrimitives.WriteDoubleLittleEndian(_row.AsSpan(20), sumW);
        BinaryPrimitives.WriteDoubleLittleEndian(_row.AsSpan(28), sumW2);
        _hash.AppendData(_row);
    }

    /// <summary>The digest as 64 lower-case hexadecimal digits.</summary>
    public string Finish() => Convert.ToHexString(_hash.GetHashAndReset()).ToLowerInvariant();

    /// <summary>The JSON text of the digest entry holding <paramref name="value"/>, as the compact header writes it.</summary>
    public static string Entry(string value) => $"\"{Key}\":\"{value}\"";

    public void Dispose() => _hash.Dispose();
}
