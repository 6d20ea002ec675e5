using System.Text;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Shows bytes that should be UTF-8 text in a message: valid UTF-8 as text, every byte that is not part of a valid
/// sequence as <c>\xNN</c>, so a stray Latin-1 or UTF-16 byte is seen instead of a replacement character.
/// </summary>
internal static class Utf8Escapes
{
    /// <summary>The byte offset of the first byte of <paramref name="bytes"/> that is not valid UTF-8, or −1.</summary>
    public static int FirstInvalid(ReadOnlySpan<byte> bytes)
    {
        for (var offset = 0; offset < bytes.Length;)
        {
            if (Rune.DecodeFromUtf8(bytes[offset..], out _, out var consumed) != System.Buffers.OperationStatus.Done) return offset;
            offset += consumed;
        }
        return -1;
    }

    /// <summary><paramref name="bytes"/> as text, invalid bytes as <c>\xNN</c>.</summary>
    public static string Show(ReadOnlySpan<byte> bytes)
    {
        var text = new StringBuilder(bytes.Length);
        for (var offset = 0; offset < bytes.Length;)
        {
            if (Rune.DecodeFromUtf8(bytes[offset..], out var rune, out var consumed) == System.Buffers.OperationStatus.Done)
            {
                text.Append(rune.ToString());
                offset += consumed;
            }
            else
            {
                text.Append(System.Globalization.CultureInfo.InvariantCulture, $"\\x{bytes[offset]:X2}");
                offset++;
            }
        }
        return text.ToString();
    }
}
