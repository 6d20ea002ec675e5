using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The joint block's CLI tests' shared setup: a work folder holding the fixed data set of tests/fixtures/joint, or a
/// numpy draw of tests/studies/joint_distance_data.py, under a contract, with its reference built; and the joint
/// checks' JUnit properties read back.
/// </summary>
internal static class JointTestData
{
    /// <summary>The fixed data set (reference.csv, 6 000 events; sample.csv, 4 000) in <paramref name="folder"/> under <paramref name="contract"/>; the contract's path.</summary>
    public static string FixedDataSet(string folder, string contract)
    {
        Directory.CreateDirectory(Path.Combine(folder, ".git"));
        var data = Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "joint");
        File.Copy(Path.Combine(data, "reference.csv"), Path.Combine(folder, "reference.csv"), overwrite: true);
        File.Copy(Path.Combine(data, "sample.csv"), Path.Combine(folder, "sample.csv"), overwrite: true);
        return WithReference(folder, contract);
    }

    /// <summary>
    /// A reference and a <paramref name="surrogate"/> sample (faithful, permuted) of <paramref name="events"/> events
    /// each drawn by numpy into a subfolder of <paramref name="work"/>, under a contract of the features x, y, u
    /// (<c>ks-max: 0.05</c> each) and a joint block over them with <paramref name="jointKeys"/>; the contract's path,
    /// and numpy's output.
    /// </summary>
    public static (string ContractPath, string Output) Drawn(string work, string surrogate, int events, int seed, string jointKeys)
    {
        var folder = Path.Combine(work, surrogate);
        var (exit, output, errors) = ProcessRunner.Run(ExternalPython.Interpreter,
            [Path.Combine(RepositoryRoot.Path, "tests", "studies", "joint_distance_data.py"), "--out", folder, "--events", $"{events}", "--seed", $"{seed}", "--surrogate", surrogate],
            work, null, 300);
        Assert.True(exit == 0, output + errors);
        Directory.CreateDirectory(Path.Combine(folder, ".git"));
        var contract = """
            contract-version: 1
            sample: sample.csv
            reference: reference.parquet
            features:
              - name: x
                checks: { ks-max: 0.05 }
              - name: y
                checks: { ks-max: 0.05 }
              - name: u
                checks: { ks-max: 0.05 }
            joint:
              features: [x, y, u]

            """ + jointKeys;
        return (WithReference(folder, contract), output + errors);
    }

    /// <summary>Each check of <paramref name="subject"/> (e.g. <c>joint(a,b,c)</c>) in a JUnit report: its properties, by check name.</summary>
    public static Dictionary<string, Dictionary<string, string>> Cases(string junit, string subject) => XDocument.Load(junit).Descendants("testcase")
        .Where(t => t.Attribute("classname")!.Value.EndsWith("." + subject, StringComparison.Ordinal))
        .ToDictionary(t => t.Attribute("name")!.Value,
            t => t.Descendants("property").ToDictionary(p => p.Attribute("name")!.Value, p => p.Attribute("value")!.Value));

    private static string WithReference(string folder, string contract)
    {
        var contractPath = Path.Combine(folder, "precision-contract.yaml");
        File.WriteAllText(contractPath, contract);
        var (code, stdout, stderr) = Cli.Run("reference", "build", "--contract", contractPath, "--from", Path.Combine(folder, "reference.csv"));
        Assert.True(code == 0, stdout + stderr);
        return contractPath;
    }
}
