namespace GateTasks.Engine.Demo;

/// <summary>Column names of a demo sample, in file order. Float32 unless stated.</summary>
internal static class DemoColumns
{
    /// <summary>Diphoton invariant mass, GeV.</summary>
    public const string MassGg = "m_gg";
    /// <summary>Diphoton transverse momentum, GeV.</summary>
    public const string PtGg = "pt_gg";
    /// <summary>Energy of the photon with the larger transverse energy, GeV.</summary>
    public const string EnergyLead = "e_lead";
    /// <summary>Energy of the other photon, GeV.</summary>
    public const string EnergySublead = "e_sublead";
    /// <summary>Pseudorapidity of the leading photon.</summary>
    public const string EtaLead = "eta_lead";
    /// <summary>Pseudorapidity of the subleading photon.</summary>
    public const string EtaSublead = "eta_sublead";
    /// <summary>Azimuth of the leading photon, radians.</summary>
    public const string PhiLead = "phi_lead";
    /// <summary>Azimuth of the subleading photon, radians.</summary>
    public const string PhiSublead = "phi_sublead";
    /// <summary>|cos θ*| in the Collins–Soper frame, 0..1.</summary>
    public const string CosThetaStar = "cos_theta_star";
    /// <summary>Number of jets, int32, 0..MaxJets.</summary>
    public const string JetCount = "n_jets";
    /// <summary>Transverse momentum of the leading jet, GeV; exactly 0 when there is no jet (a spike).</summary>
    public const string LeadJetPt = "jet1_pt";
    /// <summary>1 when the leading photon converted, else 0; int32.</summary>
    public const string LeadConverted = "converted";
    /// <summary>Generator-level energy of the photon reconstructed as the leading one, GeV.</summary>
    public const string EnergyLeadTrue = "e_lead_true";
    /// <summary>Generator-level energy of the photon reconstructed as the subleading one, GeV.</summary>
    public const string EnergySubleadTrue = "e_sublead_true";
    /// <summary>Positive generator weight, mean about 1.</summary>
    public const string Weight = "weight";

    /// <summary>All columns in file order.</summary>
    public static IReadOnlyList<string> All { get; } =
    [
        MassGg, PtGg, EnergyLead, EnergySublead, EtaLead, EtaSublead, PhiLead, PhiSublead, CosThetaStar, JetCount, LeadJetPt,
        LeadConverted, EnergyLeadTrue, EnergySubleadTrue, Weight,
    ];
}
