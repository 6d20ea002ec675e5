using System.Diagnostics;
using System.Globalization;
using GateTasks.Engine.Samples;

namespace GateTasks.Cli;

/// <summary>
/// Shows how far a long read has got. On an interactive terminal: one line on stderr, rewritten in place a few times
/// a second (events read, rate, time left) and cleared at the end. Elsewhere — redirected output, CI, the build
/// step — a plain <c>progress:</c> line on stdout every <see cref="PlainInterval"/>, and only for passes that last
/// that long, so short runs print nothing extra and logs stay readable.
/// </summary>
internal sealed class ProgressDisplay : IProgress<ReadProgress>
{
    private static readonly TimeSpan LiveInterval = TimeSpan.FromMilliseconds(250);
    /// <summary>How often plain lines are written during a long pass.</summary>
    public static readonly TimeSpan PlainInterval = TimeSpan.FromSeconds(10);

    private readonly Action<string> _plainLine;
    private readonly TextWriter _stderr;
    private readonly bool _live;
    private readonly TimeSpan _plainInterval;
    private readonly Stopwatch _sinceShown = Stopwatch.StartNew();
    private string _phase = "";
    private bool _shownThisPass;
    private int _lastWidth;

    internal ProgressDisplay(TextWriter stdout, TextWriter stderr, bool live, TimeSpan plainInterval, Action<string>? plainLine = null)
    {
        _plainLine = plainLine ?? stdout.WriteLine;
        _stderr = stderr;
        _live = live;
        _plainInterval = plainInterval;
    }

    /// <summary>A display for these writers: live only when they are the process's own console and no CI is running.</summary>
    public static ProgressDisplay For(TextWriter stdout, TextWriter stderr) => new(stdout, stderr, Live(stderr), PlainInterval);

    /// <summary>A display whose plain lines are notes of <paramref name="output"/> (so the build step shows them too).</summary>
    public static ProgressDisplay For(CommandOutput output) => new(output.Out, output.Error, Live(output.Error), PlainInterval, output.Note);

    private static bool Live(TextWriter stderr)
    {
        var console = ReferenceEquals(stderr, Console.Error) && !Console.IsErrorRedirected;
        var ci = Environment.GetEnvironmentVariable("CI") is { Length: > 0 } v && v != "false" && v != "0";
        var dumb = Environment.GetEnvironmentVariable("TERM") == "dumb";
        return console && !ci && !dumb;
    }

    public void Report(ReadProgress p)
    {
        if (p.Phase != _phase)
        {
            _phase = p.Phase;
            _shownThisPass = false;
            _sinceShown.Restart();
        }
        if (_live)
        {
            if (p.Finished)
            {
                if (_lastWidth > 0) _stderr.Write("\r" + new string(' ', _lastWidth) + "\r");
                _lastWidth = 0;
                return;
            }
            if (p.Elapsed < TimeSpan.FromSeconds(0.5) || (_shownThisPass && _sinceShown.Elapsed < LiveInterval)) return;
            var text = Describe(p);
            _stderr.Write("\r" + text.PadRight(_lastWidth));
            _lastWidth = text.Length;
            _shownThisPass = true;
            _sinceShown.Restart();
            return;
        }
        // Plain lines: one per interval in a long pass, and a closing one for a pass that printed any.
        if (p.Finished ? _shownThisPass : _sinceShown.Elapsed >= _plainInterval)
        {
            _plainLine("progress: " + Describe(p));
            _shownThisPass = !p.Finished;
            _sinceShown.Restart();
        }
    }

    internal static string Describe(ReadProgress p)
    {
        var read = Events(p.RowsRead);
        var of = p.RowsTotal is { } t && t > 0
            ? $"{read} of {Events(t)} events ({(100.0 * p.RowsRead / t).ToString("0", CultureInfo.InvariantCulture)}%)"
            : $"{read} events";
        var rate = double.IsFinite(p.Rate) ? $", {Events((long)p.Rate)} events/s" : "";
        var left = p.Finished ? $", done in {Seconds(p.Elapsed)}" : p.Remaining is { } r ? $", about {Seconds(r)} left" : "";
        return $"{p.Phase}: {of}{rate}{left}";
    }

    private static string Events(long n) => n switch
    {
        >= 10_000_000 => (n / 1e6).ToString("0", CultureInfo.InvariantCulture) + " M",
        >= 1_000_000 => (n / 1e6).ToString("0.0", CultureInfo.InvariantCulture) + " M",
        >= 10_000 => (n / 1e3).ToString("0", CultureInfo.InvariantCulture) + " k",
        _ => n.ToString(CultureInfo.InvariantCulture),
    };

    private static string Seconds(TimeSpan t) => t.TotalSeconds < 90
        ? t.TotalSeconds.ToString("0", CultureInfo.InvariantCulture) + " s"
        : t.TotalMinutes.ToString("0", CultureInfo.InvariantCulture) + " min";
}
