using System.Globalization;

namespace GateTasks.Engine.Samples;

/// <summary>
/// The spellings of a number a sample CSV cell may hold: invariant-culture decimal or exponent notation,
/// NaN and infinities in the usual spellings, <c>true</c>/<c>false</c>, and an empty cell for a missing value.
/// </summary>
internal static class CsvNumber
{
    /// <summary>Parses one UTF-8 cell; false when it is none of the accepted spellings.</summary>
    public static bool TryParse(ReadOnlySpan<byte> cell, out double value)
    {
        var text = cell.Trim(" \t"u8);
        if (text.IsEmpty)
        {
            value = double.NaN; // a missing value, as a Parquet null
            return true;
        }
        // Float: sign, decimals, exponent; no thousands separators (a comma is the field separator anyway).
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out value))
            return true;
        return TryParseWord(text, out value);
    }

    private static bool TryParseWord(ReadOnlySpan<byte> text, out double value)
    {
        var negative = text[0] == (byte)'-';
        var word = text[0] is (byte)'-' or (byte)'+' ? text[1..] : text;
        if (Is(word, "inf"u8) || Is(word, "infinity"u8))
        {
            value = negative ? double.NegativeInfinity : double.PositiveInfinity;
            return true;
        }
        if (Is(word, "nan"u8))
        {
            value = double.NaN;
            return true;
        }
        if (word.Length == text.Length && Is(word, "true"u8))
        {
            value = 1.0;
            return true;
        }
        if (word.Length == text.Length && Is(word, "false"u8))
        {
            value = 0.0;
            return true;
        }
        value = 0;
        return false;
    }

    private static bool Is(ReadOnlySpan<byte> text, ReadOnlySpan<byte> lowerWord)
    {
        if (text.Length != lowerWord.Length) return false;
        for (var i = 0; i < text.Length; i++)
        {
            // ASCII lower-casing only: the accepted words are ASCII.
            var b = text[i] is >= (byte)'A' and <= (byte)'Z' ? (byte)(text[i] | 0x20) : text[i];
            if (b != lowerWord[i]) return false;
        }
        return true;
    }
}
