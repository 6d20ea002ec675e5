using System.Globalization;
using System.Text;

namespace GateTasks.Cli.Tests.Corpus;

/// <summary>The base events every corpus case starts from (tests/corpus/README.md), drawn with fixed seeds.</summary>
internal static class CorpusData
{
    public const int Events = 4000;

    /// <summary>Writes reference.csv, sample.csv (the same events) and other.csv (a second draw) into <paramref name="folder"/>.</summary>
    public static void Write(string folder)
    {
        var reference = Draw(20261202);
        File.WriteAllText(Path.Combine(folder, "reference.csv"), reference);
        File.WriteAllText(Path.Combine(folder, "sample.csv"), reference);
        File.WriteAllText(Path.Combine(folder, "other.csv"), Draw(20261203));
    }

    private static string Draw(int seed)
    {
        var random = new Random(seed);
        var csv = new StringBuilder("x,y,n\n");
        for (var i = 0; i < Events; i++)
        {
            // Box–Muller for the normal, inversion for the exponential; n counts how many of three coins land heads.
            var x = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            var y = -Math.Log(1 - random.NextDouble());
            var n = (random.NextDouble() < 0.5 ? 1 : 0) + (random.NextDouble() < 0.5 ? 1 : 0) + (random.NextDouble() < 0.5 ? 1 : 0);
            csv.Append(CultureInfo.InvariantCulture, $"{x:R},{y:R},{n}\n");
        }
        return csv.ToString();
    }
}
