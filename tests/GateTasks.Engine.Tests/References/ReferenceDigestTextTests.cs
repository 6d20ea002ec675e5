using System.Security.Cryptography;
using System.Text;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Tests.References;

/// <summary>
/// The reference digest hashes its header text in UTF-8 slices rather than as one array. Expected values come from
/// .NET's own whole-text path, which wrote every reference before the slices: Encoding.UTF8.GetBytes(string) (lone
/// surrogates replaced by U+FFFD) and SHA256.HashData, both from the .NET base class library. Headers of megabytes,
/// with four-byte characters and lone surrogates placed across every slice boundary, must give the same digest.
/// </summary>
public sealed class ReferenceDigestTextTests
{
    private static string WholeTextDigest(string text) =>
        Convert.ToHexString(SHA256.HashData(Encoding.UTF8.GetBytes(text))).ToLowerInvariant();

    private static string SlicedDigest(string text)
    {
        using var digest = new ReferenceDigest(text);
        return digest.Finish();
    }

    /// <summary>Text of about <paramref name="length"/> characters mixing ASCII, two-, three- and four-byte characters.</summary>
    private static string Mixed(int length, int seed, bool loneSurrogates)
    {
        var random = new Random(seed);
        var text = new StringBuilder(length + 2);
        while (text.Length < length)
        {
            switch (random.Next(loneSurrogates ? 7 : 5))
            {
                case 0: text.Append("\"edges\":[0.125,"); break;
                case 1: text.Append('é'); break;                 // two bytes
                case 2: text.Append('€'); break;                 // three bytes
                case 3: text.Append("\U0001F600"); break;         // a surrogate pair, four bytes
                case 4: text.Append((char)random.Next(32, 127)); break;
                case 5: text.Append('\uD83D'); break;            // a lone high surrogate
                default: text.Append('\uDE00'); break;           // a lone low surrogate
            }
        }
        return text.ToString();
    }

    [Theory]
    [InlineData(0, false)]
    [InlineData(1, false)]
    [InlineData(70_000, false)]
    [InlineData(300_000, false)]
    [InlineData(300_000, true)]
    public void SlicedTextHashesAsTheWholeText(int length, bool loneSurrogates)
    {
        foreach (var seed in new[] { 1, 2, 3 })
        {
            var text = Mixed(length, seed, loneSurrogates);
            Assert.Equal(WholeTextDigest(text), SlicedDigest(text));
        }
    }

    [Fact]
    public void AFourByteCharacterAcrossEveryPossibleSliceEndHashesAsTheWholeText()
    {
        // 65 536-byte slices of ASCII padding end at every offset around a surrogate pair.
        for (var pad = 65_530; pad < 65_540; pad++)
        {
            var text = new string('x', pad) + string.Concat(Enumerable.Repeat("\U0001F600€", 20_000)) + "\uD83D";
            Assert.Equal(WholeTextDigest(text), SlicedDigest(text));
        }
    }

    [Fact]
    public void ASealedHeaderHashesAsTheHeaderWithThePlaceholderWritten()
    {
        var recorded = ReferenceDigest.Entry(new string('a', 64));
        var header = "{\"format\":8," + Mixed(200_000, 4, loneSurrogates: true) + "," + recorded + ",\"features\":[]}";
        var withPlaceholder = header.Replace(recorded, ReferenceDigest.Entry(ReferenceDigest.Placeholder), StringComparison.Ordinal);
        using var sealedDigest = ReferenceDigest.OfSealed(header, header.IndexOf(recorded, StringComparison.Ordinal), recorded.Length);
        Assert.Equal(WholeTextDigest(withPlaceholder), sealedDigest.Finish());
    }
}
