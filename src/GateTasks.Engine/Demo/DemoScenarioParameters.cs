namespace GateTasks.Engine.Demo;

/// <summary>
/// Every physics knob of the built-in demo scenario: a fictional narrow scalar "Φ(95)" decaying to two photons
/// above a falling diphoton continuum, seen by a toy electromagnetic calorimeter. Energies and masses in GeV.
/// </summary>
/// <param name="ResonanceMass">Pole mass of the scalar.</param>
/// <param name="ResonanceWidth">Natural width Γ (full width at half maximum) of its Breit–Wigner line.</param>
/// <param name="SignalFraction">Fraction of generated events that are resonance decays (before acceptance).</param>
/// <param name="MassMin">Lower edge of the generated true diphoton mass range.</param>
/// <param name="MassMax">Upper edge of the generated true diphoton mass range.</param>
/// <param name="BackgroundSlope">Continuum falls as exp(−slope·m), slope in 1/GeV.</param>
/// <param name="BackgroundCosThetaStarTerm">Continuum decay angle follows 1 + k·cos²θ*; the scalar decays isotropically.</param>
/// <param name="SignalPtScale">Scale θ of the Gamma(2, θ) transverse-momentum spectrum of the resonance.</param>
/// <param name="BackgroundPtScale">Scale θ of the Gamma(2, θ) transverse-momentum spectrum of the continuum.</param>
/// <param name="RapiditySpread">Standard deviation of the (Gaussian) rapidity of the diphoton system.</param>
/// <param name="StochasticTerm">a in σ/E = a/√E ⊕ b/E ⊕ c, in √GeV.</param>
/// <param name="NoiseTerm">b in σ/E = a/√E ⊕ b/E ⊕ c, in GeV.</param>
/// <param name="ConstantTerm">c in σ/E = a/√E ⊕ b/E ⊕ c, dimensionless.</param>
/// <param name="ConvertedStochasticScale">Factor on the stochastic term for a photon that converted in the tracker material.</param>
/// <param name="ConversionProbabilityCentral">Conversion probability at η = 0.</param>
/// <param name="ConversionProbabilityEdge">Conversion probability at the acceptance edge; rises as η² in between (more material forward).</param>
/// <param name="EtaSmearing">Absolute Gaussian smearing of the photon pseudorapidity.</param>
/// <param name="PhiSmearing">Absolute Gaussian smearing of the photon azimuth, in radians.</param>
/// <param name="EtaAcceptance">Both photons must have |η| below this.</param>
/// <param name="MinTransverseEnergy">Both photons must have a reconstructed E_T above this.</param>
/// <param name="JetMultiplicityBase">Mean of the Poisson jet count at zero diphoton p_T.</param>
/// <param name="JetMultiplicityPerGeV">Increase of that mean per GeV of diphoton p_T.</param>
/// <param name="MaxJets">The jet count is capped here (the last bin means "this many or more").</param>
/// <param name="JetPtThreshold">Smallest leading-jet p_T; above it the spectrum falls exponentially.</param>
/// <param name="JetPtSlope">Mean leading-jet p_T above the threshold at zero diphoton p_T; half of p_T(γγ) adds to it.</param>
/// <param name="WeightShape">Generator weights follow Gamma(k, k): mean 1, relative spread 1/√k.</param>
/// <param name="TailThinningMassThreshold">Reconstructed m_γγ above which events are thinned.</param>
/// <param name="TailThinningFraction">Fraction of events above the threshold that are dropped (0 = none).</param>
/// <param name="DegradedEnergyMin">Lower edge of the true photon energy range whose resolution a response surrogate got wrong.</param>
/// <param name="DegradedEnergyMax">Upper edge (exclusive) of that range.</param>
/// <param name="DegradedResolutionFactor">Factor on σ/E inside that range (1 = the nominal detector).</param>
internal sealed record DemoScenarioParameters(
    double ResonanceMass,
    double ResonanceWidth,
    double SignalFraction,
    double MassMin,
    double MassMax,
    double BackgroundSlope,
    double BackgroundCosThetaStarTerm,
    double SignalPtScale,
    double BackgroundPtScale,
    double RapiditySpread,
    double StochasticTerm,
    double NoiseTerm,
    double ConstantTerm,
    double ConvertedStochasticScale,
    double ConversionProbabilityCentral,
    double ConversionProbabilityEdge,
    double EtaSmearing,
    double PhiSmearing,
    double EtaAcceptance,
    double MinTransverseEnergy,
    double JetMultiplicityBase,
    double JetMultiplicityPerGeV,
    int MaxJets,
    double JetPtThreshold,
    double JetPtSlope,
    double WeightShape,
    double TailThinningMassThreshold,
    double TailThinningFraction,
    double DegradedEnergyMin = 0,
    double DegradedEnergyMax = 0,
    double DegradedResolutionFactor = 1)
{
    /// <summary>The nominal detector: what the reference ("full simulation") sample is made with.</summary>
    public static DemoScenarioParameters FullSimulation { get; } = new(
        ResonanceMass: 95.0,
        ResonanceWidth: 0.01,
        SignalFraction: 0.10,
        MassMin: 60.0,
        MassMax: 200.0,
        BackgroundSlope: 0.04,
        BackgroundCosThetaStarTerm: 0.6,
        SignalPtScale: 10.0,
        BackgroundPtScale: 7.0,
        RapiditySpread: 1.3,
        StochasticTerm: 0.10,
        NoiseTerm: 0.25,
        ConstantTerm: 0.007,
        ConvertedStochasticScale: 1.25,
        ConversionProbabilityCentral: 0.18,
        ConversionProbabilityEdge: 0.40,
        EtaSmearing: 0.001,
        PhiSmearing: 0.0015,
        EtaAcceptance: 2.5,
        MinTransverseEnergy: 20.0,
        JetMultiplicityBase: 0.5,
        JetMultiplicityPerGeV: 1.0 / 30.0,
        MaxJets: 5,
        JetPtThreshold: 25.0,
        JetPtSlope: 10.0,
        WeightShape: 40.0,
        TailThinningMassThreshold: 120.0,
        TailThinningFraction: 0.0);

    /// <summary>
    /// A surrogate that learnt the detector slightly wrong: a larger constant term (a wider, lower peak)
    /// and a high-mass tail thinned by 40 %.
    /// </summary>
    public static DemoScenarioParameters Drifted { get; } = FullSimulation with
    {
        ConstantTerm = 0.012,
        TailThinningFraction = 0.40,
    };

    /// <summary>
    /// A fast detector response (generator-level photons in, reconstructed ones out) that got the energy resolution
    /// 5% worse for photons of true energy 50–75 GeV, and right everywhere else.
    /// </summary>
    public static DemoScenarioParameters DegradedResponse { get; } = FullSimulation with
    {
        DegradedEnergyMin = 50.0,
        DegradedEnergyMax = 75.0,
        DegradedResolutionFactor = 1.05,
    };

    /// <summary>Relative energy resolution σ/E for one photon of true energy <paramref name="energy"/> (GeV).</summary>
    // σ/E = a/√E ⊕ b/E ⊕ c with ⊕ addition in quadrature: the standard calorimeter parametrisation
    // (Review of Particle Physics, "Calorimetry" section).
    public double RelativeEnergyResolution(double energy, bool converted)
    {
        var a = converted ? StochasticTerm * ConvertedStochasticScale : StochasticTerm;
        var nominal = Math.Sqrt(a * a / energy + NoiseTerm * NoiseTerm / (energy * energy) + ConstantTerm * ConstantTerm);
        return energy >= DegradedEnergyMin && energy < DegradedEnergyMax ? nominal * DegradedResolutionFactor : nominal;
    }
}
