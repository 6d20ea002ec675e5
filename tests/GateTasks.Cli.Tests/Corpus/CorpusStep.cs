using System.Globalization;
using ParquetSharp;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Cli.Tests.Corpus;

/// <summary>The file actions a case's <c>prepare</c> list may take (tests/corpus/README.md); gatetasks commands run elsewhere.</summary>
internal static class CorpusStep
{
    public static void Apply(string kind, YamlMappingNode args, string folder)
    {
        string Arg(string key) => CorpusCase.Text(args[key]);
        string PathOf(string key) => Path.Combine(folder, Arg(key));
        switch (kind)
        {
            case "parquet":
                var types = args.Children.TryGetValue("types", out var t)
                    ? ((YamlMappingNode)t).Children.ToDictionary(p => CorpusCase.Text(p.Key), p => CorpusCase.Text(p.Value))
                    : [];
                var checksums = args.Children.TryGetValue("checksums", out var c) && CorpusCase.Text(c) == "on";
                // columns: [x, y, n, x=y] writes those CSV columns in that order, the last one named x but holding y.
                var columns = args.Children.TryGetValue("columns", out var cs)
                    ? ((YamlSequenceNode)cs).Children.Select(CorpusCase.Text).ToList()
                    : null;
                WriteParquet(PathOf("from"), PathOf("to"), types, checksums, columns);
                break;
            case "cut":
                var whole = File.ReadAllBytes(PathOf("file"));
                var from = int.Parse(Arg("offset"), CultureInfo.InvariantCulture);
                var count = int.Parse(Arg("bytes"), CultureInfo.InvariantCulture);
                File.WriteAllBytes(PathOf("file"), [.. whole[..from], .. whole[(from + count)..]]);
                break;
            case "insert":
                var original = File.ReadAllBytes(PathOf("file"));
                var offset = int.Parse(Arg("offset"), CultureInfo.InvariantCulture);
                File.WriteAllBytes(PathOf("file"), [.. original[..offset], .. Convert.FromHexString(Arg("hex")), .. original[offset..]]);
                break;
            case "add-column":
                AddColumn(PathOf("file"), Arg("name"), Arg("value"),
                    args.Children.TryGetValue("at", out var overrides)
                        ? ((YamlMappingNode)overrides).Children.ToDictionary(p => int.Parse(CorpusCase.Text(p.Key), CultureInfo.InvariantCulture), p => CorpusCase.Text(p.Value))
                        : []);
                break;
            case "truncate":
                var bytes = File.ReadAllBytes(PathOf("file"));
                File.WriteAllBytes(PathOf("file"), bytes[..(int)(bytes.Length * double.Parse(Arg("keep"), CultureInfo.InvariantCulture))]);
                break;
            case "flip":
                var data = File.ReadAllBytes(PathOf("file"));
                // mask: the bits to invert (hex, e.g. "02"); all eight unless given.
                var mask = args.Children.ContainsKey("mask") ? Convert.FromHexString(Arg("mask"))[0] : (byte)0xFF;
                data[int.Parse(Arg("offset"), CultureInfo.InvariantCulture)] ^= mask;
                File.WriteAllBytes(PathOf("file"), data);
                break;
            case "copy":
                File.Copy(PathOf("from"), PathOf("to"), overwrite: true);
                break;
            case "replace":
                var text = File.ReadAllText(PathOf("file"));
                var at = text.IndexOf(Arg("text"), StringComparison.Ordinal);
                Assert.True(at >= 0, $"'{Arg("text")}' not found in {Arg("file")}");
                File.WriteAllText(PathOf("file"), text[..at] + Arg("with") + text[(at + Arg("text").Length)..]);
                break;
            case "repeat":
                var content = File.ReadAllText(PathOf("file"));
                var times = int.Parse(Arg("times"), CultureInfo.InvariantCulture);
                File.WriteAllText(PathOf("file"), content.Replace(Arg("marker"), string.Concat(Enumerable.Repeat(Arg("text"), times)), StringComparison.Ordinal));
                break;
            case "link":
                var link = PathOf("path");
                Directory.CreateDirectory(Path.GetDirectoryName(link)!);
                Directory.CreateSymbolicLink(link, Arg("to"));
                break;
            default:
                throw new InvalidOperationException($"unknown corpus step '{kind}'");
        }
    }

    /// <summary>Appends a column to every line of a CSV: its name to the header, <paramref name="value"/> to each record but those <paramref name="at"/> names (1-based record numbers).</summary>
    private static void AddColumn(string csv, string name, string value, IReadOnlyDictionary<int, string> at)
    {
        var lines = File.ReadAllLines(csv);
        lines[0] += "," + name;
        for (var i = 1; i < lines.Length; i++) lines[i] += "," + at.GetValueOrDefault(i, value);
        File.WriteAllText(csv, string.Join('\n', lines) + "\n");
    }

    /// <summary>
    /// Writes a CSV's columns to Parquet with ParquetSharp: one uncompressed row group, no dictionary. <paramref name="columns"/>
    /// picks and orders them (<c>name=source</c> writes column source under another name); all in file order when null.
    /// </summary>
    private static void WriteParquet(string csv, string parquet, IReadOnlyDictionary<string, string> types, bool checksums, IReadOnlyList<string>? columns)
    {
        var lines = File.ReadAllLines(csv);
        var header = lines[0].Split(',');
        var picked = (columns ?? header).Select(c => c.Split('=') is [var n, var from] ? (Name: n, Source: Array.IndexOf(header, from)) : (Name: c, Source: Array.IndexOf(header, c))).ToArray();
        Assert.DoesNotContain(picked, p => p.Source < 0);
        var names = picked.Select(p => p.Name).ToArray();
        var rows = lines.Skip(1).Select(l => l.Split(',')).ToList();
        string[] Cells(int c) => rows.Select(r => r[picked[c].Source]).ToArray();
        double Number(string s) => double.Parse(s, CultureInfo.InvariantCulture);

        using var builder = new WriterPropertiesBuilder();
        builder.Compression(Compression.Uncompressed).DisableDictionary();
        if (checksums) builder.EnablePageChecksum();
        using var properties = builder.Build();
        var schema = names.Select(n => (Column)(types.GetValueOrDefault(n, "double") switch
        {
            "float" => new Column<float>(n),
            "int" => new Column<int>(n),
            "long" => new Column<long>(n),
            "string" => new Column<string>(n),
            _ => new Column<double>(n),
        })).ToArray();
        using var file = new ParquetFileWriter(parquet, schema, properties);
        using (var group = file.AppendRowGroup())
            for (var c = 0; c < names.Length; c++)
            {
                var cells = Cells(c);
                switch (types.GetValueOrDefault(names[c], "double"))
                {
                    case "float": Write(group, cells.Select(s => (float)Number(s)).ToArray()); break;
                    case "int": Write(group, cells.Select(s => (int)Number(s)).ToArray()); break;
                    case "long": Write(group, cells.Select(s => (long)Number(s)).ToArray()); break;
                    case "string": Write(group, cells); break;
                    default: Write(group, cells.Select(Number).ToArray()); break;
                }
            }
        file.Close();
    }

    private static void Write<T>(RowGroupWriter group, T[] values)
    {
        using var writer = group.NextColumn().LogicalWriter<T>();
        writer.WriteBatch(values);
    }
}
