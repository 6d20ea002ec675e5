namespace GateTasks.Engine.Demo;

/// <summary>
/// Reusable column buffers for a block of demo events (see <see cref="DemoColumns"/>); filled by
/// <see cref="ToyDiphotonSimulation.Generate"/>, so a whole sample never has to be held in memory.
/// </summary>
internal sealed class DemoEventChunk
{
    /// <summary>Allocates buffers for up to <paramref name="capacity"/> events.</summary>
    public DemoEventChunk(int capacity)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(capacity);
        Capacity = capacity;
        MassGg = new float[capacity];
        PtGg = new float[capacity];
        EnergyLead = new float[capacity];
        EnergySublead = new float[capacity];
        EtaLead = new float[capacity];
        EtaSublead = new float[capacity];
        PhiLead = new float[capacity];
        PhiSublead = new float[capacity];
        CosThetaStar = new float[capacity];
        JetCount = new int[capacity];
        LeadJetPt = new float[capacity];
        LeadConverted = new int[capacity];
        EnergyLeadTrue = new float[capacity];
        EnergySubleadTrue = new float[capacity];
        Weight = new float[capacity];
    }

    /// <summary>Maximum events the buffers hold.</summary>
    public int Capacity { get; }

    /// <summary>Events currently filled (a prefix of every buffer).</summary>
    public int Count { get; internal set; }

    /// <summary><see cref="DemoColumns.MassGg"/>.</summary>
    public float[] MassGg { get; }
    /// <summary><see cref="DemoColumns.PtGg"/>.</summary>
    public float[] PtGg { get; }
    /// <summary><see cref="DemoColumns.EnergyLead"/>.</summary>
    public float[] EnergyLead { get; }
    /// <summary><see cref="DemoColumns.EnergySublead"/>.</summary>
    public float[] EnergySublead { get; }
    /// <summary><see cref="DemoColumns.EtaLead"/>.</summary>
    public float[] EtaLead { get; }
    /// <summary><see cref="DemoColumns.EtaSublead"/>.</summary>
    public float[] EtaSublead { get; }
    /// <summary><see cref="DemoColumns.PhiLead"/>.</summary>
    public float[] PhiLead { get; }
    /// <summary><see cref="DemoColumns.PhiSublead"/>.</summary>
    public float[] PhiSublead { get; }
    /// <summary><see cref="DemoColumns.CosThetaStar"/>.</summary>
    public float[] CosThetaStar { get; }
    /// <summary><see cref="DemoColumns.JetCount"/>.</summary>
    public int[] JetCount { get; }
    /// <summary><see cref="DemoColumns.LeadJetPt"/>.</summary>
    public float[] LeadJetPt { get; }
    /// <summary><see cref="DemoColumns.EnergyLeadTrue"/>.</summary>
    public float[] EnergyLeadTrue { get; }
    /// <summary><see cref="DemoColumns.EnergySubleadTrue"/>.</summary>
    public float[] EnergySubleadTrue { get; }
    /// <summary><see cref="DemoColumns.LeadConverted"/>.</summary>
    public int[] LeadConverted { get; }
    /// <summary><see cref="DemoColumns.Weight"/>.</summary>
    public float[] Weight { get; }
}
