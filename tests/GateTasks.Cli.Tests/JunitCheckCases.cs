using System.Xml.Linq;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The checks of a JUnit report by name, with their verdict and estimate, for comparing a run fanned out over shards
/// with one pass over the same files (the program compared with itself).
/// </summary>
public static class JunitCheckCases
{
    /// <summary>Every check's verdict and estimate, keyed by class name and name; the acceptance cases are left out.</summary>
    public static Dictionary<string, (string Verdict, string Estimate)> Read(string path) => XDocument.Load(path).Descendants("testcase")
        .Where(t => !t.Attribute("classname")!.Value.EndsWith(".acceptance"))
        .ToDictionary(t => t.Attribute("classname")!.Value + " " + t.Attribute("name")!.Value,
            t => (t.Descendants("property").Single(p => p.Attribute("name")!.Value == "verdict").Attribute("value")!.Value,
                  t.Descendants("property").Single(p => p.Attribute("name")!.Value == "estimate").Attribute("value")!.Value));

    /// <summary>
    /// Same checks, same verdicts, and the same estimate, as a string, for every check computed from binned (exactly
    /// summed) numbers; the unbinned moments and coefficients agree to rounding only (docs/shards.md), so their
    /// estimates are not compared. Returns the number of estimates compared.
    /// </summary>
    public static int AssertSameAsOnePass(string onePassJunit, string fannedJunit)
    {
        var a = Read(onePassJunit);
        var b = Read(fannedJunit);
        Assert.Equal(a.Keys.Order(), b.Keys.Order());
        var compared = 0;
        foreach (var (name, (verdict, estimate)) in a)
        {
            Assert.True(verdict == b[name].Verdict, $"{name}: {verdict} vs {b[name].Verdict}");
            var unbinned = name.Contains("mean-shift") || name.Contains("width-ratio-max") && !name.Contains("iqr") || name.Contains("pearson") || name.Contains("spearman");
            if (unbinned) continue;
            Assert.True(estimate == b[name].Estimate, $"{name}: {estimate} vs {b[name].Estimate}");
            compared++;
        }
        return compared;
    }
}
