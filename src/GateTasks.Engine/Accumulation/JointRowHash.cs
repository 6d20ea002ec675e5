using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// A 64-bit hash of a row's joint feature values (−0 read as +0, so equal numbers hash alike), computed column by
/// column over a chunk of rows. The hash is two 32-bit halves: each value's low and high 32 bits are xor-ed into the
/// low and high half, multiplied by an odd constant (modulo 2³²) and folded (h ^= h >> 16), so four rows take one
/// 256-bit vector step a feature (System.Runtime.Intrinsics, 32-bit lane multiplies that AVX2 has; the scalar loop
/// gives the same bits where vectors are not accelerated). SplitMix64's finaliser (Steele, Lea &amp; Flood 2014, "Fast
/// splittable pseudorandom number generators", OOPSLA) then mixes the 64 bits. The starting value differs from the
/// sliced counter's group hash so that the kernel's subsample does not line up with the sliced groups. Rows with equal
/// values get equal hashes, whatever file, shard or batch they come in. NaN and infinities hash like any value; the
/// caller leaves such rows out.
/// </summary>
internal static class JointRowHash
{
    /// <summary>The starting value: the first 64 bits of the fractional part of √2.</summary>
    private const ulong Seed = 0x6A09E667F3BCC908UL;
    // An odd 32-bit multiplier (2³² / golden ratio, Knuth's multiplicative hashing).
    private const uint Multiplier = 0x9E3779B1U;

    /// <summary>Starts the hashes of a chunk's rows.</summary>
    public static void Begin(Span<ulong> hashes) => hashes.Fill(Seed);

    /// <summary>Folds one feature's values (one column of the chunk) into the hashes.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static void Mix(ReadOnlySpan<double> column, Span<ulong> hashes)
    {
        if (column.Length != hashes.Length)
            throw new ArgumentException($"A column of {column.Length} values for {hashes.Length} hashes.", nameof(column));
        // Bounds checked once above; the loops run on references (this is the whole per-row cost of the subsample).
        ref var x = ref MemoryMarshal.GetReference(column);
        ref var h = ref Unsafe.As<ulong, uint>(ref MemoryMarshal.GetReference(hashes));
        var r = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var multiplier = Vector256.Create(Multiplier);
            for (; r + 4 <= column.Length; r += 4)
            {
                var v = Vector256.LoadUnsafe(ref x, (nuint)r);
                // ±0 compare equal to zero: clearing their bits reads −0 as +0; NaN compares unequal and keeps its bits.
                var bits = Vector256.AndNot(v, Vector256.Equals(v, Vector256<double>.Zero)).AsUInt32();
                var m = (Vector256.LoadUnsafe(ref h, (nuint)(2 * r)) ^ bits) * multiplier;
                (m ^ Vector256.ShiftRightLogical(m, 16)).StoreUnsafe(ref h, (nuint)(2 * r));
            }
        }
        for (; r < column.Length; r++)
        {
            var v = Unsafe.Add(ref x, r);
            var bits = (ulong)BitConverter.DoubleToInt64Bits(v == 0 ? 0.0 : v);
            var lo = (Unsafe.Add(ref h, 2 * r) ^ (uint)bits) * Multiplier;
            var hi = (Unsafe.Add(ref h, 2 * r + 1) ^ (uint)(bits >> 32)) * Multiplier;
            Unsafe.Add(ref h, 2 * r) = lo ^ (lo >> 16);
            Unsafe.Add(ref h, 2 * r + 1) = hi ^ (hi >> 16);
        }
    }

    /// <summary>Finishes the hashes (SplitMix64's finaliser).</summary>
    public static void End(Span<ulong> hashes)
    {
        for (var r = 0; r < hashes.Length; r++)
        {
            var h = hashes[r];
            h = (h ^ (h >> 30)) * 0xBF58476D1CE4E5B9UL;
            h = (h ^ (h >> 27)) * 0x94D049BB133111EBUL;
            hashes[r] = h ^ (h >> 31);
        }
    }

    /// <summary>The hash of one row (what <see cref="Begin"/>, <see cref="Mix"/> and <see cref="End"/> give it in a chunk).</summary>
    public static ulong Of(ReadOnlySpan<double> row)
    {
        Span<ulong> h = stackalloc ulong[1];
        Begin(h);
        for (var k = 0; k < row.Length; k++) Mix(row.Slice(k, 1), h);
        End(h);
        return h[0];
    }

    /// <summary>The bits that rank a row for the subsample: the top 60 (so ordering by hash orders by key).</summary>
    public static ulong SelectionKey(ulong hash) => hash >> 4;

    /// <summary>The block (of 16) a kept row's kernel sums go to: the low 4 bits, which do not take part in the selection.</summary>
    public static int Block(ulong hash) => (int)(hash & 15);
}
