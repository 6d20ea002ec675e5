using System.Diagnostics.CodeAnalysis;
using System.Reflection;
using PureHDF;

namespace GateTasks.Engine.Samples.Hdf5;

/// <summary>
/// The byte order of an HDF5 number type. PureHDF 2.2 decodes it (the datatype message's bit field) but does not
/// publish it, and its compound reader copies member bytes without swapping them, so a big-endian member would be
/// read wrong without a word. The order is read from the library's datatype message by name; if that shape ever
/// changes (another PureHDF version), the order is unknown and the column is refused rather than guessed.
/// </summary>
internal static class Hdf5ByteOrder
{
    // The members read by name below, kept for a trimmed or ahead-of-time compiled tool (which would otherwise drop
    // them, and every HDF5 number column would be refused as of unknown order). Number columns only: fixed and
    // floating point are the bit fields asked about.
    /// <summary>Whether <paramref name="type"/> is big-endian; null when that cannot be told.</summary>
    [DynamicDependency("_dataType", "PureHDF.VOL.Native.NativeDataType", "PureHDF")]
    [DynamicDependency(DynamicallyAccessedMemberTypes.PublicProperties | DynamicallyAccessedMemberTypes.NonPublicProperties, "PureHDF.VOL.Native.DatatypeMessage", "PureHDF")]
    [DynamicDependency(DynamicallyAccessedMemberTypes.PublicProperties | DynamicallyAccessedMemberTypes.NonPublicProperties, "PureHDF.VOL.Native.FixedPointBitFieldDescription", "PureHDF")]
    [DynamicDependency(DynamicallyAccessedMemberTypes.PublicProperties | DynamicallyAccessedMemberTypes.NonPublicProperties, "PureHDF.VOL.Native.FloatingPointBitFieldDescription", "PureHDF")]
    [DynamicDependency(DynamicallyAccessedMemberTypes.PublicFields, "PureHDF.VOL.Native.ByteOrder", "PureHDF")]
    [UnconditionalSuppressMessage("Trimming", "IL2075", Justification = "The members read are kept by the DynamicDependency attributes above; tests/GateTasks.Cli.Tests reads big-endian HDF5 columns with the native executable (GATETASKS_TEST_EXECUTABLE).")]
    public static bool? IsBigEndian(IH5DataType type)
    {
        try
        {
            var message = type.GetType().GetField("_dataType", BindingFlags.Instance | BindingFlags.NonPublic)?.GetValue(type);
            var bitField = message?.GetType().GetProperty("BitField", BindingFlags.Instance | BindingFlags.Public | BindingFlags.NonPublic)?.GetValue(message);
            var order = bitField?.GetType().GetProperty("ByteOrder", BindingFlags.Instance | BindingFlags.Public | BindingFlags.NonPublic)?.GetValue(bitField);
            return order?.ToString() switch
            {
                "LittleEndian" => false,
                "BigEndian" => true,
                _ => null, // VAX order, or not found
            };
        }
        catch (Exception ex) when (ex is TargetInvocationException or MemberAccessException or InvalidOperationException)
        {
            return null;
        }
    }
}
