using System.Runtime.CompilerServices;
using MathNet.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// A fast seeded source of uniform, standard normal and Poisson variates for the bootstraps, which draw millions of
/// them per check: xoshiro256** (Blackman &amp; Vigna 2021, ACM TOMS 47:36) seeded through SplitMix64 (Steele, Lea &amp;
/// Flood 2014), with no virtual call per number. Not thread-safe: one per bootstrap. A mutable struct, so that a loop
/// drawing from a local copy keeps the generator's state in registers; pass it by reference and copy it only to write
/// the copy back, since two copies repeat one stream.
/// </summary>
internal struct SeededSampler
{
    private ulong _s0, _s1, _s2, _s3;

    public SeededSampler(long seed)
    {
        var x = unchecked((ulong)seed);
        _s0 = SplitMix(ref x);
        _s1 = SplitMix(ref x);
        _s2 = SplitMix(ref x);
        _s3 = SplitMix(ref x);
    }

    private static ulong SplitMix(ref ulong x)
    {
        var z = unchecked(x += 0x9E3779B97F4A7C15UL);
        z = unchecked((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL);
        z = unchecked((z ^ (z >> 27)) * 0x94D049BB133111EBUL);
        return z ^ (z >> 31);
    }

    // Inlined (as are the other small steps of a draw): the bootstraps call these millions of times per check.
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private ulong Next()
    {
        var result = unchecked(ulong.RotateLeft(_s1 * 5, 7) * 9);
        var t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = ulong.RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>A uniform number in [0, 1), of 53 random bits.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Uniform() => (Next() >> 11) * (1.0 / (1UL << 53));

    /// <summary>
    /// A standard normal number by the ziggurat method (Marsaglia &amp; Tsang 2000, J. Stat. Softw. 5(8)) in Doornik's
    /// form (2005, "An Improved Ziggurat Method to Generate Normal Random Samples"): 128 layers, the layer's index and
    /// the uniform taken from separate bits of one draw, the tail beyond R by Marsaglia's (1964) method. Exact; about
    /// one draw a number.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Normal()
    {
        // The rectangle's test, which most draws pass, inline; the wedge and the tail apart.
        var bits = Next();
        var u = 2 * ((bits >> 11) * (1.0 / (1UL << 53))) - 1;
        var i = (int)(bits & (ZigguratLayers - 1));
        if (Math.Abs(u) < ZigguratRatio[i]) return u * ZigguratX[i];
        // The rare rest through a copy, so that a caller's generator is never passed by address and stays in registers.
        var rest = this;
        var x = rest.NormalOutsideRectangle(u, i);
        this = rest;
        return x;
    }

    /// <summary>The rest of <see cref="Normal"/> for a draw outside its layer's rectangle, then further draws as needed.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private double NormalOutsideRectangle(double u, int i)
    {
        while (true)
        {
            if (i == 0) return NormalTail(u < 0);
            var x = u * ZigguratX[i];
            var f0 = Math.Exp(-0.5 * (ZigguratX[i] * ZigguratX[i] - x * x));
            var f1 = Math.Exp(-0.5 * (ZigguratX[i + 1] * ZigguratX[i + 1] - x * x));
            if (f1 + Uniform() * (f0 - f1) < 1.0) return x;
            var bits = Next();
            u = 2 * ((bits >> 11) * (1.0 / (1UL << 53))) - 1;
            i = (int)(bits & (ZigguratLayers - 1));
            if (Math.Abs(u) < ZigguratRatio[i]) return u * ZigguratX[i];
        }
    }

    private double NormalTail(bool negative)
    {
        double x, y;
        do
        {
            // 1 − U lies in (0, 1], so both logarithms are finite.
            x = Math.Log(1 - Uniform()) / ZigguratR;
            y = Math.Log(1 - Uniform());
        }
        while (-2 * y < x * x);
        return negative ? x - ZigguratR : ZigguratR - x;
    }

    private const int ZigguratLayers = 128;
    private const double ZigguratR = 3.442619855899, ZigguratV = 9.91256303526217e-3;
    private static readonly double[] ZigguratX = ZigguratEdges();
    private static readonly double[] ZigguratRatio = Enumerable.Range(0, ZigguratLayers).Select(i => ZigguratX[i + 1] / ZigguratX[i]).ToArray();

    /// <summary>The layers' right edges, x[0] = V/f(R) for the base layer (with its tail), x[1] = R, …, x[128] = 0.</summary>
    private static double[] ZigguratEdges()
    {
        var x = new double[ZigguratLayers + 1];
        var f = Math.Exp(-0.5 * ZigguratR * ZigguratR);
        x[0] = ZigguratV / f;
        x[1] = ZigguratR;
        for (var i = 2; i < ZigguratLayers; i++)
        {
            x[i] = Math.Sqrt(-2 * Math.Log(ZigguratV / x[i - 1] + f));
            f = Math.Exp(-0.5 * x[i] * x[i]);
        }
        x[ZigguratLayers] = 0;
        return x;
    }

    /// <summary>A Poisson number of mean <paramref name="law"/>'s, from its precomputed constants.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public long Poisson(in PoissonLaw law) => law.Mean < PoissonLaw.RejectionFrom ? PoissonByProduct(law) : PoissonByRejection(law);

    /// <summary>Knuth's product of uniforms (Devroye 1986, Non-Uniform Random Variate Generation, X.3.3): mean + 1 uniforms a draw.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private long PoissonByProduct(in PoissonLaw law)
    {
        long k = 0;
        var product = Uniform();
        while (product > law.ExpMinusMean)
        {
            k++;
            product *= Uniform();
        }
        return k;
    }

    /// <summary>
    /// The transformed rejection with squeeze of Hörmann (1993, Insurance: Mathematics and Economics 12:39), "PTRS":
    /// exact for any mean ≥ 10, about 2.3 uniforms a draw, the log-factorial needed only outside the squeeze.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private long PoissonByRejection(in PoissonLaw law)
    {
        while (true)
        {
            var u = Uniform() - 0.5;
            var v = Uniform();
            var us = 0.5 - Math.Abs(u);
            var k = (long)Math.Floor((2 * law.A / us + law.B) * u + law.Mean + 0.43);
            if (us >= 0.07 && v <= law.Vr) return k;
            if (k < 0 || (us < 0.013 && v > us)) continue;
            if (AcceptedOutsideSqueeze(law, v, us, k)) return k;
        }
    }

    /// <summary>PTRS's final test, with the logarithms the squeeze avoids: apart, since most draws never reach it.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static bool AcceptedOutsideSqueeze(in PoissonLaw law, double v, double us, long k) =>
        Math.Log(v) + law.LogInverseAlpha - Math.Log(law.A / (us * us) + law.B) <= -law.Mean + k * law.LogMean - LogFactorial(k);

    private const int TabledFactorials = 256;
    private static readonly double[] LogFactorials = Enumerable.Range(0, TabledFactorials).Select(k => SpecialFunctions.GammaLn(k + 1.0)).ToArray();

    /// <summary>
    /// ln k!: tabled below 256, above by Stirling's series to the 1/n⁵ term (Abramowitz &amp; Stegun 1964, 6.1.41),
    /// whose error there is below 1/(1680·n⁷), far under a double's resolution.
    /// </summary>
    internal static double LogFactorial(long k)
    {
        if (k < TabledFactorials) return LogFactorials[k];
        var n = k + 1.0;
        var inverse = 1 / n;
        var inverse2 = inverse * inverse;
        return (n - 0.5) * Math.Log(n) - n + 0.91893853320467274178 + inverse * (1.0 / 12 - inverse2 * (1.0 / 360 - inverse2 / 1260));
    }
}

/// <summary>A Poisson law's constants for <see cref="SeededSampler.Poisson"/>, computed once for many draws.</summary>
internal readonly struct PoissonLaw
{
    /// <summary>The mean from which the rejection method is used (Hörmann 1993 states it for means ≥ 10).</summary>
    public const double RejectionFrom = 10;

    public PoissonLaw(double mean)
    {
        if (!(mean >= 0) || !double.IsFinite(mean)) throw new ArgumentOutOfRangeException(nameof(mean), "A Poisson mean must be finite and non-negative.");
        Mean = mean;
        ExpMinusMean = Math.Exp(-mean);
        LogMean = Math.Log(mean);
        B = 0.931 + 2.53 * Math.Sqrt(mean);
        A = -0.059 + 0.02483 * B;
        LogInverseAlpha = Math.Log(1.1239 + 1.1328 / (B - 3.4));
        Vr = 0.9277 - 3.6224 / (B - 2);
    }

    // Fields, not properties, so that a draw reads them in place.
    public readonly double Mean;
    public readonly double ExpMinusMean;
    public readonly double LogMean;
    public readonly double A;
    public readonly double B;
    public readonly double LogInverseAlpha;
    public readonly double Vr;
}
