namespace GateTasks.Tests.Shared;

/// <summary>Finds the repository's top folder (the one holding GateTasks.sln) from the test's output folder.</summary>
public static class RepositoryRoot
{
    public static string Path { get; } = Find();

    private static string Find()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(System.IO.Path.Combine(dir.FullName, "GateTasks.sln"))) return dir.FullName;
        throw new InvalidOperationException("GateTasks.sln not found above " + AppContext.BaseDirectory);
    }
}
