using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Validates JSON results against docs/result.schema.json with an independent validator: Debian's
/// python3-jsonschema (Draft202012Validator, jsonschema ≥ 4.0; 4.10.3 in Debian 12), run by /usr/bin/python3. Numbers are parsed
/// strictly: a NaN or Infinity literal (which Python's json module would accept) makes a document invalid.
/// </summary>
public static class ResultSchemaValidator
{
    public static string SchemaPath => Path.Combine(RepositoryRoot.Path, "docs", "result.schema.json");

    private const string Script = """
        import sys, json, importlib.metadata
        import jsonschema
        def no_constant(name):
            raise ValueError("not JSON: " + name)
        schema = json.load(open(sys.argv[1], encoding="utf-8"))
        jsonschema.Draft202012Validator.check_schema(schema)
        validator = jsonschema.Draft202012Validator(schema, format_checker=jsonschema.FormatChecker())
        print("jsonschema", importlib.metadata.version("jsonschema"))
        bad = 0
        for path in sys.argv[2:]:
            try:
                document = json.load(open(path, encoding="utf-8"), parse_constant=no_constant)
                errors = sorted(validator.iter_errors(document), key=lambda e: list(e.absolute_path))
            except ValueError as e:
                errors = [e]
            print(path, "valid" if not errors else "invalid")
            for e in errors[:5]:
                print("   ", "/".join(map(str, getattr(e, "absolute_path", []))), str(getattr(e, "message", e))[:300])
            bad += 1 if errors else 0
        sys.exit(1 if bad else 0)
        """;

    /// <summary>Runs the validator on <paramref name="documents"/>; its output names each file "valid" or "invalid" with the reasons.</summary>
    public static (int ExitCode, string Output) Validate(params string[] documents)
    {
        var (exit, stdout, stderr) = ExternalPython.Run(Script, [SchemaPath, .. documents]);
        return (exit, stdout + stderr);
    }

    /// <summary>The validator's version line, "jsonschema 4.10.3".</summary>
    public static string VersionLine(string output) => output.Split('\n')[0].Trim();
}
