using System.Globalization;
using System.IO;
using System.Text;

namespace GateTasks.Engine.Reports;

/// <summary>A StringWriter that declares UTF-8, so an XML declaration written through it says what the file will be.</summary>
internal sealed class StringWriterUtf8(StringBuilder sb) : StringWriter(sb, CultureInfo.InvariantCulture)
{
    public override Encoding Encoding => new UTF8Encoding(false);
}
