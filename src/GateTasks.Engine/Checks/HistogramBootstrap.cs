using MathNet.Numerics.Random;

namespace GateTasks.Engine.Checks;

/// <summary>Contents of one histogram's cells: Σw and Σw².</summary>
internal readonly record struct CellContents(double[] SumW, double[] SumW2);

/// <summary>
/// Standard error of a histogram distance by a parametric bootstrap (Efron 1979): each cell's Σw is redrawn from a
/// normal of variance Σw² (the large-count limit of Poisson fluctuations, weights included), with a fixed seed so
/// every run gives the same numbers. The reference and surrogate parts of the error are estimated separately,
/// which tells how the error shrinks with more surrogate events.
/// </summary>
internal static class HistogramBootstrap
{
    public const int Replicas = 200;

    public readonly record struct Errors(double Total, double Reference, double Surrogate);

    public static Errors StandardErrors(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance, int seed)
    {
        var refOnly = Spread(reference, surrogate, distance, seed, perturbReference: true, perturbSurrogate: false);
        var surOnly = Spread(reference, surrogate, distance, seed + 1, perturbReference: false, perturbSurrogate: true);
        // The two samples are independent, so their parts add in quadrature.
        return new Errors(Math.Sqrt(refOnly * refOnly + surOnly * surOnly), refOnly, surOnly);
    }

    /// <summary>A seed that depends only on the names, so results do not depend on check order or thread count.</summary>
    public static int Seed(string feature, string check)
    {
        // FNV-1a (Fowler, Noll, Vo): stable across runs and platforms, unlike string.GetHashCode.
        var h = 2166136261u;
        foreach (var ch in feature + "\u0000" + check)
        {
            h ^= ch;
            h *= 16777619u;
        }
        return (int)(h & 0x7fffffff);
    }

    private static double Spread(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance, int seed,
        bool perturbReference, bool perturbSurrogate)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        var a = new double[reference.SumW.Length];
        var b = new double[surrogate.SumW.Length];
        double sum = 0, sumSq = 0;
        for (var r = 0; r < Replicas; r++)
        {
            Draw(reference, a, rng, perturbReference);
            Draw(surrogate, b, rng, perturbSurrogate);
            var v = distance(a, b);
            sum += v;
            sumSq += v * v;
        }
        var mean = sum / Replicas;
        return Math.Sqrt(Math.Max(0, sumSq / Replicas - mean * mean) * Replicas / (Replicas - 1));
    }

    private static void Draw(CellContents cells, double[] into, Random rng, bool perturb)
    {
        for (var i = 0; i < into.Length; i++)
        {
            if (!perturb || cells.SumW2[i] <= 0)
            {
                into[i] = cells.SumW[i];
                continue;
            }
            into[i] = Math.Max(0, cells.SumW[i] + Math.Sqrt(cells.SumW2[i]) * MathNet.Numerics.Distributions.Normal.Sample(rng, 0, 1));
        }
    }
}
