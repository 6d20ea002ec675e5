namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The benchmark's 20 float32 features: a spread of shapes (peaks, falling spectra, flat, heavy tails, mixtures)
/// so that equal-probability edges, regular axes and flow cells all get exercised. Each (column, row group) pair has
/// its own seeded stream, so the same seed gives the same values whatever order the columns are generated in.
/// </summary>
internal static class SyntheticFeatures
{
    public const int Count = 20;

    /// <summary>Column names, x00 … x19.</summary>
    public static IReadOnlyList<string> Names { get; } = Enumerable.Range(0, Count).Select(i => $"x{i:00}").ToArray();

    /// <summary>Features with an equal-width axis in the contract, and that axis: (feature, bins, lower, upper).</summary>
    public static IReadOnlyList<(int Feature, int Bins, double Lower, double Upper)> RegularAxes { get; } =
    [
        (2, 50, 25, 125),
        (4, 50, -2.5, 2.5),
        (5, 32, -3.2, 3.2),
        (14, 40, 0, 1),
        (17, 20, -1, 1),
    ];

    /// <summary>Fills <paramref name="destination"/> with values of feature <paramref name="feature"/>.</summary>
    public static void Generate(int feature, int seed, int rowGroup, Span<float> destination)
    {
        // System.Random with a seed runs the same (legacy) algorithm on every .NET version.
        var random = new Random(unchecked(seed * 1_000_003 + feature * 7_919 + rowGroup * 104_729));
        for (var i = 0; i < destination.Length; i++) destination[i] = (float)Draw(feature, random);
    }

    private static double Draw(int feature, Random r) => feature switch
    {
        0 => Normal(r),
        1 => 91.2 + 2.5 * Normal(r),                                       // a narrow resonance
        2 => 25 + Exponential(r, 20),                                      // a falling spectrum past a threshold
        3 => Math.Exp(3 + 0.6 * Normal(r)),                                // log-normal
        4 => -2.5 + 5 * r.NextDouble(),                                    // flat, as a pseudorapidity
        5 => Math.PI * (2 * r.NextDouble() - 1),                           // flat azimuth
        6 => Exponential(r, 10) + Exponential(r, 10),                      // gamma, k = 2
        7 => r.NextDouble() < 0.7 ? Normal(r) : 3 + 0.5 * Normal(r),       // two-component mixture
        8 => r.NextDouble() < 0.2 ? Cauchy(r, 125, 2) : 100 + Exponential(r, 40), // peak over a continuum, heavy tails
        9 => Square(Normal(r)) + Square(Normal(r)) + Square(Normal(r)),    // χ² with 3 degrees of freedom
        10 => r.NextDouble() + r.NextDouble(),                             // triangular
        11 => 0.01 * Normal(r),                                            // a narrow residual
        12 => Exponential(r, 1),
        13 => Normal(r) / Math.Sqrt((Square(Normal(r)) + Square(Normal(r)) + Square(Normal(r)) + Square(Normal(r))) / 4), // Student t, 4 dof
        14 => r.NextDouble(),
        15 => 5 * Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())),            // Rayleigh
        16 => Math.Pow(10, 3 * r.NextDouble()),                            // log-uniform over three decades
        17 => 2 * r.NextDouble() - 1,                                      // flat cos θ
        18 => 50 + 15 * Normal(r),
        _ => 10 * Math.Pow(-Math.Log(1 - r.NextDouble()), 1 / 1.5),        // Weibull, k = 1.5
    };

    private static double Square(double x) => x * x;

    private static double Exponential(Random r, double scale) => -scale * Math.Log(1 - r.NextDouble());

    private static double Cauchy(Random r, double location, double halfWidth) => location + halfWidth * Math.Tan(Math.PI * (r.NextDouble() - 0.5));

    // Box–Muller (1958); one of the pair is enough here.
    private static double Normal(Random r) => Math.Sqrt(-2 * Math.Log(1 - r.NextDouble())) * Math.Cos(2 * Math.PI * r.NextDouble());
}
