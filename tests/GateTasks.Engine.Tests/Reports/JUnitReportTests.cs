using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Reports;

public class JUnitReportTests
{
    [Fact]
    public void Characters_XML_1_0_forbids_and_ANSI_colour_codes_are_stripped()
    {
        // XML 1.0 (W3C Recommendation, 5th ed.), production [2] Char: tab, LF, CR allowed; other C0 controls are not.
        var cleaned = JUnitReport.Clean("a\u0000b\u0007c\td\ne\rf \u001b[31mred\u001b[0m \ud83d\ude00");
        Assert.Equal("abc\td\ne\rf red \ud83d\ude00", cleaned);
        Assert.Equal("x", JUnitReport.Clean("x\ud800")); // a lone surrogate cannot be encoded either
    }
}
